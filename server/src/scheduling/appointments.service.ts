import { BadRequestException, ConflictException, Injectable, NotFoundException } from '@nestjs/common';
import { EventEmitter2 } from '@nestjs/event-emitter';
import { InjectModel } from '@nestjs/sequelize';
import type {
  Appointment,
  AppointmentState,
  BookAppointmentsResponse,
  BookingConflict,
  EstimateResult,
  Level,
  Procedure,
  ReferralStatus,
} from '@ostium/shared';
import { DateTime } from 'luxon';
import { randomUUID } from 'node:crypto';
import { QueryTypes, type Transaction } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import { ER_LOCK_DEADLOCK, ER_LOCK_WAIT_TIMEOUT, sqlErrno } from '../database/deadlock-retry.util.js';
import { EstimatesService } from '../estimates/estimates.service.js';
import type { Actor } from '../referrals/case-record.types.js';
import { isOpen, STATUS_PATH } from '../referrals/referral-status.util.js';
import { LettersService } from '../referrals/letters.service.js';
import { ReferralsService } from '../referrals/referrals.service.js';
import { APPOINTMENT_CHANGED, APPOINTMENTS_BOOKED, type AppointmentChangedEvent, type AppointmentsBookedEvent, type AppointmentSnapshot } from './appointment-events.js';
import { canTransition, MOVABLE_STATES, noticeHours, RELEASED_STATES } from './appointment-state.util.js';
import type { AppointmentQueryDto, BookAppointmentsDto, UpdateAppointmentDto } from './dto/appointments.dto.js';
import { AppointmentRow } from './models/appointment.model.js';
import { CELL_MINUTES, duplicateCells, onGrid, sortCells, visitCells, type OccupancyCell, type ResourceKind, type VisitResources } from './occupancy-cells.util.js';
import { DEFAULT_TURNOVER_MINUTES } from './time-finder/time-finder.util.js';

const MIN = 60_000;
const ER_DUP_ENTRY = 1062;

const bad = (field: string, message: string) => new BadRequestException({ message, errors: [{ field, message }] });

/** 409 with BookingConflictBody: every colliding booking, or none when the version read is stale. */
export class BookingConflictException extends ConflictException {
  constructor(
    message: string,
    readonly conflicts: BookingConflict[],
  ) {
    super({ message, conflicts });
  }
}

/** A cell insert hit a cell another transaction owns (the unique key of the occupancy table). */
class CellTaken extends Error {}

/** A visit as the guard sees it: its index in its series and the resources it takes. */
interface GuardedVisit extends VisitResources {
  visitIndex: number;
  appointmentId?: number;
}

interface AppointmentListRow {
  id: number;
  version: number;
  series_id: string;
  visit_index: number;
  case_id: number;
  referral_id: number;
  patient_id: number;
  first_name: string;
  last_name: string;
  tooth_fdi: string;
  procedure: Procedure;
  level: Level | null;
  start: Date;
  end: Date;
  turnover_minutes: number;
  chair_id: number;
  location_id: number;
  operator_id: number;
  microscope_id: number | null;
  state: AppointmentState;
  confirmed_at: Date | null;
  confirmed_via: string | null;
  cancelled_at: Date | null;
  cancelled_by_name: string | null;
  cancel_reason: string | null;
  cancel_notice_hours: string | number | null;
  seated_at: Date | null;
  dismissed_at: Date | null;
  notes: string | null;
}

const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null);

export function mapAppointmentRow(r: AppointmentListRow): Appointment {
  return {
    id: r.id,
    version: r.version,
    seriesId: r.series_id,
    visitIndex: r.visit_index,
    caseId: r.case_id,
    referralId: r.referral_id,
    patient: { id: r.patient_id, name: `${r.first_name} ${r.last_name}` },
    toothFdi: r.tooth_fdi,
    procedure: r.procedure,
    level: r.level,
    start: new Date(r.start).toISOString(),
    end: new Date(r.end).toISOString(),
    turnoverMinutes: r.turnover_minutes,
    chairId: r.chair_id,
    locationId: r.location_id,
    operatorId: r.operator_id,
    microscopeId: r.microscope_id,
    state: r.state,
    confirmedAt: iso(r.confirmed_at),
    confirmedVia: r.confirmed_via,
    cancellation:
      r.state === 'cancelled' && r.cancelled_at
        ? { byName: r.cancelled_by_name, reason: r.cancel_reason ?? '', at: iso(r.cancelled_at)!, noticeHours: Number(r.cancel_notice_hours ?? 0) }
        : null,
    seatedAt: iso(r.seated_at),
    dismissedAt: iso(r.dismissed_at),
    notes: r.notes,
  };
}

const LIST_SQL = `SELECT a.id, a.version, a.series_id, a.visit_index, a.case_id, a.referral_id, p.id AS patient_id, p.first_name, p.last_name,
       c.tooth_fdi, c.procedure, c.level, a.start, a.end, a.turnover_minutes, a.chair_id, a.location_id, a.operator_id, a.microscope_id,
       a.state, a.confirmed_at, a.confirmed_via, a.cancelled_at, a.cancelled_by_name, a.cancel_reason, a.cancel_notice_hours,
       a.seated_at, a.dismissed_at, a.notes
  FROM appointments a
  JOIN cases c ON c.id = a.case_id
  JOIN referrals r ON r.id = a.referral_id
  JOIN patients p ON p.id = r.patient_id`;

const cellKey = (kind: ResourceKind, id: number, t: number) => `${kind}|${id}|${t}`;
const sqlTime = (t: number) => new Date(t).toISOString().slice(0, 19).replace('T', ' ');

/**
 * Booking, moving and every state change of appointments, all through one guard: the visit's cells in
 * appointment_cells (unique per resource and 5-minute cell) are written in the same transaction as the
 * appointment, so two writers — on one server, several servers or several Galera nodes — cannot both win.
 */
@Injectable()
export class AppointmentsService {
  constructor(
    private readonly sequelize: Sequelize,
    @InjectModel(AppointmentRow) private readonly appointments: typeof AppointmentRow,
    private readonly referrals: ReferralsService,
    private readonly letters: LettersService,
    private readonly estimates: EstimatesService,
    private readonly events: EventEmitter2,
  ) {}

  // ---------- reads ----------

  /** The board: appointments overlapping [from, to) with patient, tooth and level, in one query. */
  async list(practiceId: number, q: AppointmentQueryDto): Promise<Appointment[]> {
    const where = ['a.practice_id = :practiceId', 'a.start < :to', 'a.end > :from'];
    if (q.locationId) where.push('a.location_id = :locationId');
    if (q.chairId) where.push('a.chair_id = :chairId');
    if (q.operatorId) where.push('a.operator_id = :operatorId');
    if (!q.includeCancelled) where.push("a.state NOT IN ('cancelled', 'no_show')");
    const rows = await this.sequelize.query<AppointmentListRow>(`${LIST_SQL} WHERE ${where.join(' AND ')} ORDER BY a.start, a.chair_id`, {
      replacements: { practiceId, from: new Date(q.from), to: new Date(q.to), locationId: q.locationId, chairId: q.chairId, operatorId: q.operatorId },
      type: QueryTypes.SELECT,
    });
    return rows.map(mapAppointmentRow);
  }

  async get(practiceId: number, id: number, transaction?: Transaction): Promise<Appointment> {
    const [row] = await this.sequelize.query<AppointmentListRow>(`${LIST_SQL} WHERE a.practice_id = :practiceId AND a.id = :id`, {
      replacements: { practiceId, id },
      type: QueryTypes.SELECT,
      transaction,
    });
    if (!row) throw new NotFoundException(`Appointment ${id} not found`);
    return mapAppointmentRow(row);
  }

  async series(practiceId: number, seriesId: string, transaction?: Transaction): Promise<Appointment[]> {
    const rows = await this.sequelize.query<AppointmentListRow>(`${LIST_SQL} WHERE a.practice_id = :practiceId AND a.series_id = :seriesId ORDER BY a.visit_index`, {
      replacements: { practiceId, seriesId },
      type: QueryTypes.SELECT,
      transaction,
    });
    return rows.map(mapAppointmentRow);
  }

  // ---------- the guard ----------

  /**
   * Every booking that holds one of the cells these visits want, per visit and resource. Run inside the
   * transaction (before the insert) to list all conflicts at once, and after a lost race to name the winner.
   */
  private async conflictsFor(visits: GuardedVisit[], transaction?: Transaction): Promise<BookingConflict[]> {
    const ranges: string[] = [];
    const replacements: Record<string, unknown> = {};
    const wanted = new Map<string, number[]>();
    visits.forEach((v, i) => {
      const parts: [ResourceKind, number, number, number][] = [
        ['chair', v.chairId, v.start, v.end + v.turnoverMinutes * MIN],
        ['operator', v.operatorId, v.start, v.end],
      ];
      if (v.microscopeId !== null) parts.push(['microscope', v.microscopeId, v.start, v.end]);
      parts.forEach(([kind, id, from, to], j) => {
        const k = `v${i}_${j}`;
        ranges.push(`(c.resource_kind = :${k}k AND c.resource_id = :${k}id AND c.cell_start >= :${k}f AND c.cell_start < :${k}t)`);
        Object.assign(replacements, { [`${k}k`]: kind, [`${k}id`]: id, [`${k}f`]: sqlTime(Math.floor(from / (CELL_MINUTES * MIN)) * CELL_MINUTES * MIN), [`${k}t`]: sqlTime(to) });
      });
      for (const c of visitCells(v)) {
        const key = cellKey(c.kind, c.resourceId, c.cellStart);
        wanted.set(key, [...(wanted.get(key) ?? []), i]);
      }
    });
    const rows = await this.sequelize.query<{ resource_kind: ResourceKind; resource_id: number; cell_start: Date; appointment_id: number; start: Date; end: Date }>(
      `SELECT c.resource_kind, c.resource_id, c.cell_start, c.appointment_id, a.start, a.end
         FROM appointment_cells c JOIN appointments a ON a.id = c.appointment_id
        WHERE ${ranges.join(' OR ')}`,
      { replacements, type: QueryTypes.SELECT, transaction },
    );
    const seen = new Set<string>();
    const out: BookingConflict[] = [];
    for (const r of rows) {
      const t = new Date(r.cell_start).getTime();
      for (const i of wanted.get(cellKey(r.resource_kind, r.resource_id, t)) ?? []) {
        const v = visits[i]!;
        if (v.appointmentId === r.appointment_id) continue;
        const k = `${i}|${r.resource_kind}|${r.resource_id}|${r.appointment_id}`;
        if (seen.has(k)) continue;
        seen.add(k);
        out.push({ visitIndex: v.visitIndex, resource: r.resource_kind, resourceId: r.resource_id, appointmentId: r.appointment_id, start: new Date(r.start).toISOString(), end: new Date(r.end).toISOString() });
      }
    }
    return out.sort((a, b) => a.visitIndex - b.visitIndex || a.resource.localeCompare(b.resource) || a.appointmentId - b.appointmentId);
  }

  /** Inserts the cells in one statement, in the global order; a taken cell aborts with CellTaken. */
  private async insertCells(practiceId: number, cells: (OccupancyCell & { appointmentId: number })[], transaction: Transaction) {
    if (!cells.length) return;
    const sorted = sortCells(cells) as (OccupancyCell & { appointmentId: number })[];
    const values = sorted.map(() => '(?, ?, ?, ?, ?)').join(', ');
    const params = sorted.flatMap((c) => [c.kind, c.resourceId, sqlTime(c.cellStart), practiceId, c.appointmentId]);
    try {
      await this.sequelize.query(`INSERT INTO appointment_cells (resource_kind, resource_id, cell_start, practice_id, appointment_id) VALUES ${values}`, {
        replacements: params,
        transaction,
      });
    } catch (e) {
      if (sqlErrno(e) === ER_DUP_ENTRY) throw new CellTaken();
      throw e;
    }
  }

  private async releaseCells(appointmentId: number, transaction: Transaction) {
    await this.sequelize.query('DELETE FROM appointment_cells WHERE appointment_id = :appointmentId', { replacements: { appointmentId }, transaction });
  }

  /**
   * Runs a guarded write: the transaction once, again once on a deadlock / certification failure, then
   * 409. A lost race on a cell becomes a 409 naming the booking that now holds it.
   */
  private async guarded<T>(visits: () => GuardedVisit[], work: (t: Transaction) => Promise<T>): Promise<T> {
    for (let attempt = 0; ; attempt++) {
      try {
        return await this.sequelize.transaction(work);
      } catch (e) {
        const code = sqlErrno(e);
        if (e instanceof CellTaken || ((code === ER_LOCK_DEADLOCK || code === ER_LOCK_WAIT_TIMEOUT) && attempt >= 1)) {
          const conflicts = await this.conflictsFor(visits());
          throw new BookingConflictException(conflictMessage(conflicts, 'was just booked by someone else'), conflicts);
        }
        if ((code === ER_LOCK_DEADLOCK || code === ER_LOCK_WAIT_TIMEOUT) && attempt === 0) continue;
        throw e;
      }
    }
  }

  // ---------- booking ----------

  /** Loads and checks the resources of the visits (3 queries for the whole series). */
  private async checkResources(practiceId: number, visits: { chairId: number; operatorId: number; microscopeId?: number | null }[], needsMicroscope: boolean[]) {
    const chairIds = [...new Set(visits.map((v) => v.chairId))];
    const opIds = [...new Set(visits.map((v) => v.operatorId))];
    const micIds = [...new Set(visits.map((v) => v.microscopeId).filter((m): m is number => typeof m === 'number'))];
    const [chairs, ops, mics] = await Promise.all([
      this.sequelize.query<{ id: number; location_id: number; fixed_microscope_id: number | null; active: number | boolean }>(
        'SELECT id, location_id, fixed_microscope_id, active FROM chairs WHERE practice_id = :practiceId AND id IN (:ids)',
        { replacements: { practiceId, ids: chairIds }, type: QueryTypes.SELECT },
      ),
      this.sequelize.query<{ id: number }>("SELECT id FROM users WHERE practice_id = :practiceId AND role = 'endodontist' AND active = 1 AND id IN (:ids)", {
        replacements: { practiceId, ids: opIds },
        type: QueryTypes.SELECT,
      }),
      micIds.length
        ? this.sequelize.query<{ id: number; location_id: number; mobile: number | boolean; active: number | boolean }>(
            'SELECT id, location_id, mobile, active FROM microscopes WHERE practice_id = :practiceId AND id IN (:ids)',
            { replacements: { practiceId, ids: micIds }, type: QueryTypes.SELECT },
          )
        : Promise.resolve([]),
    ]);
    return visits.map((v, i) => {
      const chair = chairs.find((c) => c.id === v.chairId);
      if (!chair || !chair.active) throw bad(`visits.${i}.chairId`, `visits.${i}: chair ${v.chairId} is not an active chair of the practice`);
      if (!ops.some((o) => o.id === v.operatorId)) throw bad(`visits.${i}.operatorId`, `visits.${i}: user ${v.operatorId} is not an active endodontist of the practice`);
      let microscopeId = v.microscopeId ?? null;
      // A visit that needs a microscope on a chair with one mounted uses that one.
      if (microscopeId === null && needsMicroscope[i] && chair.fixed_microscope_id !== null) microscopeId = chair.fixed_microscope_id;
      if (microscopeId !== null) {
        const m = mics.find((x) => x.id === microscopeId);
        const fixedHere = chair.fixed_microscope_id === microscopeId;
        if (!fixedHere && (!m || !m.active || m.location_id !== chair.location_id || !m.mobile)) {
          throw bad(`visits.${i}.microscopeId`, `visits.${i}: microscope ${microscopeId} is neither mounted on chair ${v.chairId} nor a mobile one of its location`);
        }
      }
      return { locationId: chair.location_id, microscopeId };
    });
  }

  private static times(field: string, start: string, end: string) {
    const s = Date.parse(start);
    const e = Date.parse(end);
    if (Number.isNaN(s) || Number.isNaN(e)) throw bad(field, `${field}: start and end must be ISO date-times`);
    if (e <= s) throw bad(`${field}.end`, `${field}: end must be after start`);
    if (!onGrid(s) || !onGrid(e)) throw bad(field, `${field}: start and end must lie on the ${CELL_MINUTES}-minute grid`);
    if (e - s > 10 * 3_600_000) throw bad(`${field}.end`, `${field}: a visit lasts at most 10 hours`);
    return { start: s, end: e };
  }

  /**
   * Books a whole series or nothing. With an Idempotency-Key, a retry returns the booking the key made.
   * Returns `replayed` when the key had already booked.
   */
  async book(practiceId: number, actor: Actor, dto: BookAppointmentsDto, idempotencyKey?: string): Promise<{ replayed: boolean; body: BookAppointmentsResponse }> {
    const key = idempotencyKey?.trim() || undefined;
    if (key !== undefined && (key.length > 128 || !/^[\x21-\x7e]+$/.test(key))) throw bad('Idempotency-Key', 'Idempotency-Key must be 1–128 visible ASCII characters');
    if (key !== undefined) {
      const seriesId = await this.seriesOfKey(practiceId, key);
      if (seriesId) return { replayed: true, body: { appointments: await this.series(practiceId, seriesId) } };
    }
    const c = await this.referrals.getCase(practiceId, dto.caseId);
    if (!isOpen(c.referralStatus) || ['declined', 'cancelled', 'completed', 'report_sent'].includes(c.status)) {
      throw new ConflictException(`The case is ${c.status.replace('_', ' ')}; it cannot be booked`);
    }
    const estimate = c.estimate as EstimateResult | null;
    const times = dto.visits.map((v, i) => AppointmentsService.times(`visits.${i}`, v.start, v.end));
    times.forEach((t, i) => {
      if (i > 0 && t.start < times[i - 1]!.end) throw bad(`visits.${i}.start`, `visits.${i}: the visits of a series follow each other in time`);
    });
    const needs = dto.visits.map((_, i) => estimate?.visits[i]?.needsMicroscope ?? false);
    const checked = await this.checkResources(practiceId, dto.visits, needs);
    const visits: GuardedVisit[] = dto.visits.map((v, i) => ({
      visitIndex: i,
      start: times[i]!.start,
      end: times[i]!.end,
      turnoverMinutes: estimate?.visits[i]?.turnoverMinutes ?? DEFAULT_TURNOVER_MINUTES,
      chairId: v.chairId,
      operatorId: v.operatorId,
      microscopeId: checked[i]!.microscopeId,
    }));
    const own = visits.flatMap(visitCells);
    if (duplicateCells(own).length) throw bad('visits', 'two visits of the series take the same chair, operator or microscope at the same time');
    const seriesId = randomUUID();
    const firstBooking = STATUS_PATH.indexOf(c.referralStatus) >= 0 && STATUS_PATH.indexOf(c.referralStatus) < STATUS_PATH.indexOf('booked');
    try {
      await this.guarded(
        () => visits,
        async (transaction) => {
          if (key !== undefined) {
            try {
              await this.sequelize.query('INSERT INTO booking_idempotency_keys (practice_id, key_value, series_id, created_at) VALUES (?, ?, ?, ?)', {
                replacements: [practiceId, key, seriesId, new Date()],
                transaction,
              });
            } catch (e) {
              if (sqlErrno(e) === ER_DUP_ENTRY) throw new KeyUsed();
              throw e;
            }
          }
          const conflicts = await this.conflictsFor(visits, transaction);
          if (conflicts.length) throw new BookingConflictException(conflictMessage(conflicts, 'is already booked'), conflicts);
          const cells: (OccupancyCell & { appointmentId: number })[] = [];
          for (const v of visits) {
            const row = await this.appointments.create(
              {
                practiceId,
                seriesId,
                visitIndex: v.visitIndex,
                caseId: c.id,
                referralId: c.referralId,
                locationId: checked[v.visitIndex]!.locationId,
                chairId: v.chairId,
                operatorId: v.operatorId,
                microscopeId: v.microscopeId,
                start: new Date(v.start),
                end: new Date(v.end),
                turnoverMinutes: v.turnoverMinutes,
                state: 'booked',
                version: 1,
                notes: dto.notes ?? null,
                createdBy: actor.id,
              },
              { transaction },
            );
            for (const cell of visitCells(v)) cells.push({ ...cell, appointmentId: row.id });
          }
          await this.insertCells(practiceId, cells, transaction);
          await this.markBooked(practiceId, c.id, c.referralId, c.referralStatus, actor, transaction);
          // The referring dentist's notice commits with the booking (the outbox sends it), never without it.
          if (firstBooking) await this.letters.queueBookingNotice(practiceId, c.referralId, c.id, actor.id, new Date(), transaction);
        },
      );
    } catch (e) {
      if (e instanceof KeyUsed && key !== undefined) {
        const existing = await this.seriesOfKey(practiceId, key);
        if (existing) return { replayed: true, body: { appointments: await this.series(practiceId, existing) } };
      }
      throw e;
    }
    const appointments = await this.series(practiceId, seriesId);
    const booked: AppointmentsBookedEvent = {
      practiceId,
      seriesId,
      appointmentIds: appointments.map((a) => a.id),
      caseId: c.id,
      referralId: c.referralId,
      firstBooking,
      actorId: actor.id,
      at: new Date(),
    };
    this.emit(APPOINTMENTS_BOOKED, booked);
    return { replayed: false, body: { appointments } };
  }

  private async seriesOfKey(practiceId: number, key: string): Promise<string | null> {
    const [row] = await this.sequelize.query<{ series_id: string }>('SELECT series_id FROM booking_idempotency_keys WHERE practice_id = :practiceId AND key_value = :key', {
      replacements: { practiceId, key },
      type: QueryTypes.SELECT,
    });
    return row?.series_id ?? null;
  }

  /** Booking moves the referral (one step at a time, as its path requires) and the case to booked. */
  private async markBooked(practiceId: number, caseId: number, referralId: number, referralStatus: ReferralStatus, actor: Actor, transaction: Transaction) {
    const at = STATUS_PATH.indexOf(referralStatus);
    const booked = STATUS_PATH.indexOf('booked');
    if (at >= 0 && at < booked) {
      for (const status of STATUS_PATH.slice(at + 1, booked + 1)) {
        await this.referrals.setStatus(practiceId, referralId, status, { actor, reason: status === 'booked' ? 'Booked from the schedule' : null, transaction });
      }
    }
    const c = await this.referrals.getCase(practiceId, caseId, transaction);
    const caseAt = STATUS_PATH.indexOf(c.status);
    if (caseAt >= 0 && caseAt < booked) await this.referrals.updateCase(practiceId, caseId, { status: 'booked', updatedBy: actor.id }, transaction);
  }

  // ---------- changes ----------

  /**
   * Moves, resizes, changes chair/operator/microscope and state, with the version that was read. Every
   * change that keeps the appointment active re-claims its cells through the same guard as booking.
   */
  async update(practiceId: number, actor: Actor, id: number, dto: UpdateAppointmentDto): Promise<Appointment> {
    const current = await this.appointments.findOne({ where: { id, practiceId } });
    if (!current) throw new NotFoundException(`Appointment ${id} not found`);
    const moving = dto.start !== undefined || dto.end !== undefined || dto.chairId !== undefined || dto.operatorId !== undefined || dto.microscopeId !== undefined;
    const target = dto.state ?? current.state;
    if (dto.state !== undefined && dto.state !== current.state && !canTransition(current.state, dto.state)) {
      throw new ConflictException({ message: `An appointment that is ${current.state.replace('_', '-')} cannot become ${dto.state.replace('_', '-')}`, conflicts: [] });
    }
    if (dto.state === 'cancelled' && !dto.reason?.trim()) throw bad('reason', 'Give a reason when an appointment is cancelled');
    if (moving && !MOVABLE_STATES.includes(current.state)) throw new ConflictException({ message: `An appointment that is ${current.state} can no longer be moved`, conflicts: [] });
    if (moving && RELEASED_STATES.includes(target)) throw bad('state', 'an appointment is not moved and cancelled in one change');

    const t = AppointmentsService.times('appointment', dto.start ?? current.start.toISOString(), dto.end ?? current.end.toISOString());
    let next: GuardedVisit & { locationId: number } = {
      visitIndex: current.visitIndex,
      appointmentId: current.id,
      start: t.start,
      end: t.end,
      turnoverMinutes: current.turnoverMinutes,
      chairId: dto.chairId ?? current.chairId,
      operatorId: dto.operatorId ?? current.operatorId,
      microscopeId: dto.microscopeId !== undefined ? dto.microscopeId : current.microscopeId,
      locationId: current.locationId,
    };
    if (moving) {
      const [checked] = await this.checkResources(practiceId, [next], [false]);
      next = { ...next, microscopeId: checked!.microscopeId, locationId: checked!.locationId };
    }
    let previous: AppointmentSnapshot | null = null;
    let saved: AppointmentRow | null = null;
    await this.guarded(
      () => [next],
      async (transaction) => {
        const row = await this.appointments.findOne({ where: { id, practiceId }, lock: transaction.LOCK.UPDATE, transaction });
        if (!row) throw new NotFoundException(`Appointment ${id} not found`);
        if (row.version !== dto.version) {
          throw new BookingConflictException(`The appointment was changed by someone else (version ${row.version}, you had ${dto.version}); reload it and try again`, []);
        }
        const now = new Date();
        previous = snapshot(row);
        await this.releaseCells(row.id, transaction);
        if (!RELEASED_STATES.includes(target)) {
          const conflicts = await this.conflictsFor([next], transaction);
          if (conflicts.length) throw new BookingConflictException(conflictMessage(conflicts, 'is already booked'), conflicts);
          await this.insertCells(practiceId, visitCells(next).map((c) => ({ ...c, appointmentId: row.id })), transaction);
        }
        row.set({
          start: new Date(next.start),
          end: new Date(next.end),
          chairId: next.chairId,
          operatorId: next.operatorId,
          microscopeId: next.microscopeId,
          locationId: next.locationId,
          version: row.version + 1,
        });
        if (dto.state !== undefined && dto.state !== row.state) {
          row.state = dto.state;
          if (dto.state === 'confirmed') row.set({ confirmedAt: now, confirmedVia: 'desk' });
          if (dto.state === 'seated') row.seatedAt = now;
          if (dto.state === 'dismissed') row.dismissedAt = now;
          if (dto.state === 'cancelled') {
            row.set({ cancelledAt: now, cancelledByUserId: actor.id, cancelledByName: actor.name, cancelReason: dto.reason!.trim(), cancelNoticeHours: noticeHours(row.start.getTime(), now.getTime()) });
          }
        }
        await row.save({ transaction });
        if (dto.state === 'dismissed' && row.seatedAt) await this.recordDismissal(practiceId, row, transaction);
        if (dto.state === 'cancelled' || dto.state === 'no_show') await this.releaseReferralIfEmpty(practiceId, row, actor, transaction);
        saved = row;
      },
    );
    if (previous && saved) {
      const row = saved as AppointmentRow;
      const changed: AppointmentChangedEvent = {
        practiceId,
        appointmentId: row.id,
        caseId: row.caseId,
        referralId: row.referralId,
        previous,
        current: snapshot(row),
        actorId: actor.id,
        at: new Date(),
      };
      this.emit(APPOINTMENT_CHANGED, changed);
    }
    return this.get(practiceId, id);
  }

  /** The last live visit of a booked referral was cancelled or missed: the referral waits to be booked again. */
  private async releaseReferralIfEmpty(practiceId: number, row: AppointmentRow, actor: Actor, transaction: Transaction) {
    const [live] = await this.sequelize.query<{ n: number | string }>(
      "SELECT COUNT(*) AS n FROM appointments WHERE practice_id = :practiceId AND referral_id = :referralId AND state NOT IN ('cancelled', 'no_show')",
      { replacements: { practiceId, referralId: row.referralId }, type: QueryTypes.SELECT, transaction },
    );
    if (Number(live?.n ?? 0) > 0) return;
    const why = row.state === 'no_show' ? 'missed' : 'cancelled';
    await this.referrals.returnToPlanned(practiceId, row.referralId, `Its visit was ${why} and none is left; to be booked again`, { actor, transaction });
  }

  /** Listeners run after the commit; one that throws is logged by the emitter and never undoes the change. */
  private emit(event: string, payload: AppointmentsBookedEvent | AppointmentChangedEvent) {
    try {
      this.events.emit(event, payload);
    } catch {
      // a listener's failure is its own (the periodic sweeps catch up); the booking stands
    }
  }

  /** The measured visit (dismissed − seated) goes to the estimate learning. */
  private async recordDismissal(practiceId: number, row: AppointmentRow, transaction: Transaction) {
    const c = await this.referrals.getCase(practiceId, row.caseId, transaction);
    const estimate = c.estimate as EstimateResult | null;
    const level = (c.level ?? estimate?.level) as Level | null;
    const canals = c.canals ?? estimate?.canals;
    if (!level || !canals) return; // without an assessed case there is no cell to learn into
    const [loc] = await this.sequelize.query<{ time_zone: string }>('SELECT time_zone FROM locations WHERE id = :id', {
      replacements: { id: row.locationId },
      type: QueryTypes.SELECT,
      transaction,
    });
    await this.estimates.recordVisit(
      practiceId,
      {
        appointmentId: row.id,
        visitDate: DateTime.fromJSDate(row.seatedAt!, { zone: loc?.time_zone ?? 'UTC' }).toISODate()!,
        toothFdi: c.toothFdi,
        procedure: c.procedure,
        canals,
        level,
        operatorId: row.operatorId,
        actualMinutes: (row.dismissedAt!.getTime() - row.seatedAt!.getTime()) / MIN,
      },
      transaction,
    );
  }
}

function snapshot(row: AppointmentRow): AppointmentSnapshot {
  return {
    start: new Date(row.start),
    end: new Date(row.end),
    state: row.state,
    chairId: row.chairId,
    operatorId: row.operatorId,
    microscopeId: row.microscopeId,
    locationId: row.locationId,
  };
}

/** An Idempotency-Key that another request already used (found on its unique key). */
class KeyUsed extends Error {}

function conflictMessage(conflicts: BookingConflict[], what: string): string {
  if (!conflicts.length) return `The time ${what}; find times again`;
  const parts = conflicts.map((c) => `visit ${c.visitIndex + 1}: ${c.resource} ${c.resourceId} is taken by appointment ${c.appointmentId}`);
  return `The time ${what} (${parts.join('; ')})`;
}
