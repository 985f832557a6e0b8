import { Injectable, Logger } from '@nestjs/common';
import { EventEmitter2 } from '@nestjs/event-emitter';
import type { AppointmentState } from '@ostium/shared';
import { QueryTypes, type Transaction } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import { APPOINTMENT_CHANGED, type AppointmentChangedEvent, type AppointmentSnapshot } from '../scheduling/appointment-events.js';
import { canTransition } from '../scheduling/appointment-state.util.js';
import { AppointmentRow } from '../scheduling/models/appointment.model.js';
import { RECENT_PAST_MS, REPLYABLE_STATES } from './reply-match.util.js';
import { visitWhen } from './reply-texts.util.js';

/** One visit as a reply or the visit page sees it. */
export interface VisitFacts {
  id: number;
  practiceId: number;
  version: number;
  caseId: number;
  referralId: number;
  patientId: number;
  state: AppointmentState;
  start: Date;
  end: Date;
  locationId: number;
  locationName: string;
  timeZone: string;
}

export type ConfirmOutcome =
  | { outcome: 'confirmed'; event: AppointmentChangedEvent }
  | { outcome: 'already_confirmed' }
  | { outcome: 'changed' }
  | { outcome: 'not_confirmable'; state: AppointmentState };

const VISIT_SQL = `SELECT a.id, a.practice_id, a.version, a.case_id, a.referral_id, r.patient_id, a.state, a.start, a.end, a.location_id, l.name AS location_name, l.time_zone
  FROM appointments a
  JOIN referrals r ON r.id = a.referral_id
  JOIN locations l ON l.id = a.location_id`;

interface VisitRow {
  id: number;
  practice_id: number;
  version: number;
  case_id: number;
  referral_id: number;
  patient_id: number;
  state: AppointmentState;
  start: Date;
  end: Date;
  location_id: number;
  location_name: string;
  time_zone: string;
}

const mapVisit = (r: VisitRow): VisitFacts => ({
  id: r.id,
  practiceId: r.practice_id,
  version: r.version,
  caseId: r.case_id,
  referralId: r.referral_id,
  patientId: r.patient_id,
  state: r.state,
  start: new Date(r.start),
  end: new Date(r.end),
  locationId: r.location_id,
  locationName: r.location_name,
  timeZone: r.time_zone,
});

const snapshot = (row: AppointmentRow): AppointmentSnapshot => ({
  start: new Date(row.start),
  end: new Date(row.end),
  state: row.state,
  chairId: row.chairId,
  operatorId: row.operatorId,
  microscopeId: row.microscopeId,
  locationId: row.locationId,
});

/**
 * What a patient's reply can do to a visit: confirm it (by text or link). Confirming takes no chair
 * time, so it needs no occupancy cells; it keeps the scheduling rules that matter — the state machine,
 * the version that was read (row locked, compared, bumped) — and emits APPOINTMENT_CHANGED after commit,
 * as AppointmentsService.update does, so the Chair board and the reminder planner hear of it.
 */
@Injectable()
export class VisitActionsService {
  private readonly logger = new Logger('VisitActions');

  constructor(
    private readonly sequelize: Sequelize,
    private readonly events: EventEmitter2,
  ) {}

  async visit(id: number, transaction?: Transaction): Promise<VisitFacts | null> {
    const [row] = await this.sequelize.query<VisitRow>(`${VISIT_SQL} WHERE a.id = :id`, { replacements: { id }, type: QueryTypes.SELECT, transaction });
    return row ? mapVisit(row) : null;
  }

  /** Visits of these patients that a reply at `now` could be about (booked/confirmed, from two hours back). */
  async replyableVisits(patientIds: number[], now: Date, transaction?: Transaction): Promise<VisitFacts[]> {
    if (!patientIds.length) return [];
    const rows = await this.sequelize.query<VisitRow>(
      `${VISIT_SQL} WHERE r.patient_id IN (:patientIds) AND a.state IN (:states) AND a.start >= :from ORDER BY a.start, a.id LIMIT 50`,
      { replacements: { patientIds, states: REPLYABLE_STATES, from: new Date(now.getTime() - RECENT_PAST_MS) }, type: QueryTypes.SELECT, transaction },
    );
    return rows.map(mapVisit);
  }

  /** Confirms with the version the caller read; the event is returned for emitting after the commit. */
  async confirm(practiceId: number, appointmentId: number, version: number, via: 'sms' | 'link', now: Date, transaction: Transaction): Promise<ConfirmOutcome> {
    const row = await AppointmentRow.findOne({ where: { id: appointmentId, practiceId }, lock: transaction.LOCK.UPDATE, transaction });
    if (!row) return { outcome: 'not_confirmable', state: 'cancelled' };
    if (row.state === 'confirmed') return { outcome: 'already_confirmed' };
    if (row.version !== version) return { outcome: 'changed' };
    if (!canTransition(row.state, 'confirmed')) return { outcome: 'not_confirmable', state: row.state };
    const previous = snapshot(row);
    row.set({ state: 'confirmed', confirmedAt: now, confirmedVia: via, version: row.version + 1 });
    await row.save({ transaction });
    return {
      outcome: 'confirmed',
      event: { practiceId, appointmentId: row.id, caseId: row.caseId, referralId: row.referralId, previous, current: snapshot(row), actorId: null, at: now },
    };
  }

  /** After the commit, like AppointmentsService: a listener's failure never undoes the confirmation. */
  emitChanged(event: AppointmentChangedEvent | null | undefined) {
    if (!event) return;
    try {
      this.events.emit(APPOINTMENT_CHANGED, event);
    } catch (e) {
      this.logger.warn(`a listener of ${APPOINTMENT_CHANGED} failed: ${(e as Error).message}`);
    }
  }

  static describe(v: Pick<VisitFacts, 'start' | 'timeZone'>): string {
    return visitWhen(v.start, v.timeZone);
  }
}
