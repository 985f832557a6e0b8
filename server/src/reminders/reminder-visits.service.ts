import { Injectable } from '@nestjs/common';
import type { AppointmentState, MessageChannel } from '@ostium/shared';
import { QueryTypes, type Transaction } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';

/** What a reminder needs to know about one visit, read in one query (no clinical fields at all). */
export interface ReminderVisit {
  id: number;
  practiceId: number;
  seriesId: string;
  visitIndex: number;
  referralId: number;
  start: Date;
  end: Date;
  state: AppointmentState;
  version: number;
  createdAt: Date;
  patient: { id: number; phone: string | null; email: string | null; smsConsent: boolean; timeZone: string | null };
  location: { id: number; name: string; address: string | null; timeZone: string };
  practice: { name: string; phone: string | null };
}

interface VisitRow {
  id: number;
  practice_id: number;
  series_id: string;
  visit_index: number;
  referral_id: number;
  start: Date;
  end: Date;
  state: AppointmentState;
  version: number;
  created_at: Date;
  patient_id: number;
  phone: string | null;
  email: string | null;
  sms_consent: number | boolean;
  patient_zone: string | null;
  location_id: number;
  location_name: string;
  address: string | null;
  location_zone: string;
  practice_name: string;
  practice_phone: string | null;
}

const VISIT_SQL = `SELECT a.id, a.practice_id, a.series_id, a.visit_index, a.referral_id, a.start, a.end, a.state, a.version, a.created_at,
       p.id AS patient_id, p.phone, p.email, p.sms_consent, p.time_zone AS patient_zone,
       l.id AS location_id, l.name AS location_name, l.address, l.time_zone AS location_zone,
       pr.name AS practice_name, pr.phone AS practice_phone
  FROM appointments a
  JOIN referrals r ON r.id = a.referral_id
  JOIN patients p ON p.id = r.patient_id
  JOIN locations l ON l.id = a.location_id
  JOIN practices pr ON pr.id = a.practice_id`;

function mapVisit(r: VisitRow): ReminderVisit {
  return {
    id: r.id,
    practiceId: r.practice_id,
    seriesId: r.series_id,
    visitIndex: r.visit_index,
    referralId: r.referral_id,
    start: new Date(r.start),
    end: new Date(r.end),
    state: r.state,
    version: r.version,
    createdAt: new Date(r.created_at),
    patient: { id: r.patient_id, phone: r.phone, email: r.email, smsConsent: !!r.sms_consent, timeZone: r.patient_zone },
    location: { id: r.location_id, name: r.location_name, address: r.address, timeZone: r.location_zone },
    practice: { name: r.practice_name, phone: r.practice_phone },
  };
}

/** States in which a visit still lies ahead and reminders for it make sense. */
export const REMINDABLE_STATES: readonly AppointmentState[] = ['booked', 'confirmed'];

export const isRemindable = (v: Pick<ReminderVisit, 'state' | 'start'>, now: Date | number) => REMINDABLE_STATES.includes(v.state) && v.start.getTime() > +now;

/** The patient's own zone for quiet hours, else the visit's location's. */
export const patientZone = (v: ReminderVisit) => v.patient.timeZone || v.location.timeZone;

/** An outbox text counted against the caps: when it went, or when it is due. */
export interface CountedText {
  id: number;
  dedupeKey: string | null;
  status: string;
  at: Date;
}

/**
 * Reads for the reminders module: visits with their patient, location and practice (scheduling and
 * patients own those tables; these are read-only joins, as the calendar feeds do), and the texts a
 * patient already has in the outbox.
 */
@Injectable()
export class ReminderVisitsService {
  constructor(private readonly sequelize: Sequelize) {}

  async visit(id: number, transaction?: Transaction): Promise<ReminderVisit | null> {
    const [row] = await this.sequelize.query<VisitRow>(`${VISIT_SQL} WHERE a.id = :id`, { replacements: { id }, type: QueryTypes.SELECT, transaction });
    return row ? mapVisit(row) : null;
  }

  async series(practiceId: number, seriesId: string, transaction?: Transaction): Promise<ReminderVisit[]> {
    const rows = await this.sequelize.query<VisitRow>(`${VISIT_SQL} WHERE a.practice_id = :practiceId AND a.series_id = :seriesId ORDER BY a.visit_index`, {
      replacements: { practiceId, seriesId },
      type: QueryTypes.SELECT,
      transaction,
    });
    return rows.map(mapVisit);
  }

  /** The practice's next visit that lies ahead (sample values for template previews). */
  async nextVisit(practiceId: number, now: Date): Promise<ReminderVisit | null> {
    const [row] = await this.sequelize.query<VisitRow>(`${VISIT_SQL} WHERE a.practice_id = :practiceId AND a.state IN (:states) AND a.start > :now ORDER BY a.start, a.id LIMIT 1`, {
      replacements: { practiceId, now, states: REMINDABLE_STATES },
      type: QueryTypes.SELECT,
    });
    return row ? mapVisit(row) : null;
  }

  /** The practice's location names, for the longest text a template can produce. */
  async locationNames(practiceId: number): Promise<string[]> {
    const rows = await this.sequelize.query<{ name: string }>('SELECT name FROM locations WHERE practice_id = :practiceId ORDER BY id', {
      replacements: { practiceId },
      type: QueryTypes.SELECT,
    });
    return rows.map((r) => r.name);
  }

  /**
   * Serialises planning for one patient across processes (the caps depend on the patient's other
   * texts): a row lock on the patient, held until the caller's transaction ends.
   */
  async lockPatient(patientId: number, transaction: Transaction): Promise<void> {
    await this.sequelize.query('SELECT id FROM patients WHERE id = :patientId FOR UPDATE', { replacements: { patientId }, type: QueryTypes.SELECT, transaction });
  }

  /**
   * The patient's texts that count against the caps, from a week before `from` on: sent ones at the
   * time they went, queued ones (when `queued`) at their due time. Answers to the patient's own message
   * (keyword and desk replies) do not count; nor do texts that failed, were skipped or cancelled.
   */
  async countedTexts(practiceId: number, patientId: number, from: Date, opts: { queued: boolean }, transaction?: Transaction): Promise<CountedText[]> {
    const statuses = opts.queued ? ['pending', 'sending', 'sent', 'delivered'] : ['sending', 'sent', 'delivered'];
    const rows = await this.sequelize.query<{ id: number; dedupe_key: string | null; status: string; at: Date }>(
      `SELECT id, dedupe_key, status, COALESCE(sent_at, due_at) AS at FROM outbox_messages
        WHERE practice_id = :practiceId AND patient_id = :patientId AND channel = 'sms'
          AND purpose NOT IN ('keyword_reply', 'desk_reply') AND status IN (:statuses)
          AND COALESCE(sent_at, due_at) >= :since`,
      { replacements: { practiceId, patientId, statuses, since: new Date(from.getTime() - 8 * 86_400_000) }, type: QueryTypes.SELECT, transaction },
    );
    return rows.map((r) => ({ id: r.id, dedupeKey: r.dedupe_key, status: r.status, at: new Date(r.at) }));
  }

  /** Visits ahead that reminders are planned for, soonest first. */
  async upcoming(from: Date, to: Date, limit: number): Promise<{ id: number; practiceId: number; seriesId: string; createdAt: Date }[]> {
    const rows = await this.sequelize.query<{ id: number; practice_id: number; series_id: string; created_at: Date }>(
      `SELECT a.id, a.practice_id, a.series_id, a.created_at FROM appointments a
        WHERE a.state IN (:states) AND a.start > :from AND a.start <= :to ORDER BY a.start, a.id LIMIT :limit`,
      { replacements: { states: REMINDABLE_STATES, from, to, limit }, type: QueryTypes.SELECT },
    );
    return rows.map((r) => ({ id: r.id, practiceId: r.practice_id, seriesId: r.series_id, createdAt: new Date(r.created_at) }));
  }

  /** Which of these dedupe keys the outbox already holds (in any status). */
  async existingKeys(keys: string[], transaction?: Transaction): Promise<Set<string>> {
    if (!keys.length) return new Set();
    const rows = await this.sequelize.query<{ dedupe_key: string }>('SELECT dedupe_key FROM outbox_messages WHERE dedupe_key IN (:keys)', {
      replacements: { keys },
      type: QueryTypes.SELECT,
      transaction,
    });
    return new Set(rows.map((r) => r.dedupe_key));
  }
}

export const apptKey = (appointmentId: number, channel: MessageChannel, ruleId: string) => `appt:${appointmentId}:${channel}:${ruleId}`;
export const seriesKey = (seriesId: string, channel: MessageChannel, ruleId: string) => `series:${seriesId}:${channel}:${ruleId}`;
