import { BadRequestException, ConflictException, Injectable, NotFoundException } from '@nestjs/common';
import { InjectModel } from '@nestjs/sequelize';
import {
  REFERRAL_STATUSES,
  type CaseSummary,
  type Referral,
  type ReferralListItem,
  type ReferralQueuePage,
  type ReferralStatus,
  type StatusEvent,
} from '@ostium/shared';
import { col, fn, literal, Op, type Order, type Transaction, type WhereOptions } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import { retryOnDeadlock } from '../database/deadlock-retry.util.js';
import { AttachmentsService } from '../attachments/attachments.service.js';
import { mapPatient, PatientsService } from '../patients/patients.service.js';
import { PatientRow } from '../patients/models/patient.model.js';
import { wordsWhere } from '../patients/search.util.js';
import { Location } from '../practices/models/location.model.js';
import { PracticesService } from '../practices/practices.service.js';
import { ReferringDentistRow } from '../referring-dentists/models/referring-dentist.model.js';
import { ReferringDentistsService } from '../referring-dentists/referring-dentists.service.js';
import type { Actor, CasePatch, CaseRecord } from './case-record.types.js';
import type { CreateReferralDto } from './dto/create-referral.dto.js';
import type { ReferralQueryDto } from './dto/referral-query.dto.js';
import { LettersService } from './letters.service.js';
import { CaseRow } from './models/case.model.js';
import { ReferralRow } from './models/referral.model.js';
import { StatusEventRow } from './models/status-event.model.js';
import { dateIn, daysBetween, todayIn } from './referral-dates.util.js';
import { checkTransition, isOpen, OPEN_STATUSES } from './referral-status.util.js';
import { parseReferralTeeth } from './referral-teeth.util.js';

type FieldError = { field: string; message: string };

const mapCase = (c: CaseRow): CaseSummary => ({
  id: c.id,
  referralId: c.referralId,
  toothFdi: c.toothFdi,
  procedure: c.procedure,
  status: c.status,
  level: c.level,
  estimatedMinutes: c.estimatedMinutes,
  visitCount: c.visitCount,
});

const mapEvent = (e: StatusEventRow): StatusEvent => ({ status: e.status, reason: e.reason, at: e.at.toISOString(), byUserId: e.byUserId, byName: e.byName });

/** Open referrals wait until today; closed ones stopped waiting on the day they closed. */
export function waitingDaysOf(r: { status: ReferralStatus; receivedOn: string; statusChangedAt: Date }, timeZone: string, now = new Date()): number {
  const end = isOpen(r.status) ? todayIn(timeZone, now) : dateIn(r.statusChangedAt, timeZone);
  return daysBetween(r.receivedOn, end);
}

function mapListItem(r: ReferralRow, teeth: string[], now: Date): ReferralListItem {
  const p = r.patient!;
  const d = r.referringDentist!;
  const l = r.location!;
  return {
    id: r.id,
    receivedOn: r.receivedOn,
    status: r.status,
    urgency: r.urgency,
    procedure: r.procedure,
    patient: { id: p.id, name: `${p.firstName} ${p.lastName}`, dateOfBirth: p.dateOfBirth },
    referringDentist: { id: d.id, name: d.name, practiceName: d.practiceName },
    location: { id: l.id, name: l.name },
    teeth,
    waitingDays: waitingDaysOf(r, l.timeZone, now),
  };
}

const INCLUDE_PARTIES = [
  { model: PatientRow, as: 'patient' },
  { model: ReferringDentistRow, as: 'referringDentist' },
  { model: Location, as: 'location' },
];

@Injectable()
export class ReferralsService {
  constructor(
    private readonly sequelize: Sequelize,
    private readonly practices: PracticesService,
    private readonly patients: PatientsService,
    private readonly dentists: ReferringDentistsService,
    private readonly attachments: AttachmentsService,
    private readonly letters: LettersService,
    @InjectModel(ReferralRow) private readonly referrals: typeof ReferralRow,
    @InjectModel(CaseRow) private readonly cases: typeof CaseRow,
    @InjectModel(StatusEventRow) private readonly events: typeof StatusEventRow,
    @InjectModel(Location) private readonly locations: typeof Location,
  ) {}

  // ---------- intake ----------

  /**
   * Saves a referral with its patient and referring dentist (existing or new), one case per tooth, its
   * uploads and the acknowledgement to the referring dentist (queued in the outbox) in one transaction.
   */
  async create(practiceId: number, actor: Actor, dto: CreateReferralDto, opts: { sendLetters?: boolean; at?: Date } = {}): Promise<Referral> {
    const practice = await this.practices.get(practiceId);
    const notation = dto.notation ?? practice.settings.toothNotation;
    const errors: FieldError[] = [];
    if (dto.patientId === undefined && dto.patient === undefined) errors.push({ field: 'patient', message: 'give patientId (an existing patient) or patient (a new one)' });
    if (dto.patientId !== undefined && dto.patient !== undefined) errors.push({ field: 'patient', message: 'give patientId or patient, not both' });
    if (dto.referringDentistId === undefined && dto.referringDentist === undefined) {
      errors.push({ field: 'referringDentist', message: 'give referringDentistId (an existing referring dentist) or referringDentist (a new one)' });
    }
    if (dto.referringDentistId !== undefined && dto.referringDentist !== undefined) {
      errors.push({ field: 'referringDentist', message: 'give referringDentistId or referringDentist, not both' });
    }
    const parsed = parseReferralTeeth(dto.teeth, notation, dto.procedure);
    errors.push(...parsed.errors);
    if (new Set(dto.attachmentIds ?? []).size !== (dto.attachmentIds ?? []).length) errors.push({ field: 'attachmentIds', message: 'an attachment is listed twice' });
    if (errors.length) throw new BadRequestException({ message: errors.map((e) => `${e.field}: ${e.message}`).join('; '), errors });

    const now = opts.at ?? new Date();
    // Many referrals entered at once insert into the same tables and indexes: a deadlock victim runs again.
    const id = await retryOnDeadlock(() => this.sequelize.transaction(async (transaction) => {
      const location = await this.locations.findOne({ where: { id: dto.locationId, practiceId }, transaction });
      if (!location) throw new BadRequestException({ message: `Location ${dto.locationId} not found`, errors: [{ field: 'locationId', message: 'does not exist' }] });
      const today = todayIn(location.timeZone, now);
      const receivedOn = dto.receivedOn ?? today;
      if (receivedOn > today) {
        throw new BadRequestException({ message: `receivedOn ${receivedOn} is in the future (today is ${today} at ${location.name})`, errors: [{ field: 'receivedOn', message: 'cannot be in the future' }] });
      }

      let patient: PatientRow;
      if (dto.patientId !== undefined) {
        patient = await this.patients.find(practiceId, dto.patientId, transaction).catch((e) => {
          if (!(e instanceof NotFoundException)) throw e;
          throw new BadRequestException({ message: `Patient ${dto.patientId} not found`, errors: [{ field: 'patientId', message: 'does not exist' }] });
        });
        await this.patients.defaultTimeZone(patient, location.timeZone, transaction);
      } else {
        patient = await this.patients.createRow(practiceId, dto.patient!, { transaction, defaultTimeZone: location.timeZone });
      }

      let dentist: ReferringDentistRow;
      if (dto.referringDentistId !== undefined) {
        dentist = await this.dentists.find(practiceId, dto.referringDentistId, transaction).catch((e) => {
          if (!(e instanceof NotFoundException)) throw e;
          throw new BadRequestException({ message: `Referring dentist ${dto.referringDentistId} not found`, errors: [{ field: 'referringDentistId', message: 'does not exist' }] });
        });
      } else {
        dentist = await this.dentists.createRow(practiceId, dto.referringDentist!, transaction);
      }

      const referral = await this.referrals.create(
        {
          practiceId,
          patientId: patient.id,
          referringDentistId: dentist.id,
          locationId: location.id,
          receivedOn,
          urgency: dto.urgency,
          procedure: dto.procedure,
          reason: dto.reason ?? null,
          notes: dto.notes ?? null,
          status: 'received',
          statusReason: null,
          statusChangedAt: now,
          createdBy: actor.id,
        },
        { transaction },
      );
      for (const t of parsed.teeth) {
        await this.cases.create({ practiceId, referralId: referral.id, toothFdi: t.toothFdi, procedure: t.procedure, status: 'received', updatedBy: actor.id }, { transaction });
      }
      await this.events.create({ practiceId, referralId: referral.id, status: 'received', reason: null, byUserId: actor.id, byName: actor.name, at: now }, { transaction });
      await this.attachments.linkToReferral(practiceId, dto.attachmentIds ?? [], referral.id, transaction);
      if (opts.sendLetters !== false) {
        // Queued in the outbox with the referral: it goes when the mail server takes it, and never without the referral.
        await this.letters.queueAcknowledgement(practiceId, referral.id, { name: dentist.name, email: dentist.email, letterChannel: dentist.letterChannel }, { at: now, createdBy: actor.id, transaction });
      }
      return referral.id;
    }));
    return this.get(practiceId, id);
  }

  // ---------- reading ----------

  private async findRow(practiceId: number, id: number, transaction?: Transaction): Promise<ReferralRow> {
    const r = await this.referrals.findOne({ where: { id, practiceId }, include: INCLUDE_PARTIES, transaction });
    if (!r) throw new NotFoundException(`Referral ${id} not found`);
    return r;
  }

  async get(practiceId: number, id: number): Promise<Referral> {
    const r = await this.findRow(practiceId, id);
    const [cases, events, attachments, letters, dentist] = await Promise.all([
      this.cases.findAll({ where: { referralId: id }, order: [['id', 'ASC']] }),
      this.events.findAll({ where: { referralId: id }, order: [['at', 'ASC'], ['id', 'ASC']] }),
      this.attachments.listForReferral(id),
      this.letters.listForReferral(id),
      this.dentists.mapOne(r.referringDentist!),
    ]);
    return {
      ...mapListItem(r, cases.map((c) => c.toothFdi), new Date()),
      reason: r.reason,
      notes: r.notes,
      statusReason: r.statusReason,
      cases: cases.map(mapCase),
      attachments,
      history: events.map(mapEvent),
      letters,
      patientDetail: mapPatient(r.patient!),
      referringDentistDetail: dentist,
    };
  }

  /** The referral queue: filters, counts per status (under every filter but status), sort and page. */
  async queue(practiceId: number, q: ReferralQueryDto): Promise<ReferralQueuePage> {
    const base: WhereOptions = { practiceId };
    if (q.urgency) Object.assign(base, { urgency: q.urgency });
    if (q.referringDentistId) Object.assign(base, { referringDentistId: q.referringDentistId });
    if (q.locationId) Object.assign(base, { locationId: q.locationId });
    if (q.from && q.to && q.from > q.to) {
      throw new BadRequestException({ message: `from (${q.from}) is after to (${q.to})`, errors: [{ field: 'from', message: 'must be on or before to' }] });
    }
    if (q.from || q.to) Object.assign(base, { receivedOn: { ...(q.from ? { [Op.gte]: q.from } : {}), ...(q.to ? { [Op.lte]: q.to } : {}) } });
    const patientWhere = wordsWhere(q.q, ['firstName', 'lastName']);
    const patientInclude = { model: PatientRow, as: 'patient', ...(patientWhere ? { where: patientWhere, required: true } : {}) };

    const countRows = (await this.referrals.findAll({
      attributes: ['status', [fn('COUNT', col('ReferralRow.id')), 'n']],
      where: base,
      include: [{ ...patientInclude, attributes: [] }],
      group: ['ReferralRow.status'],
      raw: true,
    })) as unknown as { status: ReferralStatus; n: number | string }[];
    const countsByStatus = Object.fromEntries(REFERRAL_STATUSES.map((s) => [s, 0])) as Record<ReferralStatus, number>;
    for (const row of countRows) countsByStatus[row.status] = Number(row.n);

    const statuses = q.status ?? [];
    const where = statuses.length ? { ...base, status: statuses } : base;
    const page = q.page ?? 1;
    const pageSize = q.pageSize ?? 25;
    const { rows, count } = await this.referrals.findAndCountAll({
      where,
      include: [patientInclude, INCLUDE_PARTIES[1]!, INCLUDE_PARTIES[2]!],
      order: this.queueOrder(q.sort ?? 'waiting', q.order),
      limit: pageSize,
      offset: (page - 1) * pageSize,
    });
    const teeth = new Map<number, string[]>();
    if (rows.length) {
      const cases = await this.cases.findAll({ attributes: ['referralId', 'toothFdi'], where: { referralId: rows.map((r) => r.id) }, order: [['id', 'ASC']] });
      for (const c of cases) teeth.set(c.referralId, [...(teeth.get(c.referralId) ?? []), c.toothFdi]);
    }
    const now = new Date();
    return { items: rows.map((r) => mapListItem(r, teeth.get(r.id) ?? [], now)), total: count, page, pageSize, countsByStatus };
  }

  private queueOrder(sort: NonNullable<ReferralQueryDto['sort']>, order?: 'asc' | 'desc'): Order {
    const dir = (fallback: 'ASC' | 'DESC') => (order ? (order.toUpperCase() as 'ASC' | 'DESC') : fallback);
    const open = OPEN_STATUSES.map((s) => this.sequelize.escape(s)).join(', ');
    switch (sort) {
      case 'received':
        return [['receivedOn', dir('DESC')], ['id', dir('DESC')]];
      case 'urgency':
        return [[literal("CASE `ReferralRow`.`urgency` WHEN 'urgent' THEN 2 WHEN 'soon' THEN 1 ELSE 0 END"), dir('DESC')], ['receivedOn', 'ASC'], ['id', 'ASC']];
      case 'patient':
        return [[{ model: PatientRow, as: 'patient' }, 'lastName', dir('ASC')], [{ model: PatientRow, as: 'patient' }, 'firstName', dir('ASC')], ['receivedOn', 'ASC'], ['id', 'ASC']];
      default:
        // Waiting longest first: open referrals before closed ones, oldest received first within each.
        return [[literal(`CASE WHEN \`ReferralRow\`.\`status\` IN (${open}) THEN 0 ELSE 1 END`), 'ASC'], ['receivedOn', dir('ASC')], ['id', dir('ASC')]];
    }
  }

  // ---------- status ----------

  /**
   * Moves a referral along its path (or to declined / cancelled with a reason), records who and when,
   * and moves the cases that were at the referral's old status with it. Throws 400 / 409 otherwise.
   */
  async setStatus(
    practiceId: number,
    referralId: number,
    status: ReferralStatus,
    opts: { actor: Actor; reason?: string | null; transaction?: Transaction; at?: Date },
  ): Promise<void> {
    const run = async (transaction: Transaction) => {
      const r = await this.referrals.findOne({ where: { id: referralId, practiceId }, lock: transaction.LOCK.UPDATE, transaction });
      if (!r) throw new NotFoundException(`Referral ${referralId} not found`);
      const check = checkTransition(r.status, status, opts.reason);
      if (!check.ok) {
        const body = { message: check.message, errors: [{ field: check.field, message: check.message }] };
        throw check.httpStatus === 400 ? new BadRequestException(body) : new ConflictException(body);
      }
      const at = opts.at ?? new Date();
      const from = r.status;
      r.status = status;
      r.statusReason = check.reason;
      r.statusChangedAt = at;
      await r.save({ transaction });
      await this.cases.update({ status, updatedBy: opts.actor.id }, { where: { referralId, status: from }, individualHooks: true, transaction });
      await this.events.create({ practiceId, referralId, status, reason: check.reason, byUserId: opts.actor.id, byName: opts.actor.name, at }, { transaction });
    };
    if (opts.transaction) await run(opts.transaction);
    else await this.sequelize.transaction(run);
  }

  /**
   * The one step back on the path: a booked referral whose visits were all cancelled or missed waits to be
   * booked again (planned), so the queue and the backlog count it. Only the schedule calls this, inside
   * the change that released the last visit; any other status is left as it is. Cases of the referral
   * that were booked go back with it.
   */
  async returnToPlanned(practiceId: number, referralId: number, reason: string, opts: { actor: Actor; transaction: Transaction; at?: Date }): Promise<boolean> {
    const { transaction } = opts;
    const r = await this.referrals.findOne({ where: { id: referralId, practiceId }, lock: transaction.LOCK.UPDATE, transaction });
    if (!r || r.status !== 'booked') return false;
    const at = opts.at ?? new Date();
    r.status = 'planned';
    r.statusReason = reason;
    r.statusChangedAt = at;
    await r.save({ transaction });
    await this.cases.update({ status: 'planned', updatedBy: opts.actor.id }, { where: { referralId, status: 'booked' }, individualHooks: true, transaction });
    await this.events.create({ practiceId, referralId, status: 'planned', reason, byUserId: opts.actor.id, byName: opts.actor.name, at }, { transaction });
    return true;
  }

  async changeStatus(practiceId: number, actor: Actor, referralId: number, status: ReferralStatus, reason?: string | null): Promise<Referral> {
    await this.setStatus(practiceId, referralId, status, { actor, reason });
    return this.get(practiceId, referralId);
  }

  // ---------- cases, for the case sheet and booking ----------

  private async findCase(practiceId: number, caseId: number, transaction?: Transaction, lock = false): Promise<CaseRow> {
    const c = await this.cases.findOne({
      where: { id: caseId, practiceId },
      include: [{ model: ReferralRow, as: 'referral' }],
      transaction,
      ...(lock && transaction ? { lock: transaction.LOCK.UPDATE } : {}),
    });
    if (!c || !c.referral) throw new NotFoundException(`Case ${caseId} not found`);
    return c;
  }

  private static caseRecord(c: CaseRow): CaseRecord {
    const r = c.referral!;
    return {
      ...mapCase(c),
      practiceId: c.practiceId,
      locationId: r.locationId,
      patientId: r.patientId,
      referralStatus: r.status,
      urgency: r.urgency,
      receivedOn: r.receivedOn,
      assessment: c.assessment as CaseRecord['assessment'],
      facts: c.facts as CaseRecord['facts'],
      estimate: c.estimate as unknown as CaseRecord['estimate'],
      tableVersion: c.tableVersion,
      override: c.override,
      canals: c.canals,
      operatorId: c.operatorId,
      updatedBy: c.updatedBy,
      updatedAt: c.updatedAt.toISOString(),
    };
  }

  async getCase(practiceId: number, caseId: number, transaction?: Transaction): Promise<CaseRecord> {
    return ReferralsService.caseRecord(await this.findCase(practiceId, caseId, transaction));
  }

  /** The cases of one referral, read inside the caller's transaction (to see its own uncommitted changes). */
  async casesOf(practiceId: number, referralId: number, transaction?: Transaction): Promise<CaseSummary[]> {
    const rows = await this.cases.findAll({ where: { practiceId, referralId }, order: [['id', 'ASC']], transaction });
    return rows.map(mapCase);
  }

  /** Changes a case's stored fields (audited); pass a transaction to make it part of a larger change. */
  async updateCase(practiceId: number, caseId: number, patch: CasePatch, transaction?: Transaction): Promise<CaseRecord> {
    const run = async (t: Transaction) => {
      const c = await this.findCase(practiceId, caseId, t, true);
      for (const [k, v] of Object.entries(patch)) if (v !== undefined) c.set(k as keyof CaseRow, v as never);
      await c.save({ transaction: t });
      return ReferralsService.caseRecord(c);
    };
    return transaction ? run(transaction) : this.sequelize.transaction(run);
  }

  // ---------- demo data ----------

  /** A referral of this patient from this dentist for this first tooth, if one exists (the seeds' natural key). */
  async findExisting(practiceId: number, patientId: number, referringDentistId: number, toothFdi: string): Promise<number | null> {
    const r = await this.referrals.findOne({
      where: { practiceId, patientId, referringDentistId },
      include: [{ model: CaseRow, as: 'cases', where: { toothFdi }, required: true, attributes: [] }],
    });
    return r?.id ?? null;
  }
}
