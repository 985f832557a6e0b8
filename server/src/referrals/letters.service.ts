import { Injectable } from '@nestjs/common';
import { InjectModel } from '@nestjs/sequelize';
import type { LetterChannel, LetterSummary, OutboxStatus, PracticeSummary } from '@ostium/shared';
import { QueryTypes, UniqueConstraintError, type Transaction } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import { OutboxService } from '../messaging/outbox.service.js';
import { PatientRow } from '../patients/models/patient.model.js';
import { Location } from '../practices/models/location.model.js';
import { PracticesService } from '../practices/practices.service.js';
import { ReferringDentistRow } from '../referring-dentists/models/referring-dentist.model.js';
import { bookingNoticeSubject } from './booking-notice-letter.util.js';
import { acknowledgementSubject } from './acknowledgement-letter.util.js';
import { letterOutcome, queuedDetail, type LetterOutcome, type OutboxState } from './letter-outcome.util.js';
import { LetterRow } from './models/letter.model.js';
import { ReferralRow } from './models/referral.model.js';

const iso = (d: Date | null | undefined) => (d ? new Date(d).toISOString() : null);

/**
 * A letter as the referral page shows it. A queued letter whose outbox row has already ended shows that
 * end at once (the settle job records it on the letter shortly after); one still on its way shows why
 * the last attempt did not go, if it did not.
 */
export function mapLetter(l: LetterRow, outbox?: OutboxState): LetterSummary {
  const base: LetterSummary = { id: l.id, kind: l.kind, to: l.toAddress, subject: l.subject, status: l.status, detail: l.detail, at: l.at.toISOString(), sentAt: iso(l.sentAt) };
  if (l.status !== 'queued') return base;
  const ended = outbox ? letterOutcome(outbox) : null;
  if (ended) return { ...base, status: ended.status, detail: ended.detail, sentAt: iso(ended.sentAt) };
  return { ...base, detail: queuedDetail(outbox) };
}

/** Everything a letter about one referral may say, read again whenever a letter is composed. */
export interface LetterParties {
  practice: Pick<PracticeSummary, 'name' | 'phone' | 'email'>;
  location: { id: number; name: string; address: string | null; phone: string | null; timeZone: string };
  dentist: { id: number; name: string; practiceName: string | null; email: string | null; letterChannel: LetterChannel };
  patient: { id: number; firstName: string; lastName: string; dateOfBirth: string };
  referral: { id: number; receivedOn: string };
}

export interface QueueLetterInput {
  practiceId: number;
  referralId: number;
  caseId?: number | null;
  kind: LetterSummary['kind'];
  /** One letter per key, whoever queues it and however often (`booking_notice:<referralId>`). */
  dedupeKey?: string | null;
  dentist: { name: string; email: string | null; letterChannel: LetterChannel };
  subject: string;
  at: Date;
  createdBy?: number | null;
}

interface OutboxStateRow {
  id: number;
  status: OutboxStatus;
  last_error: string | null;
  defer_reason: string | null;
  sent_at: Date | null;
  provider_id: string | null;
}

const toState = (r: OutboxStateRow): OutboxState => ({
  id: Number(r.id),
  status: r.status,
  lastError: r.last_error,
  deferReason: r.defer_reason,
  sentAt: r.sent_at ? new Date(r.sent_at) : null,
  providerId: r.provider_id,
});

/**
 * Letters to referring dentists, each logged on its referral. A letter is queued with its outbox row in
 * the caller's transaction (dedupe `letter:<letterId>`); the `letter` composer writes it at send time and
 * the settle job records the outbox's end on it (docs/messaging.md "Letters").
 */
@Injectable()
export class LettersService {
  constructor(
    private readonly sequelize: Sequelize,
    private readonly outbox: OutboxService,
    private readonly practices: PracticesService,
    @InjectModel(LetterRow) private readonly letters: typeof LetterRow,
    @InjectModel(ReferralRow) private readonly referrals: typeof ReferralRow,
  ) {}

  private async outboxStates(letters: LetterRow[], transaction?: Transaction): Promise<Map<number, OutboxState>> {
    const ids = letters.filter((l) => l.status === 'queued' && l.outboxMessageId).map((l) => l.outboxMessageId!);
    if (!ids.length) return new Map();
    const rows = await this.sequelize.query<OutboxStateRow>(
      'SELECT id, status, last_error, defer_reason, sent_at, provider_id FROM outbox_messages WHERE id IN (:ids)',
      { replacements: { ids }, type: QueryTypes.SELECT, transaction },
    );
    return new Map(rows.map((r) => [Number(r.id), toState(r)]));
  }

  async listForReferral(referralId: number, transaction?: Transaction): Promise<LetterSummary[]> {
    const rows = await this.letters.findAll({ where: { referralId }, order: [['at', 'ASC'], ['id', 'ASC']], transaction });
    const states = await this.outboxStates(rows, transaction);
    return rows.map((l) => mapLetter(l, l.outboxMessageId ? states.get(l.outboxMessageId) : undefined));
  }

  async find(practiceId: number, id: number, transaction?: Transaction): Promise<LetterRow | null> {
    return this.letters.findOne({ where: { id, practiceId }, transaction });
  }

  async summary(practiceId: number, id: number, transaction?: Transaction): Promise<LetterSummary | null> {
    const l = await this.find(practiceId, id, transaction);
    if (!l) return null;
    const states = await this.outboxStates([l], transaction);
    return mapLetter(l, l.outboxMessageId ? states.get(l.outboxMessageId) : undefined);
  }

  /**
   * Logs a letter and, when the referring dentist takes letters by e-mail, queues it in the outbox in the
   * same transaction, so the letter exists exactly when what it is about does. Without an address, or
   * when the dentist prefers post or fax, it is logged as skipped with the reason.
   */
  async queue(input: QueueLetterInput, transaction?: Transaction): Promise<{ letter: LetterRow; created: boolean }> {
    if (!transaction) return this.sequelize.transaction((t) => this.queue(input, t));
    const key = input.dedupeKey ?? null;
    if (key) {
      const existing = await this.letters.findOne({ where: { dedupeKey: key }, transaction });
      if (existing) return { letter: existing, created: false };
    }
    const d = input.dentist;
    const base = { practiceId: input.practiceId, referralId: input.referralId, caseId: input.caseId ?? null, kind: input.kind, subject: input.subject, at: input.at, dedupeKey: key, messageId: null };
    try {
      if (!d.email) {
        return { letter: await this.letters.create({ ...base, toAddress: d.name, status: 'skipped', detail: 'no e-mail address on file for the referring dentist' }, { transaction }), created: true };
      }
      if (d.letterChannel !== 'email') {
        const detail = `the referring dentist prefers letters by ${d.letterChannel}; send it that way`;
        return { letter: await this.letters.create({ ...base, toAddress: d.email, status: 'skipped', detail }, { transaction }), created: true };
      }
      const letter = await this.letters.create({ ...base, toAddress: d.email, status: 'queued', detail: null }, { transaction });
      const { row } = await this.outbox.enqueue(
        {
          practiceId: input.practiceId,
          channel: 'email',
          purpose: 'letter',
          dedupeKey: `letter:${letter.id}`,
          referralId: input.referralId,
          letterId: letter.id,
          to: d.email,
          subject: input.subject,
          payload: { letterId: letter.id },
          dueAt: input.at,
          createdBy: input.createdBy ?? null,
        },
        transaction,
      );
      letter.outboxMessageId = row.id;
      await letter.save({ transaction });
      return { letter, created: true };
    } catch (e) {
      if (key && e instanceof UniqueConstraintError) {
        // Someone queued the same letter a moment ago; theirs stands.
        const existing = await this.letters.findOne({ where: { dedupeKey: key }, transaction, lock: transaction.LOCK.SHARE });
        if (existing) return { letter: existing, created: false };
      }
      throw e;
    }
  }

  /** The acknowledgement of a referral just taken, queued inside the referral's own transaction. */
  async queueAcknowledgement(
    practiceId: number,
    referralId: number,
    dentist: QueueLetterInput['dentist'],
    opts: { at: Date; createdBy: number | null; transaction: Transaction },
  ): Promise<LetterRow> {
    const practice = await this.practices.get(practiceId, opts.transaction);
    const { letter } = await this.queue(
      { practiceId, referralId, kind: 'acknowledgement', dedupeKey: `acknowledgement:${referralId}`, dentist, subject: acknowledgementSubject(practice.name), at: opts.at, createdBy: opts.createdBy },
      opts.transaction,
    );
    return letter;
  }

  /** The referral's patient, referring dentist, location and practice as they are now. */
  /**
   * The booking notice of a referral, at most once (dedupe key `booking_notice:<referralId>`). The schedule
   * calls it inside the booking's own transaction, so the notice is queued if and only if the booking commits.
   */
  async queueBookingNotice(practiceId: number, referralId: number, caseId: number, actorId: number | null, at: Date, transaction?: Transaction): Promise<boolean> {
    const p = await this.parties(practiceId, referralId, transaction);
    if (!p) return false;
    const { created } = await this.queue(
      { practiceId, referralId, caseId, kind: 'booking_notice', dedupeKey: `booking_notice:${referralId}`, dentist: p.dentist, subject: bookingNoticeSubject(p.practice.name), at, createdBy: actorId },
      transaction,
    );
    return created;
  }

  async parties(practiceId: number, referralId: number, transaction?: Transaction): Promise<LetterParties | null> {
    const r = await this.referrals.findOne({
      where: { id: referralId, practiceId },
      include: [
        { model: PatientRow, as: 'patient' },
        { model: ReferringDentistRow, as: 'referringDentist' },
        { model: Location, as: 'location' },
      ],
      transaction,
    });
    if (!r || !r.patient || !r.referringDentist || !r.location) return null;
    const practice = await this.practices.get(practiceId, transaction);
    const d = r.referringDentist;
    return {
      practice: { name: practice.name, phone: practice.phone, email: practice.email },
      location: { id: r.location.id, name: r.location.name, address: r.location.address, phone: r.location.phone, timeZone: r.location.timeZone },
      dentist: { id: d.id, name: d.name, practiceName: d.practiceName, email: d.email, letterChannel: d.letterChannel },
      patient: { id: r.patient.id, firstName: r.patient.firstName, lastName: r.patient.lastName, dateOfBirth: r.patient.dateOfBirth },
      referral: { id: r.id, receivedOn: r.receivedOn },
    };
  }

  /** What the composer wrote, kept on the letter (the PDF is rendered again from it). */
  async recordComposed(letterId: number, v: { toAddress: string; subject: string; content: Record<string, unknown> }): Promise<void> {
    await this.letters.update({ toAddress: v.toAddress.slice(0, 254), subject: v.subject.slice(0, 255), content: v.content }, { where: { id: letterId }, individualHooks: true });
  }

  /** A failed letter whose outbox row the front desk sent again is on its way once more. */
  async reopen(letterId: number): Promise<void> {
    await this.letters.update({ status: 'queued', detail: null }, { where: { id: letterId, status: 'failed' }, individualHooks: true });
  }

  /** Queued letters whose outbox row has ended (sent, failed, skipped, cancelled), oldest first. */
  async unsettled(limit: number, outboxId?: number): Promise<{ letterId: number; outbox: OutboxState }[]> {
    const rows = await this.sequelize.query<OutboxStateRow & { letter_id: number }>(
      `SELECT l.id AS letter_id, o.id, o.status, o.last_error, o.defer_reason, o.sent_at, o.provider_id
         FROM letters l JOIN outbox_messages o ON o.id = l.outbox_message_id
        WHERE l.status = 'queued' AND o.status IN ('sent', 'delivered', 'failed', 'skipped', 'cancelled')
          ${outboxId ? 'AND o.id = :outboxId' : ''}
        ORDER BY l.id LIMIT :limit`,
      { replacements: { limit, outboxId }, type: QueryTypes.SELECT },
    );
    return rows.map((r) => ({ letterId: Number(r.letter_id), outbox: toState(r) }));
  }

  /**
   * Records the outbox's end on a still-queued letter, under a row lock so two workers settle it once;
   * null when it was already settled.
   */
  async settle(letterId: number, outcome: LetterOutcome, transaction: Transaction): Promise<LetterRow | null> {
    const l = await this.letters.findOne({ where: { id: letterId }, lock: transaction.LOCK.UPDATE, transaction });
    if (!l || l.status !== 'queued') return null;
    l.set({ status: outcome.status, detail: outcome.detail?.slice(0, 1000) ?? null, sentAt: outcome.sentAt, messageId: outcome.messageId ?? l.messageId });
    await l.save({ transaction });
    return l;
  }
}
