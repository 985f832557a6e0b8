import { ConflictException, Injectable, NotFoundException } from '@nestjs/common';
import { InjectModel } from '@nestjs/sequelize';
import type { CaseOverride, EstimateResult, WaitlistEntry } from '@ostium/shared';
import { DateTime } from 'luxon';
import { QueryTypes } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import { ReferralsService } from '../referrals/referrals.service.js';
import { RELEASED_STATES } from './appointment-state.util.js';
import type { WaitlistEntryDto } from './dto/waitlist.dto.js';
import { AppointmentRow } from './models/appointment.model.js';
import { WaitlistEntryRow } from './models/waitlist-entry.model.js';
import { findTimes } from './time-finder/time-finder.util.js';
import { planOfCase, TimeFinderService } from './time-finder.service.js';

type Json<T> = T | string | null;
const json = <T>(v: Json<T>): T | null => (v === null ? null : typeof v === 'string' ? (JSON.parse(v) as T) : v);

interface EntryRow {
  id: number;
  case_id: number;
  earliest: string | null;
  notes: string | null;
  created_at: Date;
  patient_id: number;
  first_name: string;
  last_name: string;
  tooth_fdi: string;
  estimate: Json<EstimateResult>;
  override: Json<CaseOverride>;
  urgency: string;
}

/** Patients who would take an earlier time; a cancellation lists those whose first visit fits the freed time. */
@Injectable()
export class WaitlistService {
  constructor(
    private readonly sequelize: Sequelize,
    @InjectModel(WaitlistEntryRow) private readonly entries: typeof WaitlistEntryRow,
    @InjectModel(AppointmentRow) private readonly appointments: typeof AppointmentRow,
    private readonly referrals: ReferralsService,
    private readonly finder: TimeFinderService,
  ) {}

  private async rows(practiceId: number, id?: number): Promise<EntryRow[]> {
    return this.sequelize.query<EntryRow>(
      `SELECT w.id, w.case_id, DATE_FORMAT(w.earliest, '%Y-%m-%d') AS earliest, w.notes, w.created_at, p.id AS patient_id, p.first_name, p.last_name,
              c.tooth_fdi, c.estimate, c.override, r.urgency
         FROM waitlist_entries w
         JOIN cases c ON c.id = w.case_id
         JOIN referrals r ON r.id = c.referral_id
         JOIN patients p ON p.id = r.patient_id
        WHERE w.practice_id = :practiceId ${id ? 'AND w.id = :id' : ''}
        ORDER BY w.created_at, w.id`,
      { replacements: { practiceId, id }, type: QueryTypes.SELECT },
    );
  }

  private static map(r: EntryRow): WaitlistEntry {
    const plan = planOfCase(json(r.estimate), json(r.override));
    return {
      id: r.id,
      caseId: r.case_id,
      ...(r.earliest ? { earliest: r.earliest } : {}),
      ...(r.notes ? { notes: r.notes } : {}),
      patient: { id: r.patient_id, name: `${r.first_name} ${r.last_name}` },
      toothFdi: r.tooth_fdi,
      minutesPerVisit: plan?.visits.map((v) => v.minutes) ?? [],
      needsMicroscope: plan?.visits.some((v) => v.needsMicroscope) ?? false,
      createdAt: new Date(r.created_at).toISOString(),
    };
  }

  async list(practiceId: number): Promise<WaitlistEntry[]> {
    return (await this.rows(practiceId)).map(WaitlistService.map);
  }

  async add(practiceId: number, dto: WaitlistEntryDto): Promise<WaitlistEntry> {
    await this.referrals.getCase(practiceId, dto.caseId);
    if (await this.entries.findOne({ where: { caseId: dto.caseId } })) throw new ConflictException(`Case ${dto.caseId} is already on the waitlist`);
    const row = await this.entries.create({ practiceId, caseId: dto.caseId, earliest: dto.earliest ?? null, notes: dto.notes ?? null });
    const [r] = await this.rows(practiceId, row.id);
    return WaitlistService.map(r!);
  }

  async remove(practiceId: number, id: number): Promise<void> {
    const row = await this.entries.findOne({ where: { id, practiceId } });
    if (!row) throw new NotFoundException(`Waitlist entry ${id} not found`);
    await row.destroy();
  }

  /**
   * Waitlisted cases whose first visit fits the time a cancelled appointment freed (its chair time and
   * turnover, at its location), checked by the time finder against everything else that is booked.
   */
  async fits(practiceId: number, appointmentId: number, now = Date.now()): Promise<WaitlistEntry[]> {
    const freed = await this.appointments.findOne({ where: { id: appointmentId, practiceId } });
    if (!freed) throw new NotFoundException(`Appointment ${appointmentId} not found`);
    if (!RELEASED_STATES.includes(freed.state)) throw new ConflictException('The appointment still holds its time; cancel it first');
    const from = freed.start.getTime();
    const to = freed.end.getTime() + freed.turnoverMinutes * 60_000;
    const [input, busy, rows] = await Promise.all([this.finder.loadResources(practiceId, from, to), this.finder.loadBusy(practiceId, from, to), this.rows(practiceId)]);
    const zone = input.resources.locations.find((l) => l.id === String(freed.locationId))?.timeZone ?? 'UTC';
    const freedDay = DateTime.fromMillis(from, { zone }).toISODate()!;
    const out: WaitlistEntry[] = [];
    for (const r of rows) {
      if (r.case_id === freed.caseId || (r.earliest && r.earliest > freedDay)) continue;
      const plan = planOfCase(json(r.estimate), json(r.override));
      if (!plan) continue;
      const result = findTimes(input.resources, busy, {
        plan: { visits: [plan.visits[0]!] },
        from,
        to,
        now,
        locationId: String(freed.locationId),
        turnoverMinutes: plan.turnoverMinutes,
        gridMinutes: input.gridMinutes,
        urgent: r.urgency === 'urgent',
        limit: 1,
      });
      const v = result.proposals[0]?.visits[0];
      if (!v) continue;
      out.push({
        ...WaitlistService.map(r),
        fit: {
          start: new Date(v.start).toISOString(),
          end: new Date(v.end).toISOString(),
          chairId: Number(v.chairId),
          operatorId: Number(v.operatorId),
          ...(v.microscopeId !== undefined ? { microscopeId: Number(v.microscopeId) } : {}),
        },
      });
    }
    return out;
  }
}
