import { ConflictException, Injectable, Logger, NotFoundException } from '@nestjs/common';
import { EventEmitter2 } from '@nestjs/event-emitter';
import { InjectModel } from '@nestjs/sequelize';
import { MESSAGE_CHANNELS, OUTBOX_PURPOSES, type OutboxMessage, type OutboxPurpose, type OutboxStatus } from '@ostium/shared';
import { Op, QueryTypes, UniqueConstraintError, type Transaction, type WhereOptions } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import { ER_LOCK_DEADLOCK, sqlErrno } from '../database/deadlock-retry.util.js';
import { assertZone, DEFAULT_QUIET_WINDOW, isInsideWindow, nextAllowedInstant, parseWindow, type QuietWindow } from '../reminders/rules/index.js';
import type { ComposeDecision, EnqueueInput, MessageComposer } from './composer.types.js';
import { OUTBOX_FAILED, type OutboxFailedEvent } from './messaging-events.js';
import { OutboxMessageRow } from './models/outbox-message.model.js';
import { providerCodeInWords } from './sms-sender.service.js';

/** Where neither the patient nor the practice names a zone (the project's practices are in New York). */
const FALLBACK_ZONE = 'America/New_York';
const LIST_LIMIT = 500;

const iso = (d: Date | null) => (d ? d.toISOString() : null);

export function mapOutboxMessage(r: OutboxMessageRow): OutboxMessage {
  return {
    id: r.id,
    channel: r.channel,
    purpose: r.purpose,
    ruleId: r.ruleId,
    appointmentId: r.appointmentId,
    patientId: r.patientId,
    referralId: r.referralId,
    to: r.toAddress,
    subject: r.subject,
    body: r.body,
    status: r.status,
    dueAt: r.dueAt.toISOString(),
    plannedAt: r.plannedAt.toISOString(),
    deferReason: r.deferReason,
    attempts: r.attempts,
    lastError: r.lastError,
    providerId: r.providerId,
    providerStatus: r.providerStatus,
    sentAt: iso(r.sentAt),
    deliveredAt: iso(r.deliveredAt),
    failedAt: iso(r.failedAt),
    createdAt: r.createdAt.toISOString(),
  };
}

/** What the front desk sees when no composer was registered: the row's own address and text. */
export const defaultComposer: MessageComposer = {
  async compose(row) {
    if (!row.toAddress) return { action: 'skip', reason: 'there is no address to send to' };
    if (!row.body) return { action: 'skip', reason: 'the message has no text' };
    return { action: 'send', to: row.toAddress, subject: row.subject, body: row.body };
  },
};

// Provider statuses in the order a text goes through them; a callback never moves a row back.
const PROVIDER_STATUS_RANK: Record<string, number> = {
  accepted: 1,
  scheduled: 1,
  queued: 1,
  sending: 2,
  sent: 3,
  delivered: 4,
  undelivered: 4,
  failed: 4,
  canceled: 4,
  read: 5,
};

/** The rank of the row's current provider_status, in SQL (unknown or none → 0). */
const RANK_SQL = `CASE provider_status ${Object.entries(PROVIDER_STATUS_RANK)
  .map(([k, v]) => `WHEN '${k}' THEN ${v}`)
  .join(' ')} ELSE 0 END`;

export interface DeliveryStatusUpdate {
  messageSid: string;
  messageStatus: string;
  errorCode?: string | null;
}

export interface OutboxListQuery {
  status?: OutboxStatus;
  patientId?: number;
  appointmentId?: number;
}

interface TextContext {
  sms_consent: number | boolean | null;
  time_zone: string | null;
  location_zone: string | null;
  quiet_hours: string | QuietWindow | null;
}

/** The one way texts and e-mail leave the practice (docs/messaging.md "Outbox"). */
@Injectable()
export class OutboxService {
  private readonly logger = new Logger('Outbox');
  private readonly composers = new Map<OutboxPurpose, MessageComposer>();

  constructor(
    @InjectModel(OutboxMessageRow) private readonly rows: typeof OutboxMessageRow,
    private readonly sequelize: Sequelize,
    private readonly events: EventEmitter2,
  ) {}

  /** The module that queues a purpose decides, at send time, what its rows say (or that they should not go). */
  registerComposer(purpose: OutboxPurpose, composer: MessageComposer): void {
    if (this.composers.has(purpose) && this.composers.get(purpose) !== composer) this.logger.warn(`composer for ${purpose} replaced`);
    this.composers.set(purpose, composer);
  }

  composerFor(purpose: OutboxPurpose): MessageComposer {
    return this.composers.get(purpose) ?? defaultComposer;
  }

  /**
   * Queues one message. With a dedupe key an existing row is returned instead (created=false), also
   * when another request inserts the same key at the same moment; inside a caller's transaction the
   * row commits or rolls back with it.
   */
  async enqueue(input: EnqueueInput, transaction?: Transaction): Promise<{ row: OutboxMessageRow; created: boolean }> {
    if (!MESSAGE_CHANNELS.includes(input.channel)) throw new Error(`unknown channel ${String(input.channel)}`);
    if (!OUTBOX_PURPOSES.includes(input.purpose)) throw new Error(`unknown purpose ${String(input.purpose)}`);
    if (!(input.dueAt instanceof Date) || Number.isNaN(input.dueAt.getTime())) throw new Error('dueAt must be a valid Date');
    const values = {
      practiceId: input.practiceId,
      channel: input.channel,
      purpose: input.purpose,
      dedupeKey: input.dedupeKey ?? null,
      ruleId: input.ruleId ?? null,
      appointmentId: input.appointmentId ?? null,
      patientId: input.patientId ?? null,
      referralId: input.referralId ?? null,
      letterId: input.letterId ?? null,
      toAddress: input.to ?? null,
      subject: input.subject ?? null,
      body: input.body ?? null,
      payload: input.payload ?? null,
      status: 'pending' as const,
      dueAt: input.dueAt,
      plannedAt: input.plannedAt ?? input.dueAt,
      deferReason: input.deferReason ?? null,
      createdBy: input.createdBy ?? null,
    };
    const key = input.dedupeKey;
    if (!key) return { row: await this.rows.create(values, { transaction }), created: true };
    const existing = await this.byKey(key, transaction, false);
    if (existing) return { row: existing, created: false };
    for (let attempt = 0; ; attempt++) {
      try {
        return { row: await this.rows.create(values, { transaction }), created: true };
      } catch (e) {
        if (e instanceof UniqueConstraintError) {
          // The other insert has committed (ours waited for it): a locking read sees it even inside an older snapshot.
          const row = await this.byKey(key, transaction, true);
          if (row) return { row, created: false };
        }
        // Concurrent inserts of one key can deadlock; outside a caller's transaction simply try again.
        if (sqlErrno(e) === ER_LOCK_DEADLOCK && !transaction && attempt < 3) continue;
        throw e;
      }
    }
  }

  private byKey(dedupeKey: string, transaction: Transaction | undefined, locking: boolean) {
    return this.rows.findOne({ where: { dedupeKey }, transaction, lock: locking && transaction ? transaction.LOCK.SHARE : undefined });
  }

  /** Pending messages about this appointment will not go (the row keeps the reason); returns how many. */
  async cancelPending(where: { appointmentId: number }, reason: string, transaction?: Transaction): Promise<number> {
    const [count] = await this.rows.update(
      { status: 'cancelled', deferReason: reason.slice(0, 255), claimedBy: null, claimedUntil: null },
      { where: { appointmentId: where.appointmentId, status: 'pending' }, transaction },
    );
    return count;
  }

  toDto(row: OutboxMessageRow): OutboxMessage {
    return mapOutboxMessage(row);
  }

  /** Everything sent or queued for one patient, newest first (the Replies thread). */
  async listForPatient(practiceId: number, patientId: number): Promise<OutboxMessage[]> {
    const rows = await this.rows.findAll({ where: { practiceId, patientId }, order: [['createdAt', 'DESC'], ['id', 'DESC']], limit: LIST_LIMIT });
    return rows.map(mapOutboxMessage);
  }

  /** Messages that did not go (failed or skipped), most recent first, for the front desk to act on. */
  async listProblems(practiceId: number): Promise<OutboxMessage[]> {
    const rows = await this.rows.findAll({
      where: { practiceId, status: { [Op.in]: ['failed', 'skipped'] } },
      order: [['updatedAt', 'DESC'], ['id', 'DESC']],
      limit: LIST_LIMIT,
    });
    return rows.map(mapOutboxMessage);
  }

  async list(practiceId: number, q: OutboxListQuery): Promise<OutboxMessage[]> {
    const where: WhereOptions<OutboxMessageRow> = { practiceId };
    if (q.status) Object.assign(where, { status: q.status });
    if (q.patientId) Object.assign(where, { patientId: q.patientId });
    if (q.appointmentId) Object.assign(where, { appointmentId: q.appointmentId });
    const rows = await this.rows.findAll({ where, order: [['dueAt', 'DESC'], ['id', 'DESC']], limit: LIST_LIMIT });
    return rows.map(mapOutboxMessage);
  }

  /** The front desk sends a failed message again: back to pending now, with a fresh count of attempts. */
  async retry(practiceId: number, id: number, now: Date): Promise<OutboxMessage> {
    const row = await this.rows.findOne({ where: { id, practiceId } });
    if (!row) throw new NotFoundException(`Message ${id} not found`);
    if (row.status !== 'failed') throw new ConflictException(`Only a failed message can be sent again; this one is ${row.status}`);
    // A save (not a bulk update) so the audit log records who sent it again.
    await row.update({
      status: 'pending',
      attempts: 0,
      dueAt: now,
      deferReason: null,
      lastError: null,
      failedAt: null,
      claimedBy: null,
      claimedUntil: null,
      providerId: null,
      providerStatus: null,
      sentAt: null,
      deliveredAt: null,
    });
    return mapOutboxMessage(row);
  }

  /**
   * Consent and quiet hours for texts, whatever the purpose's composer said: null when the text may go
   * now, else a skip (no consent) or a defer to the next allowed minute in the patient's zone. A reply to
   * a keyword the patient just sent (STOP, HELP…) is exempt from both.
   */
  async textRules(row: OutboxMessageRow, now: Date, transaction?: Transaction): Promise<ComposeDecision | null> {
    if (row.channel !== 'sms' || row.purpose === 'keyword_reply') return null;
    const [ctx] = await this.sequelize.query<TextContext>(
      `SELECT p.sms_consent, p.time_zone,
              (SELECT l.time_zone FROM locations l WHERE l.practice_id = :practiceId ORDER BY l.id LIMIT 1) AS location_zone,
              (SELECT JSON_EXTRACT(s.settings, '$.quietHours') FROM reminder_settings s WHERE s.practice_id = :practiceId) AS quiet_hours
         FROM (SELECT 1) one LEFT JOIN patients p ON p.id = :patientId AND p.practice_id = :practiceId`,
      { replacements: { practiceId: row.practiceId, patientId: row.patientId ?? 0 }, type: QueryTypes.SELECT, transaction },
    );
    if (!row.patientId || ctx?.sms_consent === null || ctx?.sms_consent === undefined) return { action: 'skip', reason: 'no text consent: the message is not for a known patient' };
    if (!ctx.sms_consent) return { action: 'skip', reason: 'no text consent' };
    const zone = validZone(ctx.time_zone) ?? validZone(ctx.location_zone) ?? FALLBACK_ZONE;
    const window = this.quietWindow(ctx.quiet_hours, row.practiceId);
    if (isInsideWindow(now, zone, window)) return null;
    return { action: 'defer', dueAt: nextAllowedInstant(now, zone, window), reason: `quiet hours in ${zone} until ${window.start}` };
  }

  private quietWindow(value: TextContext['quiet_hours'], practiceId: number): QuietWindow {
    if (value === null || value === undefined) return DEFAULT_QUIET_WINDOW;
    try {
      const w = (typeof value === 'string' ? JSON.parse(value) : value) as QuietWindow;
      parseWindow(w);
      return { start: w.start, end: w.end };
    } catch (e) {
      // A broken setting must not stop the job; the legal default is the safe reading.
      this.logger.warn(`practice ${practiceId}: unusable quiet hours (${(e as Error).message}); using ${DEFAULT_QUIET_WINDOW.start}–${DEFAULT_QUIET_WINDOW.end}`);
      return DEFAULT_QUIET_WINDOW;
    }
  }

  /**
   * A delivery status from the provider's callback. Only forward: delivered stays delivered whatever
   * arrives late. failed/undelivered ends the row failed with the provider's reason and tells listeners.
   * One conditional UPDATE, so callbacks racing for one text cannot both move it.
   */
  async recordDeliveryStatus(update: DeliveryStatusUpdate, now: Date): Promise<{ changed: boolean }> {
    const status = update.messageStatus.trim().toLowerCase().slice(0, 32);
    const rank = PROVIDER_STATUS_RANK[status];
    if (rank === undefined) return { changed: false };
    const outcome = status === 'delivered' || status === 'read' ? 'delivered' : status === 'failed' || status === 'undelivered' ? 'failed' : 'none';
    const reason = outcome === 'failed' ? deliveryFailureReason(status, update.errorCode) : null;
    // MariaDB assigns left to right, so the columns that test the old status come before status itself.
    const [res] = await this.sequelize.query(
      `UPDATE outbox_messages SET
          delivered_at = IF(status = 'sent' AND :outcome = 'delivered', :now, delivered_at),
          failed_at = IF(status = 'sent' AND :outcome = 'failed', :now, failed_at),
          last_error = IF(status = 'sent' AND :outcome = 'failed', :reason, last_error),
          status = IF(status = 'sent' AND :outcome = 'delivered', 'delivered', IF(status = 'sent' AND :outcome = 'failed', 'failed', status)),
          provider_status = :status,
          updated_at = :now
        WHERE provider_id = :sid AND channel = 'sms' AND (${RANK_SQL}) < :rank`,
      { replacements: { outcome, now, reason, status, sid: update.messageSid, rank } },
    );
    const changed = Number((res as { affectedRows?: number }).affectedRows ?? 0) > 0;
    if (changed && outcome === 'failed') {
      const row = await this.rows.findOne({ where: { providerId: update.messageSid, channel: 'sms' } });
      if (row && row.status === 'failed' && row.failedAt?.getTime() === now.getTime()) this.emitFailed(failedEvent(row, row.lastError ?? reason!, now));
    }
    return { changed };
  }

  /** Tells listeners (front-desk tasks) that a row ended failed; a listener's error never reaches the job. */
  emitFailed(event: OutboxFailedEvent): void {
    try {
      this.events.emit(OUTBOX_FAILED, event);
    } catch (e) {
      this.logger.error(`an ${OUTBOX_FAILED} listener threw: ${(e as Error).message}`);
    }
  }
}

export function failedEvent(row: Pick<OutboxMessageRow, 'id' | 'practiceId' | 'channel' | 'purpose' | 'patientId' | 'appointmentId'>, reason: string, at: Date): OutboxFailedEvent {
  return { practiceId: row.practiceId, outboxId: row.id, channel: row.channel, purpose: row.purpose, patientId: row.patientId, appointmentId: row.appointmentId, reason, at };
}

/** "the carrier could not deliver the text: the phone was unreachable … (error 30003)". */
export function deliveryFailureReason(status: string, errorCode: string | null | undefined): string {
  const code = errorCode?.trim() || null;
  const words = providerCodeInWords(code);
  const what = status === 'undelivered' ? 'the carrier could not deliver the text' : 'the text provider could not send the text';
  return `${what}${words ? `: ${words}` : ''}${code ? ` (error ${code})` : ''}`.slice(0, 500);
}

function validZone(zone: string | null | undefined): string | null {
  if (!zone) return null;
  try {
    assertZone(zone);
    return zone;
  } catch {
    return null;
  }
}
