import { Inject, Injectable } from '@nestjs/common';
import type { AppointmentState, ReminderRule, ReminderSettings } from '@ostium/shared';
import { APP_CONFIG, type AppConfig } from '../config/configuration.js';
import type { ComposeDecision, MessageComposer, OutgoingAttachment } from '../messaging/composer.types.js';
import type { OutboxMessageRow } from '../messaging/models/outbox-message.model.js';
import { visitCalendarAttachment } from './calendar-attachment.util.js';
import { makeVisitToken, visitLink } from './confirm-link.util.js';
import { reminderEmail } from './reminder-email.util.js';
import { ruleInstant } from './reminder-plan.util.js';
import { ReminderSettingsService } from './reminder-settings.service.js';
import { phoneForPeople, placeholderValues, visitWhen } from './reminder-values.util.js';
import { isRemindable, patientZone, REMINDABLE_STATES, ReminderVisitsService, type ReminderVisit } from './reminder-visits.service.js';
import { decideTextSlot, renderTemplate, TemplateError } from './rules/index.js';

const HOUR = 3_600_000;
/** A row the job picks up a little early (its interval) still counts as on time. */
const ON_TIME_MS = 60_000;

/** Why reminders for a visit in this state no longer go (also the planner's words on a change). */
export const GONE_REASONS: Record<Exclude<AppointmentState, 'booked' | 'confirmed'>, string> = {
  cancelled: 'the visit was cancelled',
  no_show: 'the patient did not come to the visit (no-show)',
  arrived: 'the patient has arrived for the visit',
  seated: 'the visit has started',
  dismissed: 'the visit is over',
};

/** What the job sends; `html` rides along for the e-mail sender (see the report: the outbox's send has no html yet). */
type SendDecision = Extract<ComposeDecision, { action: 'send' }> & { html?: string };

const skip = (reason: string): ComposeDecision => ({ action: 'skip', reason });
const cancel = (reason: string): ComposeDecision => ({ action: 'cancel', reason });

/**
 * Renders reminders (`reminder`) and booking e-mails (`booking_email`) at send time: the appointment is
 * read again, so a visit cancelled a second before gets nothing and a moved one gets its new time.
 */
@Injectable()
export class ReminderComposerService implements MessageComposer {
  constructor(
    private readonly visits: ReminderVisitsService,
    private readonly settings: ReminderSettingsService,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
  ) {}

  async compose(row: OutboxMessageRow, now: Date): Promise<ComposeDecision> {
    if (row.purpose === 'booking_email') return this.bookingEmail(row, now);
    if (row.purpose === 'reminder') return this.reminder(row, now);
    return skip(`the reminders module does not write ${row.purpose} messages`);
  }

  /** The signed link to the visit's page, valid until the visit's start plus the practice's link hours. */
  private link(v: ReminderVisit, settings: ReminderSettings): string {
    const token = makeVisitToken(this.config.messaging.linkSecret, v.id, v.start.getTime() + settings.confirmLinkValidHours * HOUR);
    return visitLink(this.config.publicUrl, token);
  }

  private ruleAndTemplate(row: OutboxMessageRow, settings: ReminderSettings): { rule: ReminderRule; subject: string | null; body: string } | ComposeDecision {
    const rule = settings.rules.find((r) => r.id === row.ruleId);
    if (!rule) return skip(`the reminder rule “${row.ruleId ?? ''}” no longer exists`);
    if (!rule.enabled) return skip(`the reminder rule “${rule.label}” is turned off`);
    const template = settings.templates.find((t) => t.id === rule.templateId && t.channel === row.channel);
    if (!template) return skip(`the template “${rule.templateId}” of the rule “${rule.label}” no longer exists`);
    return { rule, subject: template.subject, body: template.body };
  }

  private async reminder(row: OutboxMessageRow, now: Date): Promise<ComposeDecision> {
    if (!row.appointmentId) return skip('the reminder names no visit');
    const v = await this.visits.visit(row.appointmentId);
    if (!v || v.practiceId !== row.practiceId) return cancel('the visit no longer exists');
    if (!REMINDABLE_STATES.includes(v.state)) return cancel(GONE_REASONS[v.state as keyof typeof GONE_REASONS]);
    if (v.start.getTime() <= now.getTime()) return skip('the visit has already started');
    const settings = await this.settings.current(row.practiceId);
    const found = this.ruleAndTemplate(row, settings);
    if ('action' in found) return found;
    const { rule } = found;
    // Moved later since it was queued: wait for the rule's new time (quiet hours and caps are judged then).
    const due = ruleInstant(rule, v.start.getTime(), now.getTime());
    if (rule.trigger === 'before_visit' && due > now.getTime() + ON_TIME_MS) {
      // The planner notes the start it planned for; a different start now means the visit moved.
      const plannedStart = typeof row.payload?.visitStart === 'string' ? Date.parse(row.payload.visitStart) : Number.NaN;
      const reason =
        Number.isFinite(plannedStart) && Math.abs(plannedStart - v.start.getTime()) > ON_TIME_MS
          ? `the visit moved to ${visitWhen(v.start, v.location.timeZone)}`
          : `the rule now asks for ${visitWhen(due, patientZone(v))}`;
      return { action: 'defer', dueAt: new Date(due), reason };
    }
    if (rule.onlyIfUnconfirmed && v.state === 'confirmed') return skip('already confirmed');
    if (row.channel === 'sms') {
      if (!v.patient.smsConsent) return skip('no text consent');
      if (!v.patient.phone) return skip('no mobile number on file');
      // Texts that already went (or are going out now, lower ids first so two rows never wait for each other).
      const sent = (await this.visits.countedTexts(row.practiceId, v.patient.id, now, { queued: false }))
        .filter((t) => t.id !== row.id && (t.status !== 'sending' || t.id < row.id))
        .map((t) => t.at);
      const slot = decideTextSlot(sent, now, patientZone(v), { window: settings.quietHours, caps: settings.caps });
      if (!slot.ok) {
        const why = slot.reasons.map((r) => r.message).join('; ');
        if (slot.deferTo.getTime() >= v.start.getTime()) return skip(`no allowed time for this reminder before the visit (${why})`);
        return { action: 'defer', dueAt: slot.deferTo, reason: why };
      }
      const values = placeholderValues({ channel: 'sms', practice: v.practice.name, location: v.location.name, start: v.start, zone: v.location.timeZone, confirmLink: this.link(v, settings) });
      try {
        const r = renderTemplate(found.body, values);
        if (!r.fitsOneSegment) return skip(`the text would be ${r.length.units} of ${r.length.limit} characters (${r.length.encoding}), more than one text; shorten the template`);
        return { action: 'send', to: v.patient.phone, body: r.text };
      } catch (e) {
        if (e instanceof TemplateError) return skip(`the template cannot be filled: ${e.message}`);
        throw e;
      }
    }
    if (!v.patient.email) return skip('no e-mail address on file');
    return this.email(v.patient.email, [v], rule, found, settings, now);
  }

  private async bookingEmail(row: OutboxMessageRow, now: Date): Promise<ComposeDecision> {
    const seriesId = typeof row.payload?.seriesId === 'string' ? row.payload.seriesId : null;
    if (!seriesId) return skip('the booking e-mail names no booking');
    const series = await this.visits.series(row.practiceId, seriesId);
    const ahead = series.filter((v) => isRemindable(v, now));
    if (!ahead.length) {
      if (series.length && series.every((v) => v.state === 'cancelled')) return cancel(series.length > 1 ? 'the visits were cancelled' : 'the visit was cancelled');
      return skip('no visit of the booking lies ahead any more');
    }
    const settings = await this.settings.current(row.practiceId);
    const found = this.ruleAndTemplate(row, settings);
    if ('action' in found) return found;
    const email = ahead[0]!.patient.email;
    if (!email) return skip('no e-mail address on file');
    return this.email(email, ahead, found.rule, found, settings, now);
  }

  private email(to: string, visits: ReminderVisit[], rule: ReminderRule, template: { subject: string | null; body: string }, settings: ReminderSettings, now: Date): ComposeDecision {
    const first = visits[0]!;
    const values = placeholderValues({ channel: 'email', practice: first.practice.name, location: first.location.name, start: first.start, zone: first.location.timeZone, confirmLink: this.link(first, settings) });
    const mail = reminderEmail({
      subject: template.subject ?? '{practice}: your visit',
      body: template.body,
      values,
      visits: visits.map((v) => ({ start: v.start, zone: v.location.timeZone, locationName: v.location.name, address: v.location.address })),
      practiceName: first.practice.name,
      practicePhone: first.practice.phone,
      quietHours: settings.quietHours,
    });
    const attachments: OutgoingAttachment[] = [];
    if (rule.attachCalendar) {
      attachments.push(
        visitCalendarAttachment({
          practiceName: first.practice.name,
          practicePhone: first.practice.phone ? phoneForPeople(first.practice.phone) : null,
          host: new URL(this.config.publicUrl).hostname || 'ostium.invalid',
          now,
          visits: visits.map((v) => ({ appointmentId: v.id, version: v.version, start: v.start, end: v.end, locationName: v.location.name, address: v.location.address })),
        }),
      );
    }
    const decision: SendDecision = { action: 'send', to, subject: mail.subject, body: mail.text, html: mail.html, attachments };
    return decision;
  }
}
