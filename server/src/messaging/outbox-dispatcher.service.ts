import { Inject, Injectable, Logger, OnApplicationBootstrap, OnModuleDestroy } from '@nestjs/common';
import { InjectModel } from '@nestjs/sequelize';
import { SchedulerRegistry } from '@nestjs/schedule';
import { randomBytes } from 'node:crypto';
import { QueryTypes, Transaction } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import { ER_LOCK_DEADLOCK, ER_LOCK_WAIT_TIMEOUT, sqlErrno } from '../database/deadlock-retry.util.js';
import { APP_CONFIG, type AppConfig } from '../config/configuration.js';
import type { ComposeDecision } from './composer.types.js';
import { EmailSenderService } from './email-sender.service.js';
import { MessagingClock } from './messaging-clock.service.js';
import { OutboxMessageRow } from './models/outbox-message.model.js';
import { forEachLimited, retryDelayMs } from './outbox-job.util.js';
import { failedEvent, OutboxService } from './outbox.service.js';
import type { SendFailureKind, SendResult } from './send-result.types.js';
import { SmsSenderService } from './sms-sender.service.js';

export const OUTBOX_INTERVAL_NAME = 'outbox-dispatcher';

/** Due rows, oldest first; rows another worker holds are skipped, not waited for. */
export const CLAIM_SQL = `SELECT id FROM outbox_messages
  WHERE status = 'pending' AND due_at <= :now ORDER BY due_at, id LIMIT :limit FOR UPDATE SKIP LOCKED`;
/** Rows whose worker stopped mid-send (or never heard back): their lease ran out. */
export const STALE_SQL = `SELECT id FROM outbox_messages
  WHERE status = 'sending' AND claimed_until < :now ORDER BY claimed_until, id LIMIT :limit FOR UPDATE SKIP LOCKED`;

/** Sends in flight at once per worker. */
const SEND_CONCURRENCY = 8;
/** The provider's clock and ours may differ; look this far before the row fell due for an interrupted text. */
const RECONCILE_MARGIN_MS = 5 * 60_000;

export interface DrainResult {
  /** Interrupted rows looked at, and how they ended. */
  reconciled: { found: number; requeued: number; unresolved: number; failed: number };
  claimed: number;
  sent: number;
  deferred: number;
  skipped: number;
  cancelled: number;
  /** Back to pending for another attempt. */
  retrying: number;
  /** The answer never came: left for reconciliation. */
  unknown: number;
  failed: number;
  /** Rows another worker had taken over before this one sent them (left alone). */
  lost: number;
}

const emptyResult = (): DrainResult => ({
  reconciled: { found: 0, requeued: 0, unresolved: 0, failed: 0 },
  claimed: 0,
  sent: 0,
  deferred: 0,
  skipped: 0,
  cancelled: 0,
  retrying: 0,
  unknown: 0,
  failed: 0,
  lost: 0,
});

type Clock = () => Date;

/**
 * The outbox job (docs/messaging.md "Outbox"): every process may run it; a row belongs to one worker at
 * a time through a lease, every state change is conditional on that lease, and a row whose worker died
 * mid-send is checked with the provider before anything is sent again.
 */
@Injectable()
export class OutboxDispatcherService implements OnApplicationBootstrap, OnModuleDestroy {
  private readonly logger = new Logger('OutboxJob');
  /** Unique per process even where pids repeat (containers), so leases never mix up two workers. */
  readonly workerId: string;
  private running: Promise<DrainResult> | null = null;

  constructor(
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    @InjectModel(OutboxMessageRow) private readonly rows: typeof OutboxMessageRow,
    private readonly sequelize: Sequelize,
    private readonly outbox: OutboxService,
    private readonly sms: SmsSenderService,
    private readonly email: EmailSenderService,
    private readonly clock: MessagingClock,
    private readonly scheduler: SchedulerRegistry,
  ) {
    this.workerId = `${config.messaging.workerId}-${randomBytes(3).toString('hex')}`.slice(-64);
  }

  onApplicationBootstrap() {
    if (this.config.messaging.jobEnabled) this.start();
    else this.logger.log('the outbox job is off in this process (MESSAGING_JOB=off)');
    if (this.sms.disabledReason) this.logger.warn(this.sms.disabledReason);
  }

  /** Starts the interval (idempotent); tests that turn the job on call this after setting their clock. */
  start(intervalMs = this.config.messaging.intervalMs): void {
    if (this.scheduler.doesExist('interval', OUTBOX_INTERVAL_NAME)) return;
    this.scheduler.addInterval(OUTBOX_INTERVAL_NAME, setInterval(() => void this.tick(), intervalMs));
  }

  stop(): void {
    if (this.scheduler.doesExist('interval', OUTBOX_INTERVAL_NAME)) this.scheduler.deleteInterval(OUTBOX_INTERVAL_NAME);
  }

  async onModuleDestroy() {
    this.stop();
    // Let sends in flight finish and be recorded (each is bounded by the send timeout).
    if (this.running) {
      const limit = new Promise((r) => setTimeout(r, this.config.messaging.sendTimeoutMs + 5_000).unref());
      await Promise.race([this.running.catch(() => undefined), limit]);
    }
  }

  /** One tick of the interval; never two at once in one process. */
  private async tick(): Promise<void> {
    if (this.running) return;
    this.running = this.drainOnce();
    try {
      await this.running;
    } catch (e) {
      this.logger.error(`outbox drain failed: ${(e as Error).message}`);
    } finally {
      this.running = null;
    }
  }

  /** One pass: reconcile interrupted rows, claim a batch of due rows, send them. `now` freezes the clock (tests). */
  async drainOnce(now?: Date): Promise<DrainResult> {
    const clock: Clock = now ? () => now : () => this.clock.now();
    const result = emptyResult();
    await this.reconcileStale(clock, result);
    const claimed = await this.claim(CLAIM_SQL, clock());
    result.claimed = claimed.length;
    await forEachLimited(
      claimed,
      SEND_CONCURRENCY,
      (row) => this.process(row, clock, result),
      (row, e) => this.logger.error(`outbox row ${row.id}: ${(e as Error).stack ?? String(e)}`),
    );
    return result;
  }

  private get leaseMs(): number {
    return this.config.messaging.claimSeconds * 1000;
  }

  /** While a send is in flight nobody else may touch the row: its lease outlasts the send's timeout. */
  private get sendLeaseMs(): number {
    return Math.max(this.leaseMs, this.config.messaging.sendTimeoutMs + 5_000);
  }

  /**
   * One short transaction: lock up to batchSize rows (skipping locked ones), mark them ours, commit.
   * READ COMMITTED takes no gap locks, so two workers' claims cannot deadlock on the status index.
   */
  private async claim(sql: string, now: Date): Promise<OutboxMessageRow[]> {
    for (let attempt = 1; ; attempt++) {
      try {
        return await this.claimOnce(sql, now);
      } catch (e) {
        const errno = sqlErrno(e);
        if ((errno === ER_LOCK_DEADLOCK || errno === ER_LOCK_WAIT_TIMEOUT) && attempt < 3) continue;
        throw e;
      }
    }
  }

  private async claimOnce(sql: string, now: Date): Promise<OutboxMessageRow[]> {
    const ids = await this.sequelize.transaction({ isolationLevel: Transaction.ISOLATION_LEVELS.READ_COMMITTED }, async (transaction) => {
      const found = await this.sequelize.query<{ id: number }>(sql, {
        replacements: { now, limit: this.config.messaging.batchSize },
        type: QueryTypes.SELECT,
        transaction,
      });
      const list = found.map((r) => Number(r.id));
      if (list.length === 0) return list;
      await this.exec(
        `UPDATE outbox_messages SET status = 'sending', claimed_by = :worker, claimed_until = :until, updated_at = :now WHERE id IN (:ids)`,
        { worker: this.workerId, until: new Date(now.getTime() + this.leaseMs), now, ids: list },
        transaction,
      );
      return list;
    });
    if (ids.length === 0) return [];
    const rows = await this.rows.findAll({ where: { id: ids, claimedBy: this.workerId, status: 'sending' } });
    const order = new Map(ids.map((id, i) => [id, i]));
    return rows.sort((a, b) => order.get(a.id)! - order.get(b.id)!);
  }

  /** A conditional UPDATE; returns the number of rows it changed. */
  private async exec(sql: string, replacements: Record<string, unknown>, transaction?: Transaction): Promise<number> {
    const [res] = await this.sequelize.query(sql, { replacements, transaction });
    return Number((res as { affectedRows?: number }).affectedRows ?? 0);
  }

  /**
   * Changes a row this worker holds; false when another worker took it over meanwhile. The lease end
   * this worker last wrote is part of the condition (a fencing token): a row that went back to pending
   * and was claimed again, even by this same worker, is not the claim this code is holding.
   */
  private async update(row: OutboxMessageRow, set: Record<string, unknown>, now: Date): Promise<boolean> {
    const cols = Object.keys(set);
    const n = await this.exec(
      `UPDATE outbox_messages SET ${cols.map((c) => `${c} = :${c}`).join(', ')}, updated_at = :updated_at
        WHERE id = :id AND claimed_by = :worker AND status = 'sending' AND claimed_until <=> :lease`,
      { ...set, updated_at: now, id: row.id, worker: this.workerId, lease: row.claimedUntil },
    );
    if (n === 1 && 'claimed_until' in set) row.claimedUntil = set.claimed_until as Date | null;
    return n === 1;
  }

  private async process(row: OutboxMessageRow, clock: Clock, result: DrainResult): Promise<void> {
    const now = clock();
    let decision: ComposeDecision;
    try {
      decision = await this.outbox.composerFor(row.purpose).compose(row, now);
      // Consent and quiet hours hold for every text, whichever module composed it.
      if (decision.action === 'send') decision = (await this.outbox.textRules(row, now)) ?? decision;
    } catch (e) {
      return this.afterFailure(row, row.attempts + 1, { kind: 'retryable', reason: `could not prepare the message: ${(e as Error).message}` }, clock, result);
    }
    if (decision.action === 'defer') {
      // A defer into the past would spin; the next tick is the earliest.
      const dueAt = new Date(Math.max(decision.dueAt.getTime(), now.getTime() + this.config.messaging.intervalMs));
      if (await this.update(row, { status: 'pending', due_at: dueAt, defer_reason: decision.reason.slice(0, 255), claimed_by: null, claimed_until: null }, now)) result.deferred++;
      else result.lost++;
      return;
    }
    if (decision.action === 'skip' || decision.action === 'cancel') {
      const status = decision.action === 'skip' ? 'skipped' : 'cancelled';
      if (await this.update(row, { status, defer_reason: decision.reason.slice(0, 255), claimed_until: null }, now)) result[decision.action === 'skip' ? 'skipped' : 'cancelled']++;
      else result.lost++;
      return;
    }

    const attempts = row.attempts + 1;
    const subject = (decision.subject ?? row.subject ?? '').slice(0, 255) || null;
    // Record what is about to go (reconciliation compares it with the provider's copy) and renew the lease.
    const mine = await this.update(
      row,
      { to_address: decision.to, subject, body: decision.body, attempts, claimed_until: new Date(clock().getTime() + this.sendLeaseMs) },
      now,
    );
    if (!mine) {
      result.lost++;
      return;
    }
    const sent: SendResult =
      row.channel === 'sms'
        ? await this.sms.send({ to: decision.to, body: decision.body })
        : await this.email.send({ outboxId: row.id, to: decision.to, subject: subject ?? '', text: decision.body, html: decision.html, attachments: decision.attachments });
    if (!sent.ok) return this.afterFailure(row, attempts, sent, clock, result);
    const at = clock();
    const recorded = await this.update(
      row,
      { status: 'sent', provider_id: sent.providerId, provider_status: sent.providerStatus?.slice(0, 32) ?? null, sent_at: at, last_error: null, claimed_until: null },
      at,
    );
    if (recorded) result.sent++;
    else this.logger.error(`outbox row ${row.id} was sent (${sent.providerId}) but another worker had taken it over`);
  }

  private async afterFailure(row: OutboxMessageRow, attempts: number, failure: { kind: SendFailureKind; reason: string }, clock: Clock, result: DrainResult): Promise<void> {
    const now = clock();
    const m = this.config.messaging;
    const reason = failure.reason.slice(0, 500);
    if (failure.kind === 'unknown') {
      // Maybe accepted: keep the row 'sending' until its lease ends, then reconciliation asks the provider.
      const until = new Date(now.getTime() + retryDelayMs(attempts, m.backoffBaseMs, m.backoffMaxMs));
      if (await this.update(row, { attempts, last_error: reason, claimed_until: until }, now)) result.unknown++;
      return;
    }
    if (failure.kind === 'permanent' || attempts >= m.maxAttempts) {
      const final = failure.kind === 'permanent' ? reason : `${reason.replace(/; will try again$/, '')} (gave up after ${attempts} attempts)`.slice(0, 500);
      if (await this.update(row, { status: 'failed', attempts, failed_at: now, last_error: final, claimed_until: null }, now)) {
        result.failed++;
        this.outbox.emitFailed(failedEvent(row, final, now));
      }
      return;
    }
    const dueAt = new Date(now.getTime() + retryDelayMs(attempts, m.backoffBaseMs, m.backoffMaxMs));
    if (await this.update(row, { status: 'pending', attempts, due_at: dueAt, last_error: reason, claimed_by: null, claimed_until: null }, now)) result.retrying++;
  }

  /**
   * Rows left 'sending' past their lease: the worker died mid-send or never got an answer. A text is
   * looked up at the provider first (found → recorded as sent; not found → pending again); an e-mail is
   * sent again (at least once; its fixed Message-ID lets mail systems drop the copy).
   */
  private async reconcileStale(clock: Clock, result: DrainResult): Promise<void> {
    const stale = await this.claim(STALE_SQL, clock());
    if (stale.length === 0) return;
    // Rows with the same number and text are settled one after another so two cannot claim one provider message.
    const groups = new Map<string, OutboxMessageRow[]>();
    for (const r of stale) {
      const k = `${r.channel}|${r.toAddress}|${r.body}`;
      groups.set(k, [...(groups.get(k) ?? []), r]);
    }
    await forEachLimited(
      [...groups.values()],
      SEND_CONCURRENCY,
      async (group) => {
        for (const row of group) await this.reconcile(row, clock, result);
      },
      (group, e) => this.logger.error(`reconciling outbox rows ${group.map((r) => r.id).join(', ')}: ${(e as Error).message}`),
    );
  }

  private async reconcile(row: OutboxMessageRow, clock: Clock, result: DrainResult): Promise<void> {
    const now = clock();
    const m = this.config.messaging;
    const requeue = async (why: string) => {
      if (row.attempts >= m.maxAttempts) {
        const reason = `${why} (gave up after ${row.attempts} attempts)`.slice(0, 500);
        if (await this.update(row, { status: 'failed', failed_at: now, last_error: reason, claimed_until: null }, now)) {
          result.reconciled.failed++;
          this.outbox.emitFailed(failedEvent(row, reason, now));
        }
        return;
      }
      // Due now: the composer decides again (quiet hours, a cancelled visit) before anything goes.
      if (await this.update(row, { status: 'pending', due_at: now, claimed_by: null, claimed_until: null, last_error: why.slice(0, 500) }, now)) result.reconciled.requeued++;
    };
    if (row.channel === 'email' || !row.toAddress || !row.body) return requeue(row.channel === 'email' ? 'sending was interrupted; sending the e-mail again' : 'sending was interrupted before the text was written');

    let candidates;
    try {
      candidates = await this.sms.findSent({ to: row.toAddress, body: row.body, since: new Date(row.dueAt.getTime() - RECONCILE_MARGIN_MS) });
    } catch (e) {
      const until = new Date(now.getTime() + retryDelayMs(Math.max(1, row.attempts), m.backoffBaseMs, m.backoffMaxMs));
      const why = `sending was interrupted and the text provider could not be asked whether it went (${(e as Error).message.slice(0, 200)}); asking again later`;
      if (await this.update(row, { last_error: why, claimed_until: until }, now)) result.reconciled.unresolved++;
      return;
    }
    const taken = new Set<string>();
    if (candidates.length) {
      const owned = await this.sequelize.query<{ provider_id: string }>('SELECT provider_id FROM outbox_messages WHERE provider_id IN (:sids) AND id <> :id', {
        replacements: { sids: candidates.map((c) => c.sid), id: row.id },
        type: QueryTypes.SELECT,
      });
      for (const o of owned) taken.add(o.provider_id);
    }
    const found = candidates.find((c) => !taken.has(c.sid));
    if (!found) return requeue('sending was interrupted and the text provider has no such text; sending it again');
    const recorded = await this.update(
      row,
      { status: 'sent', provider_id: found.sid, provider_status: found.status?.slice(0, 32) ?? null, sent_at: now, last_error: null, claimed_until: null },
      now,
    );
    if (recorded) result.reconciled.found++;
  }
}
