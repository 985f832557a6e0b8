import { Injectable, Logger } from '@nestjs/common';
import { InjectModel } from '@nestjs/sequelize';
import { formatPhone, parsePhone, type ReplyKindName } from '@ostium/shared';
import { Op, QueryTypes, UniqueConstraintError, type Transaction } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import { MessagingClock } from '../messaging/messaging-clock.service.js';
import { OutboxMessageRow } from '../messaging/models/outbox-message.model.js';
import { OutboxService } from '../messaging/outbox.service.js';
import { PatientsService } from '../patients/patients.service.js';
import { classifyReply, normalizeReply } from '../reminders/rules/keywords.util.js';
import { placeholderValues } from '../reminders/reminder-values.util.js';
import { renderTemplate } from '../reminders/rules/templates.util.js';
import type { AppointmentChangedEvent } from '../scheduling/appointment-events.js';
import { DeskTasksService } from './desk-tasks.service.js';
import { InboundMessageRow } from './models/inbound-message.model.js';
import { ReplyContextService } from './reply-context.service.js';
import { pickPatient, pickVisit, replyKind } from './reply-match.util.js';
import { helpText, localDate, optInAck, optOutAck, rescheduleAck, visitWhen } from './reply-texts.util.js';
import { VisitActionsService, type VisitFacts } from './visit-actions.service.js';
import { WaitlistOffersService, type PendingOffer } from './waitlist-offers.service.js';

/** The fields of the provider's inbound webhook we use (the form is Twilio's Messaging webhook). */
export interface InboundSms {
  messageSid: string;
  from: string;
  to: string | null;
  body: string;
}

export interface InboundResult {
  inboundId: number;
  duplicate: boolean;
  kind: ReplyKindName;
  patientId: number | null;
  appointmentId: number | null;
  effect: string | null;
}

/** What a reply did, for the inbound row and for the work that has to wait for the commit. */
interface Outcome {
  effect: string;
  /** Handled without the desk (stored read); false leaves it unread in the inbox. */
  handled: boolean;
  event?: AppointmentChangedEvent;
  /** Work after the commit (the waitlist booking, which runs its own guarded transaction). */
  after?: (row: InboundMessageRow) => Promise<void>;
}

interface Sender {
  practiceId: number;
  patientId: number;
  /** Every patient of that practice who gave this number (a family may share one). */
  sameNumber: number[];
  visit: VisitFacts | null;
  offer: PendingOffer | null;
}

/** Stored E.164 when the sender's address reads as a phone number, else the address as given. */
export function normaliseAddress(from: string): string {
  try {
    return parsePhone(from).e164;
  } catch {
    return from.trim().slice(0, 254);
  }
}

const display = (address: string) => {
  try {
    return formatPhone(address);
  } catch {
    return address;
  }
};

const quote = (body: string) => {
  const chars = [...body.trim().replace(/\s+/g, ' ')];
  return chars.length > 80 ? `${chars.slice(0, 79).join('')}…` : chars.join('');
};

/**
 * Everything that comes back by text. Each provider message is stored once (unique provider id); the
 * sender is matched to the patients who gave that number, the reply to their next visit, and the
 * keyword's effect is applied in the same transaction as the stored row. docs/messaging.md "Replies".
 */
@Injectable()
export class InboundService {
  private readonly logger = new Logger('Inbound');

  constructor(
    private readonly sequelize: Sequelize,
    @InjectModel(InboundMessageRow) private readonly inbound: typeof InboundMessageRow,
    @InjectModel(OutboxMessageRow) private readonly outboxRows: typeof OutboxMessageRow,
    private readonly outbox: OutboxService,
    private readonly patients: PatientsService,
    private readonly visits: VisitActionsService,
    private readonly tasks: DeskTasksService,
    private readonly offers: WaitlistOffersService,
    private readonly context: ReplyContextService,
    private readonly clock: MessagingClock,
  ) {}

  async receive(sms: InboundSms, now = this.clock.now()): Promise<InboundResult> {
    const seen = await this.inbound.findOne({ where: { providerId: sms.messageSid } });
    if (seen) return InboundService.result(seen, true);
    const address = normaliseAddress(sms.from);
    const word = classifyReply(sms.body);
    const sender = await this.matchSender(address, word === 'confirm', now);
    const practiceId = sender?.practiceId ?? (await this.context.defaultPracticeId());
    const kind: ReplyKindName = sender ? replyKind(word, sender.offer) : word;
    let outcome: Outcome;
    let row: InboundMessageRow;
    try {
      ({ row, outcome } = await this.sequelize.transaction(async (transaction) => {
        const created = await this.inbound.create(
          {
            practiceId,
            channel: 'sms',
            patientId: sender?.patientId ?? null,
            appointmentId: kind === 'waitlist_accept' ? null : (sender?.visit?.id ?? null),
            fromAddress: address,
            toAddress: sms.to,
            body: sms.body,
            providerId: sms.messageSid,
            kind,
            effect: null,
            readAt: null,
            receivedAt: now,
          },
          { transaction },
        );
        const o = sender ? await this.apply(kind, sms.body, sender, created, now, transaction) : await this.unmatched(practiceId, address, sms.body, created, transaction);
        created.set({ effect: o.effect.slice(0, 500), readAt: o.handled ? now : null });
        await created.save({ transaction });
        return { row: created, outcome: o };
      }));
    } catch (e) {
      // The same message arriving twice at once: the unique provider id lets one through.
      if (e instanceof UniqueConstraintError) {
        const again = await this.inbound.findOne({ where: { providerId: sms.messageSid } });
        if (again) return InboundService.result(again, true);
      }
      throw e;
    }
    this.visits.emitChanged(outcome.event);
    if (outcome.after) await outcome.after(row);
    return InboundService.result(row, false);
  }

  private static result(row: InboundMessageRow, duplicate: boolean): InboundResult {
    return { inboundId: row.id, duplicate, kind: row.kind, patientId: row.patientId, appointmentId: row.appointmentId, effect: row.effect };
  }

  // ---------- matching ----------

  private async matchSender(address: string, confirmWord: boolean, now: Date): Promise<Sender | null> {
    const candidates = await this.sequelize.query<{ id: number; practice_id: number }>('SELECT id, practice_id FROM patients WHERE phone = :address ORDER BY id', {
      replacements: { address },
      type: QueryTypes.SELECT,
    });
    if (!candidates.length) return null;
    const ids = candidates.map((c) => c.id);
    const visits = await this.visits.replyableVisits(ids, now);
    const offer = confirmWord ? await this.offers.pendingOffer(ids, now) : null;
    const candidatesOf = (list: VisitFacts[]) => list.map((v) => ({ id: v.id, patientId: v.patientId, start: v.start.getTime(), state: v.state, facts: v }));
    const visit = pickVisit(candidatesOf(visits), now.getTime());
    const [last] = await this.sequelize.query<{ patient_id: number }>(
      `SELECT patient_id FROM outbox_messages WHERE channel = 'sms' AND to_address = :address AND patient_id IN (:ids) ORDER BY id DESC LIMIT 1`,
      { replacements: { address, ids }, type: QueryTypes.SELECT },
    );
    const patientId = pickPatient(ids, { offer, visit, lastTexted: last?.patient_id ?? null })!;
    const practiceId = candidates.find((c) => c.id === patientId)!.practice_id;
    // The visit the reply is about is the chosen patient's own (another family member's never).
    const own = visit?.patientId === patientId ? visit : pickVisit(candidatesOf(visits.filter((v) => v.patientId === patientId)), now.getTime());
    return {
      practiceId,
      patientId,
      sameNumber: candidates.filter((c) => c.practice_id === practiceId).map((c) => c.id),
      visit: own?.facts ?? null,
      offer: offer && offer.patientId === patientId ? offer : null,
    };
  }

  // ---------- effects ----------

  private async apply(kind: ReplyKindName, body: string, s: Sender, row: InboundMessageRow, now: Date, transaction: Transaction): Promise<Outcome> {
    switch (kind) {
      case 'confirm':
        return this.confirm(s, row, now, transaction);
      case 'reschedule':
        return this.reschedule(s, body, row, now, transaction);
      case 'opt_out':
        return this.optOut(s, body, row, now, transaction);
      case 'opt_in':
        return this.optIn(s, body, row, now, transaction);
      case 'help': {
        const p = await this.context.practice(s.practiceId, transaction);
        await this.reply(s, row, helpText(p.name, p.phone), now, transaction);
        return { effect: "Sent the practice's name, number and how to opt out", handled: true };
      }
      case 'waitlist_accept':
        return this.acceptOffer(s, row, now, transaction);
      default:
        return { effect: 'Left in the inbox for the front desk; nothing changed', handled: false };
    }
  }

  /** A keyword reply: sent even without consent (the patient wrote first), once per inbound text. */
  private async reply(s: Pick<Sender, 'practiceId' | 'patientId'>, row: InboundMessageRow, body: string, now: Date, transaction?: Transaction) {
    return this.outbox.enqueue(
      {
        practiceId: s.practiceId,
        channel: 'sms',
        purpose: 'keyword_reply',
        dedupeKey: `in:${row.id}`,
        patientId: s.patientId,
        appointmentId: row.appointmentId,
        to: row.fromAddress,
        body,
        dueAt: now,
      },
      transaction,
    );
  }

  private async confirm(s: Sender, row: InboundMessageRow, now: Date, transaction: Transaction): Promise<Outcome> {
    const v = s.visit;
    if (!v) return { effect: 'No upcoming visit to confirm; left in the inbox for the front desk', handled: false };
    const when = `${visitWhen(v.start, v.timeZone)} at ${v.locationName}`;
    const r = await this.visits.confirm(s.practiceId, v.id, v.version, 'sms', now, transaction);
    switch (r.outcome) {
      case 'already_confirmed':
        return { effect: `The visit on ${when} was already confirmed; nothing changed`, handled: true };
      case 'changed':
        return { effect: `The visit on ${when} changed while the reply came in; not confirmed`, handled: false };
      case 'not_confirmable':
        return { effect: `The visit on ${when} is ${r.state.replace('_', '-')}; nothing to confirm`, handled: false };
    }
    const thanks = await this.thanks(s, v, now, transaction);
    if (thanks) await this.reply(s, row, thanks, now, transaction);
    return { effect: `Confirmed the visit on ${when}${thanks ? '; sent the thank-you text' : ''}`, handled: true, event: r.event };
  }

  /** The practice's own thank-you template, when its reminder settings have one (none by default). */
  private async thanks(s: Sender, v: VisitFacts, now: Date, transaction: Transaction): Promise<string | null> {
    const template = (await this.context.settings(s.practiceId, transaction)).confirmThanks;
    if (!template) return null;
    const p = await this.context.practice(s.practiceId, transaction);
    try {
      const values = placeholderValues({ channel: 'sms', practice: p.name, location: v.locationName, start: v.start, zone: v.timeZone, confirmLink: '' });
      const r = renderTemplate(template.body, values);
      return r.fitsOneSegment ? r.text : null;
    } catch (e) {
      this.logger.warn(`thank-you template of practice ${s.practiceId} at ${now.toISOString()}: ${(e as Error).message}`);
      return null;
    }
  }

  private async reschedule(s: Sender, body: string, row: InboundMessageRow, now: Date, transaction: Transaction): Promise<Outcome> {
    const p = await this.context.practice(s.practiceId, transaction);
    const v = s.visit;
    if (v) {
      const when = visitWhen(v.start, v.timeZone);
      if (await this.tasks.openFor(s.practiceId, 'reschedule_request', v.id, transaction)) {
        return { effect: `Asked again to reschedule the visit on ${when}; the open task stands, no second text`, handled: true };
      }
      await this.tasks.create(
        { practiceId: s.practiceId, kind: 'reschedule_request', patientId: s.patientId, appointmentId: v.id, inboundMessageId: row.id, detail: `Asks to reschedule the visit on ${when} at ${v.locationName} (text "${quote(body)}")` },
        transaction,
      );
      await this.reply(s, row, rescheduleAck(p.name), now, transaction);
      return { effect: `Reschedule request for the visit on ${when}: a task for the front desk; told the patient the practice will call`, handled: true };
    }
    await this.tasks.create(
      { practiceId: s.practiceId, kind: 'reschedule_request', patientId: s.patientId, inboundMessageId: row.id, detail: `Asks to reschedule, but has no upcoming visit (text "${quote(body)}")` },
      transaction,
    );
    await this.reply(s, row, rescheduleAck(p.name), now, transaction);
    return { effect: 'Reschedule request without an upcoming visit: a task for the front desk; told the patient the practice will call', handled: true };
  }

  /** The patients with this number, locked, so two STOPs at once are handled one after the other. */
  private async lockSameNumber(s: Sender, transaction: Transaction): Promise<{ id: number; sms_consent: number | boolean }[]> {
    return this.sequelize.query<{ id: number; sms_consent: number | boolean }>('SELECT id, sms_consent FROM patients WHERE id IN (:ids) ORDER BY id FOR UPDATE', {
      replacements: { ids: s.sameNumber },
      type: QueryTypes.SELECT,
      transaction,
    });
  }

  private async zoneOf(s: Sender, transaction: Transaction): Promise<string> {
    const patient = await this.patients.find(s.practiceId, s.patientId, transaction);
    return patient.timeZone ?? s.visit?.timeZone ?? 'America/New_York';
  }

  /**
   * STOP and its synonyms (references.md "Messages": opt-outs honoured at once): consent off for every
   * patient who gave this number, their pending texts cancelled, one acknowledgement — none for a
   * second STOP, since the number had already opted out.
   */
  private async optOut(s: Sender, body: string, row: InboundMessageRow, now: Date, transaction: Transaction): Promise<Outcome> {
    const locked = await this.lockSameNumber(s, transaction);
    const hadConsent = locked.some((p) => !!p.sms_consent);
    const word = normalizeReply(body);
    const source = `replied ${word} on ${localDate(now, await this.zoneOf(s, transaction))}`;
    for (const { id } of locked) {
      const p = await this.patients.find(s.practiceId, id, transaction);
      if (p.smsConsent || p.smsConsentSource === null) {
        p.set({ smsConsent: false, smsConsentAt: now, smsConsentSource: source.slice(0, 160) });
        await p.save({ transaction });
      }
    }
    const [cancelled] = await this.outboxRows.update(
      { status: 'cancelled', deferReason: 'consent withdrawn' },
      // Not the acknowledgements of earlier keywords: those answer what the patient sent and go without consent.
      { where: { practiceId: s.practiceId, patientId: locked.map((p) => p.id), channel: 'sms', status: 'pending', purpose: { [Op.ne]: 'keyword_reply' } }, transaction },
    );
    const pending = cancelled ? `; ${cancelled} pending text${cancelled === 1 ? '' : 's'} cancelled` : '';
    const [previous] = await this.sequelize.query<{ kind: string }>(
      // Any other keyword row, not only earlier ids: of two STOPs at once the later-numbered one may take
      // the patients' lock first, and the other must then see it (committed) as the opt-out already made.
      `SELECT kind FROM inbound_messages WHERE practice_id = :practiceId AND from_address = :address AND kind IN ('opt_out', 'opt_in') AND id <> :id ORDER BY id DESC LIMIT 1`,
      { replacements: { practiceId: s.practiceId, address: row.fromAddress, id: row.id }, type: QueryTypes.SELECT, transaction },
    );
    if (!hadConsent && previous?.kind === 'opt_out') {
      return { effect: `Replied ${word} again: texts were already off${pending}; no second acknowledgement`, handled: true };
    }
    const p = await this.context.practice(s.practiceId, transaction);
    await this.reply(s, row, optOutAck(p.name), now, transaction);
    return { effect: `Texts stopped (replied ${word})${sharedBy(locked.length)}${pending}; acknowledged once`, handled: true };
  }

  /** START: consent back for the patients who gave this number, and a one-line acknowledgement. */
  private async optIn(s: Sender, body: string, row: InboundMessageRow, now: Date, transaction: Transaction): Promise<Outcome> {
    const locked = await this.lockSameNumber(s, transaction);
    const word = normalizeReply(body);
    const source = `replied ${word} on ${localDate(now, await this.zoneOf(s, transaction))}`;
    let changed = 0;
    for (const l of locked.filter((x) => !x.sms_consent)) {
      const p = await this.patients.find(s.practiceId, l.id, transaction);
      p.set({ smsConsent: true, smsConsentAt: now, smsConsentSource: source.slice(0, 160) });
      await p.save({ transaction });
      changed++;
    }
    if (!changed) return { effect: `Replied ${word}: texts were already on; no reply sent`, handled: true };
    const p = await this.context.practice(s.practiceId, transaction);
    await this.reply(s, row, optInAck(p.name), now, transaction);
    return { effect: `Texts on again (replied ${word})${sharedBy(changed)}; acknowledged`, handled: true };
  }

  private async acceptOffer(s: Sender, row: InboundMessageRow, now: Date, transaction: Transaction): Promise<Outcome> {
    const offer = s.offer!;
    const claim = await this.offers.claim(offer.offerId, now, transaction);
    if (claim === 'gone') {
      await this.reply(s, row, await this.offers.goneText(s.practiceId, transaction), now, transaction);
      return { effect: 'Answered the waitlist offer, but the time had already been taken or the offer had expired; told the patient', handled: true };
    }
    return {
      effect: 'Took the waitlist offer; booking…',
      handled: true,
      after: async (saved) => {
        let effect: string;
        let text: string;
        let appointmentId: number | null = null;
        try {
          const r = await this.offers.bookClaimed(s.practiceId, offer.offerId, now);
          ({ effect, text } = r);
          if (r.outcome === 'booked') appointmentId = r.appointmentId;
        } catch (e) {
          this.logger.error(`waitlist booking for offer ${offer.offerId}: ${(e as Error).stack ?? e}`);
          effect = 'Took the waitlist offer, but the booking failed on the server; book it by hand';
          text = await this.offers.goneText(s.practiceId);
        }
        saved.set({ effect: effect.slice(0, 500), appointmentId, readAt: appointmentId ? saved.readAt : null });
        await saved.save();
        await this.reply(s, saved, text, now);
      },
    };
  }

  /** A number no patient gave: kept in the inbox with one open task per sender; nothing else changes. */
  private async unmatched(practiceId: number, address: string, body: string, row: InboundMessageRow, transaction: Transaction): Promise<Outcome> {
    const open = await this.tasks.listForAddress(practiceId, address, transaction);
    if (!open.some((t) => t.status === 'open' && t.kind === 'unmatched_reply')) {
      await this.tasks.create(
        { practiceId, kind: 'unmatched_reply', inboundMessageId: row.id, detail: `A text from ${display(address)} matches no patient: "${quote(body)}"` },
        transaction,
      );
      return { effect: 'No patient gave this number; left in the inbox with a task for the front desk', handled: false };
    }
    return { effect: 'No patient gave this number; left in the inbox (the open task for this sender stands)', handled: false };
  }
}

/** A number several patients gave (a family's phone): the desk sees that the keyword changed them all. */
function sharedBy(patients: number): string {
  return patients > 1 ? ` for all ${patients} patients who gave this number` : '';
}
