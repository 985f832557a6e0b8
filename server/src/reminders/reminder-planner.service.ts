import { Inject, Injectable, Logger, OnApplicationBootstrap, OnModuleDestroy } from '@nestjs/common';
import { OnEvent } from '@nestjs/event-emitter';
import { InjectModel } from '@nestjs/sequelize';
import { Interval } from '@nestjs/schedule';
import type { MessageChannel, ReminderRule, ReminderSettings } from '@ostium/shared';
import { Op, type Transaction } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import { retryOnDeadlock } from '../database/deadlock-retry.util.js';
import { APP_CONFIG, type AppConfig } from '../config/configuration.js';
import type { EnqueueInput } from '../messaging/composer.types.js';
import { MessagingClock } from '../messaging/messaging-clock.service.js';
import { OutboxMessageRow } from '../messaging/models/outbox-message.model.js';
import { OutboxService } from '../messaging/outbox.service.js';
import { APPOINTMENT_CHANGED, APPOINTMENTS_BOOKED, type AppointmentChangedEvent, type AppointmentsBookedEvent } from '../scheduling/appointment-events.js';
import { GONE_REASONS } from './reminder-composer.service.js';
import { planReminder } from './reminder-plan.util.js';
import { ReminderSettingsService } from './reminder-settings.service.js';
import { apptKey, isRemindable, patientZone, REMINDABLE_STATES, ReminderVisitsService, seriesKey, type CountedText, type ReminderVisit } from './reminder-visits.service.js';

const DAY_MS = 86_400_000;
/** How far ahead the sweep looks for visits without their reminder rows. */
export const SWEEP_DAYS = 15;
/** Visits per sweep (soonest first); the next sweep takes the rest. */
const SWEEP_LIMIT = 2_000;
/** A booking e-mail found missing later than this after the booking is not sent any more: it would confuse. */
const BOOKING_CATCH_UP_MS = 2 * DAY_MS;
export const SWEEP_INTERVAL_NAME = 'reminders-sweep';

export interface PlanSummary {
  /** New rows waiting to go. */
  queued: number;
  /** New rows recorded as skipped, with their reason. */
  skipped: number;
  /** Rows that were already there (nothing changed). */
  existing: number;
}

interface PlanContext {
  settings: ReminderSettings;
  now: Date;
  texts: CountedText[];
  existing: Set<string>;
  summary: PlanSummary;
  transaction: Transaction;
}

const emptySummary = (): PlanSummary => ({ queued: 0, skipped: 0, existing: 0 });
const before = (rules: ReminderRule[]) => rules.filter((r) => r.enabled && r.trigger === 'before_visit');
const onBooking = (rules: ReminderRule[]) => rules.filter((r) => r.enabled && r.trigger === 'on_booking');
const noAddress = (channel: MessageChannel) => (channel === 'sms' ? 'no mobile number on file' : 'no e-mail address on file');

/**
 * Turns bookings into outbox rows (docs/messaging.md "Reminder rules"): on the booking event, on every
 * change, and from a sweep that reads the appointments themselves, so a crash between a booking's commit
 * and its event loses nothing. Every row has its unique key, so planning twice queues nothing twice.
 */
@Injectable()
export class ReminderPlannerService implements OnApplicationBootstrap, OnModuleDestroy {
  private readonly logger = new Logger('Reminders');
  private readonly inFlight = new Set<Promise<unknown>>();
  private sweeping: Promise<number> | null = null;

  constructor(
    private readonly sequelize: Sequelize,
    private readonly visits: ReminderVisitsService,
    private readonly settings: ReminderSettingsService,
    private readonly outbox: OutboxService,
    private readonly clock: MessagingClock,
    @InjectModel(OutboxMessageRow) private readonly rows: typeof OutboxMessageRow,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
  ) {}

  // ---------- triggers ----------

  @OnEvent(APPOINTMENTS_BOOKED)
  onBooked(e: AppointmentsBookedEvent): void {
    this.track(`planning booking ${e.seriesId}`, () => this.planSeries(e.practiceId, e.seriesId, this.clock.now()));
  }

  @OnEvent(APPOINTMENT_CHANGED)
  onChanged(e: AppointmentChangedEvent): void {
    this.track(`appointment ${e.appointmentId} changed`, () => this.applyChange(e, this.clock.now()));
  }

  onApplicationBootstrap(): void {
    if (this.config.messaging.jobEnabled) this.track('start-up sweep', () => this.sweepOnce(this.clock.now()));
  }

  @Interval(SWEEP_INTERVAL_NAME, 60_000)
  sweepTick(): void {
    if (this.config.messaging.jobEnabled) this.track('sweep', () => this.sweepOnce(this.clock.now()));
  }

  async onModuleDestroy(): Promise<void> {
    await this.idle();
  }

  /** Listeners must not throw (the emitter would log it as the booking's problem): failures are logged here. */
  private track(what: string, work: () => Promise<unknown>): void {
    const p: Promise<unknown> = work()
      .catch((e: unknown) => this.logger.error(`${what}: ${(e as Error).stack ?? String(e)}`))
      .finally(() => this.inFlight.delete(p));
    this.inFlight.add(p);
  }

  /** Resolves once planning started by events, the start-up sweep or the interval has finished. */
  async idle(): Promise<void> {
    while (this.inFlight.size) await Promise.allSettled([...this.inFlight]);
  }

  // ---------- planning ----------

  /**
   * Plans every reminder of a booking (a series of visits): the rules on booking once per series, the
   * rules before a visit once per visit. Idempotent; runs under a lock on the patient so the caps see
   * every text already queued, whichever process plans.
   */
  async planSeries(practiceId: number, seriesId: string, now: Date, opts: { bookingMessages?: boolean } = {}): Promise<PlanSummary> {
    const summary = emptySummary();
    const first = (await this.visits.series(practiceId, seriesId))[0];
    if (!first) return summary;
    const settings = await this.settings.current(practiceId);
    await this.inTransaction(async (transaction) => {
      Object.assign(summary, emptySummary()); // a retried transaction counts afresh
      await this.visits.lockPatient(first.patient.id, transaction);
      // Read again under the lock: a cancellation that committed meanwhile is seen.
      const ahead = (await this.visits.series(practiceId, seriesId, transaction)).filter((v) => isRemindable(v, now));
      if (!ahead.length) return;
      const keys = [
        ...(opts.bookingMessages === false ? [] : onBooking(settings.rules).map((r) => seriesKey(seriesId, r.channel, r.id))),
        ...ahead.flatMap((v) => before(settings.rules).map((r) => apptKey(v.id, r.channel, r.id))),
      ];
      const ctx: PlanContext = {
        settings,
        now,
        texts: await this.visits.countedTexts(practiceId, first.patient.id, now, { queued: true }, transaction),
        existing: await this.visits.existingKeys(keys, transaction),
        summary,
        transaction,
      };
      if (opts.bookingMessages !== false) for (const rule of onBooking(settings.rules)) await this.planOnBooking(rule, ahead, ctx);
      // Visit by visit, rule by rule: earlier texts take their days first, later ones are judged against them.
      for (const v of ahead) for (const rule of before(settings.rules)) await this.planBeforeVisit(rule, v, ctx);
    });
    return summary;
  }

  /** One transaction, tried once more after a deadlock (two plans touching neighbouring outbox keys). */
  private async inTransaction(work: (t: Transaction) => Promise<void>): Promise<void> {
    await retryOnDeadlock(() => this.sequelize.transaction(work), 2);
  }

  private async planOnBooking(rule: ReminderRule, ahead: ReminderVisit[], ctx: PlanContext): Promise<void> {
    const first = ahead[0]!;
    const key = seriesKey(first.seriesId, rule.channel, rule.id);
    if (ctx.existing.has(key)) {
      ctx.summary.existing++;
      return;
    }
    const to = rule.channel === 'sms' ? first.patient.phone : first.patient.email;
    const base: EnqueueInput = {
      practiceId: first.practiceId,
      channel: rule.channel,
      // A booking e-mail belongs to the whole series (no single appointment), so cancelling one visit leaves it.
      purpose: rule.channel === 'email' ? 'booking_email' : 'reminder',
      dedupeKey: key,
      ruleId: rule.id,
      appointmentId: rule.channel === 'email' ? null : first.id,
      patientId: first.patient.id,
      referralId: first.referralId,
      to,
      payload: { seriesId: first.seriesId },
      dueAt: ctx.now,
    };
    if (!to) return this.record(base, { skip: noAddress(rule.channel) }, ctx);
    const plan = planReminder({ rule, visitStart: first.start, now: ctx.now, zone: patientZone(first), window: ctx.settings.quietHours, caps: ctx.settings.caps, texts: this.others(ctx, key, rule, first) });
    if (plan.kind === 'skip') return this.record({ ...base, plannedAt: plan.plannedAt }, { skip: plan.reason, timing: true }, ctx);
    return this.record({ ...base, dueAt: plan.dueAt, plannedAt: plan.plannedAt, deferReason: withoutConsent(rule, first, plan.reason) }, {}, ctx);
  }

  private async planBeforeVisit(rule: ReminderRule, v: ReminderVisit, ctx: PlanContext): Promise<void> {
    const key = apptKey(v.id, rule.channel, rule.id);
    if (ctx.existing.has(key)) {
      ctx.summary.existing++;
      return;
    }
    const to = rule.channel === 'sms' ? v.patient.phone : v.patient.email;
    const plan = planReminder({ rule, visitStart: v.start, now: ctx.now, zone: patientZone(v), window: ctx.settings.quietHours, caps: ctx.settings.caps, texts: this.others(ctx, key, rule, v) });
    const base: EnqueueInput = {
      practiceId: v.practiceId,
      channel: rule.channel,
      purpose: 'reminder',
      dedupeKey: key,
      ruleId: rule.id,
      appointmentId: v.id,
      patientId: v.patient.id,
      referralId: v.referralId,
      to,
      dueAt: plan.kind === 'queue' ? plan.dueAt : ctx.now,
      plannedAt: plan.plannedAt,
      // The start planned for, so the composer can tell a moved visit from a changed rule.
      payload: { visitStart: v.start.toISOString() },
    };
    if (!to) return this.record(base, { skip: noAddress(rule.channel) }, ctx);
    if (plan.kind === 'skip') return this.record(base, { skip: plan.reason, timing: true }, ctx);
    return this.record({ ...base, deferReason: withoutConsent(rule, v, plan.reason) }, {}, ctx);
  }

  /**
   * The texts a new text is judged against (caps). A patient without text consent gets none, so the row
   * waits at its rule's own time (quiet hours still apply) instead of being moved for texts that will
   * never go; the composer looks at the consent again when it falls due.
   */
  private others(ctx: PlanContext, key: string, rule: ReminderRule, v: ReminderVisit): Date[] {
    if (rule.channel === 'sms' && !v.patient.smsConsent) return [];
    return ctx.texts.filter((t) => t.dedupeKey !== key).map((t) => t.at);
  }

  /**
   * Queues the row, or records it as skipped with the reason (never a silent drop). A skip for timing
   * alone is marked so a later move of the visit can bring the reminder back.
   */
  private async record(input: EnqueueInput, how: { skip?: string; timing?: boolean }, ctx: PlanContext): Promise<void> {
    const payload = how.timing ? { ...(input.payload ?? {}), timingSkip: true } : input.payload;
    const { row, created } = await this.outbox.enqueue({ ...input, payload: payload ?? null, deferReason: how.skip ?? input.deferReason ?? null }, ctx.transaction);
    ctx.existing.add(input.dedupeKey!);
    if (!created) {
      ctx.summary.existing++;
      return;
    }
    if (how.skip) {
      await this.rows.update({ status: 'skipped', deferReason: how.skip.slice(0, 255) }, { where: { id: row.id, status: 'pending' }, transaction: ctx.transaction });
      ctx.summary.skipped++;
      return;
    }
    // A text that will only go if consent comes first does not take a day's or a week's place.
    if (input.channel === 'sms' && !input.deferReason?.startsWith(NO_CONSENT_YET)) ctx.texts.push({ id: row.id, dedupeKey: input.dedupeKey ?? null, status: 'pending', at: input.dueAt });
    ctx.summary.queued++;
  }

  // ---------- changes ----------

  /** Cancelled, no-show, over: its pending reminders go nowhere. Moved: they follow the visit. */
  async applyChange(e: AppointmentChangedEvent, now: Date): Promise<void> {
    if (!REMINDABLE_STATES.includes(e.current.state)) {
      const reason = GONE_REASONS[e.current.state as keyof typeof GONE_REASONS];
      await this.outbox.cancelPending({ appointmentId: e.appointmentId }, reason);
      return;
    }
    const moved = +e.previous.start !== +e.current.start || e.previous.locationId !== e.current.locationId;
    if (moved) await this.replanVisit(e.practiceId, e.appointmentId, now);
  }

  /**
   * The visit's pending rows get due times from its new start (with quiet hours and caps again); rows
   * skipped only for timing come back when the new time allows them; missing rules are planned.
   */
  async replanVisit(practiceId: number, appointmentId: number, now: Date): Promise<PlanSummary> {
    const summary = emptySummary();
    const first = await this.visits.visit(appointmentId);
    if (!first || first.practiceId !== practiceId) return summary;
    const settings = await this.settings.current(practiceId);
    await this.inTransaction(async (transaction) => {
      Object.assign(summary, emptySummary()); // a retried transaction counts afresh
      await this.visits.lockPatient(first.patient.id, transaction);
      const v = await this.visits.visit(appointmentId, transaction);
      if (!v || !isRemindable(v, now)) return;
      const rows = await this.rows.findAll({
        where: { appointmentId, purpose: 'reminder', status: { [Op.in]: ['pending', 'skipped'] } },
        transaction,
        lock: transaction.LOCK.UPDATE,
        order: [['id', 'ASC']],
      });
      const replan = rows.filter((row) => {
        if (row.status === 'skipped' && !row.payload?.timingSkip) return false;
        const rule = settings.rules.find((r) => r.id === row.ruleId);
        // A rule removed or turned off: the composer says so at send time.
        return !!rule && rule.enabled && rule.trigger === 'before_visit' && rule.channel === row.channel;
      });
      // The rows being moved no longer hold their old times; each takes its new one in turn.
      const moving = new Set(replan.map((r) => r.id));
      const texts = (await this.visits.countedTexts(practiceId, v.patient.id, now, { queued: true }, transaction)).filter((t) => !moving.has(t.id));
      for (const row of replan) {
        const rule = settings.rules.find((r) => r.id === row.ruleId)!;
        const plan = planReminder({ rule, visitStart: v.start, now, zone: patientZone(v), window: settings.quietHours, caps: settings.caps, texts: texts.map((t) => t.at), cause: 'moved' });
        if (plan.kind === 'queue') {
          await this.rows.update(
            { status: 'pending', dueAt: plan.dueAt, plannedAt: plan.plannedAt, deferReason: plan.reason, payload: { visitStart: v.start.toISOString() } },
            { where: { id: row.id, status: row.status }, transaction },
          );
          if (row.channel === 'sms') texts.push({ id: row.id, dedupeKey: row.dedupeKey, status: 'pending', at: plan.dueAt });
          summary.queued++;
        } else {
          await this.rows.update(
            { status: 'skipped', plannedAt: plan.plannedAt, deferReason: plan.reason.slice(0, 255), payload: { visitStart: v.start.toISOString(), timingSkip: true } },
            { where: { id: row.id, status: row.status }, transaction },
          );
          summary.skipped++;
        }
      }
      // Rules the visit has no row for yet (added since it was booked).
      const keys = before(settings.rules).map((r) => apptKey(v.id, r.channel, r.id));
      const ctx: PlanContext = { settings, now, texts, existing: await this.visits.existingKeys(keys, transaction), summary, transaction };
      for (const rule of before(settings.rules)) await this.planBeforeVisit(rule, v, ctx);
    });
    return summary;
  }

  // ---------- sweep ----------

  /** One pass of the sweep (one at a time per process); returns how many bookings it planned. */
  async sweepOnce(now: Date): Promise<number> {
    if (this.sweeping) return this.sweeping;
    this.sweeping = this.sweep(now).finally(() => {
      this.sweeping = null;
    });
    return this.sweeping;
  }

  private async sweep(now: Date): Promise<number> {
    const upcoming = await this.visits.upcoming(now, new Date(now.getTime() + SWEEP_DAYS * DAY_MS), SWEEP_LIMIT);
    if (!upcoming.length) return 0;
    const settingsOf = new Map<number, ReminderSettings>();
    for (const practiceId of new Set(upcoming.map((a) => a.practiceId))) settingsOf.set(practiceId, await this.settings.current(practiceId));
    const wanted = upcoming.map((a) => {
      const rules = settingsOf.get(a.practiceId)!.rules;
      const recent = now.getTime() - a.createdAt.getTime() <= BOOKING_CATCH_UP_MS;
      const keys = [...before(rules).map((r) => apptKey(a.id, r.channel, r.id)), ...(recent ? onBooking(rules).map((r) => seriesKey(a.seriesId, r.channel, r.id)) : [])];
      return { ...a, recent, keys };
    });
    const existing = await this.visits.existingKeys([...new Set(wanted.flatMap((w) => w.keys))]);
    const series = new Map<string, { practiceId: number; seriesId: string; recent: boolean }>();
    for (const w of wanted) {
      if (w.keys.every((k) => existing.has(k))) continue;
      const s = series.get(w.seriesId);
      series.set(w.seriesId, { practiceId: w.practiceId, seriesId: w.seriesId, recent: (s?.recent ?? false) || w.recent });
    }
    let planned = 0;
    for (const s of series.values()) {
      try {
        const r = await this.planSeries(s.practiceId, s.seriesId, now, { bookingMessages: s.recent });
        if (r.queued + r.skipped > 0) planned++;
      } catch (e) {
        // One booking's trouble never holds up the others.
        this.logger.error(`sweep: planning booking ${s.seriesId}: ${(e as Error).message}`);
      }
    }
    if (planned) this.logger.log(`sweep planned the reminders of ${planned} booking${planned === 1 ? '' : 's'} that lacked them`);
    return planned;
  }
}

const NO_CONSENT_YET = 'no text consent on file yet';

/** The reason a text to a patient without consent waits: said plainly, with any move for quiet hours after it. */
function withoutConsent(rule: ReminderRule, v: ReminderVisit, reason: string | null): string | null {
  if (rule.channel !== 'sms' || v.patient.smsConsent) return reason;
  const why = `${NO_CONSENT_YET}; it goes only if the patient agrees to texts before it is due`;
  return (reason ? `${why} (${reason})` : why).slice(0, 255);
}
