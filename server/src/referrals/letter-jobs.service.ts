import { Inject, Injectable, Logger, OnApplicationBootstrap, OnModuleDestroy } from '@nestjs/common';
import { OnEvent } from '@nestjs/event-emitter';
import { SchedulerRegistry } from '@nestjs/schedule';
import { randomUUID } from 'node:crypto';
import { Sequelize } from 'sequelize-typescript';
import { requestContext } from '../common/context/request-context.js';
import { APP_CONFIG, type AppConfig } from '../config/configuration.js';
import { OUTBOX_FAILED, type OutboxFailedEvent } from '../messaging/messaging-events.js';
import { CompletionService } from './completion.service.js';
import { letterOutcome } from './letter-outcome.util.js';
import { LettersService } from './letters.service.js';

export const LETTERS_SETTLE_INTERVAL = 'letters-settle';
const BATCH = 100;

/**
 * The letters' side of the outbox (docs/messaging.md "Letters"):
 * - settle: a queued letter whose outbox row has ended (sent, failed, skipped, cancelled) gets that end
 *   recorded on it; a sent completion report moves its case (and referral) to report_sent. Derived from
 *   the database, so nothing is lost with a process: the interval runs beside the outbox job (same
 *   switch and period), OUTBOX_FAILED settles a failed letter at once, and a row lock settles each once.
 * The booking notice is queued by the schedule inside the booking's transaction (LettersService), so a crash
 * after the commit cannot lose it; once per referral by the letter's dedupe key.
 */
@Injectable()
export class LetterJobsService implements OnApplicationBootstrap, OnModuleDestroy {
  private readonly logger = new Logger('Letters');
  private running: Promise<number> | null = null;

  constructor(
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    private readonly scheduler: SchedulerRegistry,
    private readonly sequelize: Sequelize,
    private readonly letters: LettersService,
    private readonly completion: CompletionService,
  ) {}

  onApplicationBootstrap() {
    if (!this.config.messaging.jobEnabled || this.scheduler.doesExist('interval', LETTERS_SETTLE_INTERVAL)) return;
    this.scheduler.addInterval(LETTERS_SETTLE_INTERVAL, setInterval(() => void this.tick(), this.config.messaging.intervalMs));
  }

  async onModuleDestroy() {
    if (this.scheduler.doesExist('interval', LETTERS_SETTLE_INTERVAL)) this.scheduler.deleteInterval(LETTERS_SETTLE_INTERVAL);
    await this.running?.catch(() => undefined);
  }

  private async tick() {
    if (this.running) return;
    this.running = this.settleOnce();
    try {
      await this.running;
    } catch (e) {
      this.logger.error(`settling letters failed: ${(e as Error).message}`);
    } finally {
      this.running = null;
    }
  }

  /** One pass (all ended rows, or the one outbox row given); returns how many letters it settled. */
  async settleOnce(outboxId?: number, now = new Date()): Promise<number> {
    let settled = 0;
    for (;;) {
      const batch = await this.letters.unsettled(BATCH, outboxId);
      let progressed = 0;
      for (const { letterId, outbox } of batch) {
        const outcome = letterOutcome(outbox);
        if (!outcome) continue;
        try {
          // A request context of its own, so the audit log records the change (made by no user).
          const done = await requestContext.run({ requestId: `letters-${randomUUID()}` }, () =>
            this.sequelize.transaction(async (t) => {
              const l = await this.letters.settle(letterId, outcome, t);
              if (l && l.kind === 'completion_report' && outcome.status === 'sent') await this.completion.markReportSent(l, t, outcome.sentAt ?? now);
              return l !== null;
            }),
          );
          if (done) settled++;
          progressed++;
        } catch (e) {
          this.logger.error(`letter ${letterId}: ${(e as Error).message}`);
        }
      }
      if (batch.length < BATCH || progressed === 0) return settled;
    }
  }

  @OnEvent(OUTBOX_FAILED)
  async onOutboxFailed(e: OutboxFailedEvent): Promise<void> {
    if (e.purpose !== 'letter') return;
    try {
      await this.settleOnce(e.outboxId);
    } catch (err) {
      this.logger.error(`failed letter (outbox ${e.outboxId}) not settled: ${(err as Error).message}`);
    }
  }

  /** The booking notice, at most once per referral (the schedule queues it inside the booking itself). */
  queueBookingNotice(practiceId: number, referralId: number, caseId: number, actorId: number | null, at = new Date()): Promise<boolean> {
    return this.letters.queueBookingNotice(practiceId, referralId, caseId, actorId, at);
  }
}
