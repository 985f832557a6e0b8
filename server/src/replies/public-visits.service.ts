import { ConflictException, GoneException, Inject, Injectable, NotFoundException } from '@nestjs/common';
import { InjectModel } from '@nestjs/sequelize';
import type { PublicVisitAction, PublicVisitView } from '@ostium/shared';
import { DateTime } from 'luxon';
import { QueryTypes, type Transaction } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import { APP_CONFIG, type AppConfig } from '../config/configuration.js';
import { MessagingClock } from '../messaging/messaging-clock.service.js';
import { readVisitToken } from '../reminders/confirm-link.util.js';
import type { AppointmentChangedEvent } from '../scheduling/appointment-events.js';
import { DeskTasksService } from './desk-tasks.service.js';
import { InboundMessageRow } from './models/inbound-message.model.js';
import { ReplyContextService, type PracticeContact } from './reply-context.service.js';
import { visitWhen } from './reply-texts.util.js';
import { VisitActionsService, type VisitFacts } from './visit-actions.service.js';

const INVALID = 'This link is not valid. Check the link in your message, or call the practice.';
const EXPIRED = 'This link has expired. Please call the practice about your visit.';
/** The sender recorded for what a patient did on the visit page. */
export const LINK_SENDER = 'visit link';

/**
 * The small public page behind the signed link in a reminder: it shows only what confirms the
 * appointment — practice, its phone, location, local date and time (HHS FAQ 198; minimum necessary,
 * 45 CFR 164.502(b)) — and lets the patient confirm or ask for another time.
 */
@Injectable()
export class PublicVisitsService {
  constructor(
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    private readonly sequelize: Sequelize,
    @InjectModel(InboundMessageRow) private readonly inbound: typeof InboundMessageRow,
    private readonly visits: VisitActionsService,
    private readonly tasks: DeskTasksService,
    private readonly context: ReplyContextService,
    private readonly clock: MessagingClock,
  ) {}

  private async resolve(token: string, now: Date): Promise<VisitFacts> {
    const read = readVisitToken(this.config.messaging.linkSecret, token, now);
    if ('error' in read) {
      if (read.error === 'expired') throw new GoneException(EXPIRED);
      throw new NotFoundException(INVALID);
    }
    const v = await this.visits.visit(read.appointmentId);
    if (!v) throw new NotFoundException(INVALID);
    return v;
  }

  private async state(v: VisitFacts, now: Date, transaction?: Transaction): Promise<PublicVisitView['state']> {
    if (v.state === 'cancelled' || v.state === 'no_show') return 'cancelled';
    if (v.start.getTime() <= now.getTime() || !['booked', 'confirmed'].includes(v.state)) return 'past';
    if (await this.tasks.openFor(v.practiceId, 'reschedule_request', v.id, transaction)) return 'reschedule_requested';
    return v.state === 'confirmed' ? 'confirmed' : 'booked';
  }

  private static view(v: VisitFacts, practice: PracticeContact, state: PublicVisitView['state']): PublicVisitView {
    return {
      practiceName: practice.name,
      practicePhone: practice.phone,
      locationName: v.locationName,
      when: DateTime.fromJSDate(v.start, { zone: v.timeZone }).setLocale('en-US').toFormat("cccc d LLLL yyyy', 'h:mm a"),
      start: v.start.toISOString(),
      state,
      canConfirm: state === 'booked',
      canAskToReschedule: state === 'booked' || state === 'confirmed',
    };
  }

  async get(token: string, now = this.clock.now()): Promise<PublicVisitView> {
    const v = await this.resolve(token, now);
    return PublicVisitsService.view(v, await this.context.practice(v.practiceId), await this.state(v, now));
  }

  async act(token: string, dto: PublicVisitAction, now = this.clock.now()): Promise<PublicVisitView> {
    const v = await this.resolve(token, now);
    const practice = await this.context.practice(v.practiceId);
    const when = `${visitWhen(v.start, v.timeZone)} at ${v.locationName}`;
    const call = practice.phone ? `call ${practice.name} at ${practice.phone}` : `call ${practice.name}`;
    let event: AppointmentChangedEvent | undefined;
    await this.sequelize.transaction(async (transaction) => {
      // One visit's actions one at a time: two clicks cannot make two tasks or two confirmations.
      await this.sequelize.query('SELECT id FROM appointments WHERE id = :id FOR UPDATE', { replacements: { id: v.id }, type: QueryTypes.SELECT, transaction });
      const state = await this.state(v, now, transaction);
      if (state === 'cancelled') throw new ConflictException(`This visit was cancelled. To book a new time, ${call}.`);
      if (state === 'past') throw new ConflictException(`This visit is in the past. For anything else, ${call}.`);
      if (state === 'reschedule_requested') throw new ConflictException(`You have asked for another time; ${practice.name} will call you.`);
      const record = (kind: 'confirm' | 'reschedule', body: string, effect: string, appointmentId = v.id) =>
        this.inbound.create(
          { practiceId: v.practiceId, channel: 'link', patientId: v.patientId, appointmentId, fromAddress: LINK_SENDER, toAddress: null, body, providerId: null, kind, effect, readAt: kind === 'confirm' ? now : null, readBy: null, receivedAt: now },
          { transaction },
        );
      if (dto.action === 'confirm') {
        if (state === 'confirmed') throw new ConflictException('This visit is already confirmed. Thank you.');
        const r = await this.visits.confirm(v.practiceId, v.id, v.version, 'link', now, transaction);
        if (r.outcome === 'already_confirmed') throw new ConflictException('This visit is already confirmed. Thank you.');
        if (r.outcome !== 'confirmed') throw new ConflictException(`This visit has just changed. Reload the page, or ${call}.`);
        event = r.event;
        await record('confirm', 'Confirmed on the visit page', `Confirmed the visit on ${when} (visit link)`);
        return;
      }
      const msg = await record('reschedule', 'Asked for another time on the visit page', `Reschedule request for the visit on ${when}: a task for the front desk`);
      await this.tasks.create(
        { practiceId: v.practiceId, kind: 'reschedule_request', patientId: v.patientId, appointmentId: v.id, inboundMessageId: msg.id, detail: `Asks to reschedule the visit on ${when} (visit page)` },
        transaction,
      );
    });
    this.visits.emitChanged(event);
    const fresh = (await this.visits.visit(v.id)) ?? v;
    return PublicVisitsService.view(fresh, practice, await this.state(fresh, now));
  }
}
