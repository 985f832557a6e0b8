import { ConflictException, Injectable, Logger, OnModuleInit } from '@nestjs/common';
import { OnEvent } from '@nestjs/event-emitter';
import { InjectModel } from '@nestjs/sequelize';
import type { CaseOverride, EstimateResult } from '@ostium/shared';
import { DateTime } from 'luxon';
import { Op, QueryTypes, type Transaction } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import { MessagingClock } from '../messaging/messaging-clock.service.js';
import type { ComposeDecision } from '../messaging/composer.types.js';
import type { OutboxMessageRow } from '../messaging/models/outbox-message.model.js';
import { OutboxService } from '../messaging/outbox.service.js';
import { isInsideWindow, nextAllowedInstant } from '../reminders/rules/quiet-hours.util.js';
import { APPOINTMENT_CHANGED, type AppointmentChangedEvent, type AppointmentSnapshot } from '../scheduling/appointment-events.js';
import { RELEASED_STATES } from '../scheduling/appointment-state.util.js';
import { AppointmentsService, BookingConflictException } from '../scheduling/appointments.service.js';
import { WaitlistEntryRow } from '../scheduling/models/waitlist-entry.model.js';
import { planOfCase, TimeFinderService } from '../scheduling/time-finder.service.js';
import { findTimes } from '../scheduling/time-finder/time-finder.util.js';
import { DeskTasksService } from './desk-tasks.service.js';
import { WaitlistOfferSlotRow } from './models/waitlist-offer-slot.model.js';
import { WaitlistOfferRow } from './models/waitlist-offer.model.js';
import type { OfferCandidate } from './reply-match.util.js';
import { ReplyContextService } from './reply-context.service.js';
import { visitWhen, waitlistBookedText, waitlistGoneText, waitlistOfferText } from './reply-texts.util.js';

const HOUR = 3_600_000;
/** A move frees its old time for the waitlist only when that time was more than a day away. */
export const MOVE_FREES_AHEAD_MS = 24 * HOUR;
/** An offer closes this long before the freed visit would start, so the taker can still get there. */
export const OFFER_CLOSES_BEFORE_MS = 2 * HOUR;
/** Shorter windows are not worth a text. */
export const MIN_OFFER_WINDOW_MS = 10 * 60_000;
/** A "YES" counts as the answer to an offer texted at most this long ago. */
export const OFFER_ANSWER_WINDOW_MS = 24 * HOUR;

type Json<T> = T | string | null;
const json = <T>(v: Json<T>): T | null => (v === null ? null : typeof v === 'string' ? (JSON.parse(v) as T) : v);

const SEED_ACTOR = { id: null, name: 'Waitlist offer (text reply)' };

interface EntryRow {
  id: number;
  case_id: number;
  earliest: string | null;
  patient_id: number;
  phone: string;
  estimate: Json<EstimateResult>;
  override: Json<CaseOverride>;
  urgency: 'routine' | 'soon' | 'urgent';
}

export interface FreedTime {
  appointmentId: number;
  caseId: number;
  slot: AppointmentSnapshot;
}

export interface PendingOffer extends OfferCandidate {
  slotId: number;
}

export type AcceptResult =
  | { outcome: 'booked'; appointmentId: number; effect: string; text: string }
  | { outcome: 'gone'; effect: string; text: string };

/**
 * Freed time goes to the waitlist by text: a cancellation (or a move away from a time more than a day
 * ahead) opens a slot, the top waitlisted patients whose first visit fits it are texted, and the first
 * "YES" takes it — an atomic claim of the slot row, then a booking through AppointmentsService.book.
 */
@Injectable()
export class WaitlistOffersService implements OnModuleInit {
  private readonly logger = new Logger('WaitlistOffers');

  constructor(
    private readonly sequelize: Sequelize,
    @InjectModel(WaitlistOfferSlotRow) private readonly slots: typeof WaitlistOfferSlotRow,
    @InjectModel(WaitlistOfferRow) private readonly offers: typeof WaitlistOfferRow,
    private readonly outbox: OutboxService,
    private readonly finder: TimeFinderService,
    private readonly appointments: AppointmentsService,
    private readonly context: ReplyContextService,
    private readonly tasks: DeskTasksService,
    private readonly clock: MessagingClock,
  ) {}

  onModuleInit() {
    this.outbox.registerComposer('waitlist_offer', { compose: (row, now, transaction) => this.compose(row, now, transaction) });
  }

  /** The time a change freed for the waitlist, or null (see MOVE_FREES_AHEAD_MS). */
  static freedBy(e: AppointmentChangedEvent, now: number): AppointmentSnapshot | null {
    const p = e.previous;
    const c = e.current;
    if (RELEASED_STATES.includes(p.state) || p.start.getTime() <= now) return null;
    if (c.state === 'cancelled') return p;
    if (RELEASED_STATES.includes(c.state)) return null;
    const moved =
      p.start.getTime() !== c.start.getTime() || p.end.getTime() !== c.end.getTime() || p.chairId !== c.chairId || p.operatorId !== c.operatorId;
    return moved && p.start.getTime() > now + MOVE_FREES_AHEAD_MS ? p : null;
  }

  @OnEvent(APPOINTMENT_CHANGED)
  async onAppointmentChanged(e: AppointmentChangedEvent): Promise<void> {
    try {
      await this.offerFreedTime(e, this.clock.now());
    } catch (err) {
      this.logger.error(`waitlist offer for appointment ${e.appointmentId}: ${(err as Error).stack ?? err}`);
    }
  }

  /** Opens a slot for the freed time and texts the top waitlisted patients who fit; idempotent per freed time. */
  async offerFreedTime(e: AppointmentChangedEvent, now: Date): Promise<{ slotId: number; offerIds: number[] } | null> {
    const slot = WaitlistOffersService.freedBy(e, now.getTime());
    if (!slot) return null;
    const settings = await this.context.settings(e.practiceId);
    const expiresAt = Math.min(now.getTime() + settings.waitlistOfferMinutes * 60_000, slot.start.getTime() - OFFER_CLOSES_BEFORE_MS);
    if (expiresAt - now.getTime() < MIN_OFFER_WINDOW_MS) return null;
    const [freed] = await this.sequelize.query<{ turnover_minutes: number }>('SELECT turnover_minutes FROM appointments WHERE id = :id', {
      replacements: { id: e.appointmentId },
      type: QueryTypes.SELECT,
    });
    const chairFreeUntil = slot.end.getTime() + (freed?.turnover_minutes ?? 0) * 60_000;
    const fitting = await this.fittingEntries(e.practiceId, e.caseId, slot, chairFreeUntil, now, settings.waitlistOfferCount);
    if (!fitting.length) return null;

    const practice = await this.context.practice(e.practiceId);
    const [loc] = await this.sequelize.query<{ name: string; time_zone: string }>('SELECT name, time_zone FROM locations WHERE id = :id', {
      replacements: { id: slot.locationId },
      type: QueryTypes.SELECT,
    });
    const text = waitlistOfferText(practice.name, visitWhen(slot.start, loc?.time_zone ?? 'UTC'), loc?.name ?? 'the practice');

    return this.sequelize.transaction(async (transaction) => {
      // Two deliveries of the same change wait on the appointment's row; the second finds the slot.
      await this.sequelize.query('SELECT id FROM appointments WHERE id = :id FOR UPDATE', { replacements: { id: e.appointmentId }, type: QueryTypes.SELECT, transaction });
      const existing = await this.slots.findOne({ where: { freedAppointmentId: e.appointmentId, start: slot.start, chairId: slot.chairId }, transaction });
      if (existing) return null;
      const row = await this.slots.create(
        {
          practiceId: e.practiceId,
          freedAppointmentId: e.appointmentId,
          locationId: slot.locationId,
          chairId: slot.chairId,
          operatorId: slot.operatorId,
          microscopeId: slot.microscopeId,
          start: slot.start,
          end: slot.end,
          status: 'open',
          expiresAt: new Date(expiresAt),
        },
        { transaction },
      );
      const offerIds: number[] = [];
      for (const f of fitting) {
        const offer = await this.offers.create(
          { practiceId: e.practiceId, slotId: row.id, waitlistEntryId: f.id, patientId: f.patient_id, caseId: f.case_id, status: 'offered' },
          { transaction },
        );
        const { row: out } = await this.outbox.enqueue(
          {
            practiceId: e.practiceId,
            channel: 'sms',
            purpose: 'waitlist_offer',
            dedupeKey: `offer:${offer.id}`,
            patientId: f.patient_id,
            // Not the freed appointment: it belongs to another patient, and its cancellation cancels its own texts.
            appointmentId: null,
            referralId: null,
            to: f.phone,
            body: text,
            payload: { offerId: offer.id, slotId: row.id },
            dueAt: now,
          },
          transaction,
        );
        offer.outboxMessageId = out.id;
        await offer.save({ transaction });
        offerIds.push(offer.id);
      }
      return { slotId: row.id, offerIds };
    });
  }

  /**
   * Waitlisted cases (other than the freed one) whose first visit fits the freed chair and operator's
   * time, in the order urgent → soon → routine, then first come first served; only patients we may
   * text and who hold no other open offer (so a "YES" is never ambiguous). Same check as
   * WaitlistService.fits, narrowed to the freed chair and operator.
   */
  private async fittingEntries(practiceId: number, freedCaseId: number, slot: AppointmentSnapshot, chairFreeUntil: number, now: Date, limit: number): Promise<EntryRow[]> {
    const from = slot.start.getTime();
    const [input, busy, rows] = await Promise.all([
      this.finder.loadResources(practiceId, from, chairFreeUntil),
      this.finder.loadBusy(practiceId, from, chairFreeUntil),
      this.sequelize.query<EntryRow>(
        `SELECT w.id, w.case_id, DATE_FORMAT(w.earliest, '%Y-%m-%d') AS earliest, p.id AS patient_id, p.phone, c.estimate, c.override, r.urgency
           FROM waitlist_entries w
           JOIN cases c ON c.id = w.case_id
           JOIN referrals r ON r.id = c.referral_id
           JOIN patients p ON p.id = r.patient_id
          WHERE w.practice_id = :practiceId AND w.case_id <> :freedCaseId AND p.sms_consent = 1 AND p.phone IS NOT NULL
            AND c.status NOT IN ('declined', 'cancelled', 'completed', 'report_sent')
            AND NOT EXISTS (SELECT 1 FROM waitlist_offers o JOIN waitlist_offer_slots s ON s.id = o.slot_id
                             WHERE o.patient_id = p.id AND o.status = 'offered' AND s.status = 'open' AND s.expires_at > :now)
          ORDER BY FIELD(r.urgency, 'urgent', 'soon', 'routine'), w.created_at, w.id`,
        { replacements: { practiceId, freedCaseId, now }, type: QueryTypes.SELECT },
      ),
    ]);
    const zone = input.resources.locations.find((l) => l.id === String(slot.locationId))?.timeZone ?? 'UTC';
    const freedDay = DateTime.fromMillis(from, { zone }).toISODate()!;
    const resources = { ...input.resources, chairs: input.resources.chairs.filter((c) => c.id === String(slot.chairId)) };
    const out: EntryRow[] = [];
    const seenPatients = new Set<number>();
    for (const r of rows) {
      if (out.length >= limit) break;
      if (seenPatients.has(r.patient_id) || (r.earliest && r.earliest > freedDay)) continue;
      const fit = this.fitOf(resources, busy, input.gridMinutes, r, slot, chairFreeUntil, now.getTime());
      if (!fit) continue;
      seenPatients.add(r.patient_id);
      out.push(r);
    }
    return out;
  }

  private fitOf(
    resources: Parameters<typeof findTimes>[0],
    busy: Parameters<typeof findTimes>[1],
    gridMinutes: number,
    r: Pick<EntryRow, 'estimate' | 'override' | 'urgency'>,
    slot: Pick<AppointmentSnapshot, 'start' | 'locationId' | 'operatorId'>,
    chairFreeUntil: number,
    now: number,
  ) {
    const plan = planOfCase(json(r.estimate), json(r.override));
    if (!plan) return null;
    const result = findTimes(resources, busy, {
      plan: { visits: [plan.visits[0]!] },
      from: slot.start.getTime(),
      to: chairFreeUntil,
      now,
      locationId: String(slot.locationId),
      operatorId: String(slot.operatorId),
      turnoverMinutes: plan.turnoverMinutes,
      gridMinutes,
      urgent: r.urgency === 'urgent',
      limit: 1,
    });
    return result.proposals[0]?.visits[0] ?? null;
  }

  // ---------- the text ----------

  /**
   * At send time: nothing for a slot already taken or expired. Consent and quiet hours are the outbox's
   * own rules for every text; here only what they mean for an offer: quiet hours that outlast it skip it.
   */
  async compose(row: OutboxMessageRow, now: Date, transaction?: Transaction): Promise<ComposeDecision> {
    const offerId = Number((row.payload as { offerId?: unknown } | null)?.offerId);
    const offer = Number.isInteger(offerId) ? await this.offers.findByPk(offerId, { transaction }) : null;
    const slot = offer ? await this.slots.findByPk(offer.slotId, { transaction }) : null;
    if (!offer || !slot) return { action: 'cancel', reason: 'the waitlist offer no longer exists' };
    if (slot.status === 'taken') return { action: 'skip', reason: 'the offered time was already taken' };
    if (slot.status === 'expired' || slot.expiresAt.getTime() <= now.getTime()) return { action: 'skip', reason: 'the waitlist offer expired' };
    if (offer.status !== 'offered') return { action: 'skip', reason: 'the waitlist offer was withdrawn' };
    const [p] = await this.sequelize.query<{ phone: string | null; time_zone: string | null }>('SELECT phone, time_zone FROM patients WHERE id = :id', {
      replacements: { id: offer.patientId },
      type: QueryTypes.SELECT,
      transaction,
    });
    if (!p?.phone) return { action: 'skip', reason: 'no mobile number on file' };
    const [loc] = await this.sequelize.query<{ name: string; time_zone: string }>('SELECT name, time_zone FROM locations WHERE id = :id', {
      replacements: { id: slot.locationId },
      type: QueryTypes.SELECT,
      transaction,
    });
    const settings = await this.context.settings(offer.practiceId, transaction);
    const zone = p.time_zone ?? loc?.time_zone ?? 'UTC';
    if (!isInsideWindow(now, zone, settings.quietHours)) {
      const next = nextAllowedInstant(now, zone, settings.quietHours);
      if (next.getTime() >= slot.expiresAt.getTime()) return { action: 'skip', reason: `quiet hours in ${zone} last until after the offer expires` };
      return { action: 'defer', dueAt: next, reason: `quiet hours in ${zone} until ${settings.quietHours.start}` };
    }
    const practice = await this.context.practice(offer.practiceId, transaction);
    return { action: 'send', to: p.phone, body: waitlistOfferText(practice.name, visitWhen(slot.start, loc?.time_zone ?? zone), loc?.name ?? 'the practice') };
  }

  // ---------- the answer ----------

  /**
   * The offer a confirm word from these patients answers: the latest one texted to them in the last day
   * and not yet answered. A closed one (taken, expired) still counts — its "YES" hears that the time has
   * gone — unless we texted the patient again after it, in which case the "YES" answers that newer text.
   */
  async pendingOffer(patientIds: number[], now: Date, transaction?: Transaction): Promise<PendingOffer | null> {
    if (!patientIds.length) return null;
    const [o] = await this.sequelize.query<{ id: number; patient_id: number; slot_id: number; status: string; outbox_message_id: number; slot_status: string; expires_at: Date }>(
      `SELECT o.id, o.patient_id, o.slot_id, o.status, o.outbox_message_id, s.status AS slot_status, s.expires_at
         FROM waitlist_offers o
         JOIN waitlist_offer_slots s ON s.id = o.slot_id
         JOIN outbox_messages m ON m.id = o.outbox_message_id
        WHERE o.patient_id IN (:patientIds) AND o.answered_at IS NULL AND o.created_at >= :since AND m.status IN ('sending', 'sent', 'delivered')
        ORDER BY o.id DESC LIMIT 1`,
      { replacements: { patientIds, since: new Date(now.getTime() - OFFER_ANSWER_WINDOW_MS) }, type: QueryTypes.SELECT, transaction },
    );
    if (!o) return null;
    const open = o.status === 'offered' && o.slot_status === 'open' && new Date(o.expires_at).getTime() > now.getTime();
    if (!open) {
      const [later] = await this.sequelize.query<{ id: number }>(
        `SELECT id FROM outbox_messages WHERE patient_id = :patientId AND channel = 'sms' AND id > :after AND purpose <> 'keyword_reply' AND status IN ('sending', 'sent', 'delivered') LIMIT 1`,
        { replacements: { patientId: o.patient_id, after: o.outbox_message_id }, type: QueryTypes.SELECT, transaction },
      );
      if (later) return null;
    }
    return { offerId: o.id, patientId: o.patient_id, slotId: o.slot_id, open };
  }

  /**
   * The first "YES" wins: one UPDATE of the slot row guarded by its status, inside the reply's
   * transaction (a second replier's UPDATE waits on the row lock, then matches nothing).
   */
  async claim(offerId: number, now: Date, transaction: Transaction): Promise<'won' | 'gone'> {
    const offer = await this.offers.findByPk(offerId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!offer || offer.answeredAt) return 'gone';
    const [affected] = await this.slots.update(
      { status: 'taken', takenByOfferId: offerId },
      { where: { id: offer.slotId, status: 'open', expiresAt: { [Op.gt]: now } }, transaction },
    );
    if (affected === 1 && offer.status === 'offered') {
      offer.set({ status: 'accepted', answeredAt: now });
      await offer.save({ transaction });
      return 'won';
    }
    if (affected === 1) {
      // Withdrawn offer but the slot was still open: give the slot back.
      await this.slots.update({ status: 'open', takenByOfferId: null }, { where: { id: offer.slotId, takenByOfferId: offerId }, transaction });
    }
    await this.slots.update({ status: 'expired' }, { where: { id: offer.slotId, status: 'open', expiresAt: { [Op.lte]: now } }, transaction });
    offer.set({ status: offer.status === 'offered' ? 'gone' : offer.status, answeredAt: now });
    await offer.save({ transaction });
    return 'gone';
  }

  /** What a patient who lost (or answered late) hears. */
  async goneText(practiceId: number, transaction?: Transaction): Promise<string> {
    return waitlistGoneText((await this.context.practice(practiceId, transaction)).name);
  }

  /**
   * After the claim committed: books the freed time for the winner through the same guarded path as the
   * desk. A 409 means the time went after all (booked meanwhile by the desk): the slot closes and the
   * patient hears so. The waitlist entry goes once booked; the other offers of the slot are withdrawn.
   */
  async bookClaimed(practiceId: number, offerId: number, now: Date): Promise<AcceptResult> {
    const offer = await this.offers.findOne({ where: { id: offerId, practiceId } });
    const slot = offer ? await this.slots.findByPk(offer.slotId) : null;
    if (!offer || !slot) return { outcome: 'gone', effect: 'The waitlist offer no longer exists', text: await this.goneText(practiceId) };
    const practice = await this.context.practice(offer.practiceId);
    const [loc] = await this.sequelize.query<{ name: string; time_zone: string }>('SELECT name, time_zone FROM locations WHERE id = :id', {
      replacements: { id: slot.locationId },
      type: QueryTypes.SELECT,
    });
    const zone = loc?.time_zone ?? 'UTC';
    const when = visitWhen(slot.start, zone);
    const fail = async (reason: string, timeGone: boolean): Promise<AcceptResult> => {
      await this.sequelize.transaction(async (transaction) => {
        await this.slots.update(timeGone ? { status: 'expired' } : { status: 'open', takenByOfferId: null }, { where: { id: slot.id, takenByOfferId: offerId }, transaction });
        await this.offers.update({ status: 'gone' }, { where: { id: offerId }, transaction });
      });
      return { outcome: 'gone', effect: `Took the waitlist offer for ${when}, but it could not be booked: ${reason}`, text: waitlistGoneText(practice.name) };
    };

    const [entry] = await this.sequelize.query<EntryRow>(
      `SELECT w.id, w.case_id, NULL AS earliest, r.patient_id, '' AS phone, c.estimate, c.override, r.urgency
         FROM cases c JOIN referrals r ON r.id = c.referral_id LEFT JOIN waitlist_entries w ON w.case_id = c.id
        WHERE c.id = :caseId`,
      { replacements: { caseId: offer.caseId }, type: QueryTypes.SELECT },
    );
    if (!entry) return fail('the case no longer exists', false);
    const chairFreeUntil = await this.chairFreeUntil(slot);
    const [input, busy] = await Promise.all([
      this.finder.loadResources(offer.practiceId, slot.start.getTime(), chairFreeUntil),
      this.finder.loadBusy(offer.practiceId, slot.start.getTime(), chairFreeUntil),
    ]);
    const resources = { ...input.resources, chairs: input.resources.chairs.filter((c) => c.id === String(slot.chairId)) };
    const fit = this.fitOf(resources, busy, input.gridMinutes, entry, slot, chairFreeUntil, now.getTime());
    if (!fit) return fail('the time is no longer free', true);

    let appointmentId: number;
    try {
      const { body } = await this.appointments.book(
        offer.practiceId,
        SEED_ACTOR,
        {
          caseId: offer.caseId,
          visits: [
            {
              start: new Date(fit.start).toISOString(),
              end: new Date(fit.end).toISOString(),
              chairId: Number(fit.chairId),
              operatorId: Number(fit.operatorId),
              ...(fit.microscopeId !== undefined ? { microscopeId: Number(fit.microscopeId) } : {}),
            },
          ],
        },
        `waitlist-offer:${offerId}`,
      );
      appointmentId = body.appointments[0]!.id;
    } catch (e) {
      if (e instanceof BookingConflictException) return fail('the time was booked meanwhile', true);
      if (e instanceof ConflictException) return fail(String((e.getResponse() as { message?: string }).message ?? e.message), false);
      throw e;
    }

    const later = await this.sequelize.query<{ id: number; start: Date }>(
      `SELECT a.id, a.start FROM appointments a WHERE a.case_id = :caseId AND a.id <> :appointmentId AND a.state IN ('booked', 'confirmed') AND a.start > :now ORDER BY a.start`,
      { replacements: { caseId: offer.caseId, appointmentId, now }, type: QueryTypes.SELECT },
    );
    await this.sequelize.transaction(async (transaction) => {
      await this.slots.update({ bookedAppointmentId: appointmentId }, { where: { id: slot.id }, transaction });
      await this.offers.update({ status: 'gone' }, { where: { slotId: slot.id, status: 'offered', id: { [Op.ne]: offerId } }, transaction });
      const entryRow = await WaitlistEntryRow.findOne({ where: { id: offer.waitlistEntryId, practiceId: offer.practiceId }, transaction });
      if (entryRow) await entryRow.destroy({ transaction });
      if (later.length) {
        await this.tasks.create(
          {
            practiceId: offer.practiceId,
            kind: 'reschedule_request',
            patientId: offer.patientId,
            appointmentId: later[0]!.id,
            detail: `Took the earlier waitlist time ${when}; the visit on ${visitWhen(later[0]!.start, zone)} is still booked — move or cancel it`,
          },
          transaction,
        );
      }
    });
    return {
      outcome: 'booked',
      appointmentId,
      effect: `Took the waitlist offer: booked ${when} at ${loc?.name ?? 'the practice'} (appointment ${appointmentId}); removed from the waitlist`,
      text: waitlistBookedText(practice.name, when, loc?.name ?? 'the practice'),
    };
  }

  private async chairFreeUntil(slot: WaitlistOfferSlotRow): Promise<number> {
    const [freed] = slot.freedAppointmentId
      ? await this.sequelize.query<{ turnover_minutes: number }>('SELECT turnover_minutes FROM appointments WHERE id = :id', {
          replacements: { id: slot.freedAppointmentId },
          type: QueryTypes.SELECT,
        })
      : [];
    return slot.end.getTime() + (freed?.turnover_minutes ?? 0) * 60_000;
  }
}
