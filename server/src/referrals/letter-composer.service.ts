import { Injectable, OnModuleInit } from '@nestjs/common';
import type { ComposeDecision, MessageComposer, OutgoingAttachment } from '../messaging/composer.types.js';
import type { OutboxMessageRow } from '../messaging/models/outbox-message.model.js';
import { OutboxService } from '../messaging/outbox.service.js';
import { composeAcknowledgement, type ComposedLetter } from './acknowledgement-letter.util.js';
import { composeBookingNotice } from './booking-notice-letter.util.js';
import { composeCompletionReportEmail, reportFileName } from './completion-report-letter.util.js';
import { renderCompletionReportPdf } from './completion-report-pdf.util.js';
import { CompletionService } from './completion.service.js';
import { LettersService } from './letters.service.js';
import { ReferralsService } from './referrals.service.js';

/**
 * A send decision with the letter's HTML part. ComposeDecision has no `html` yet and the outbox's e-mail
 * sender sends the text part only; the HTML rides along for when it does (docs/messaging.md "Letters").
 */
type SendWithHtml = Extract<ComposeDecision, { action: 'send' }> & { html: string };

/**
 * The outbox's composer for purpose `letter` (payload {letterId}): at send time it reads the letter,
 * the referral's parties, the visits and the completion again and writes the e-mail (and the report's
 * PDF) from what is true then. What it wrote is kept on the letter.
 */
@Injectable()
export class LetterComposerService implements MessageComposer, OnModuleInit {
  constructor(
    private readonly outbox: OutboxService,
    private readonly letters: LettersService,
    private readonly completion: CompletionService,
    private readonly referrals: ReferralsService,
  ) {}

  onModuleInit() {
    this.outbox.registerComposer('letter', this);
  }

  async compose(row: OutboxMessageRow, now: Date): Promise<ComposeDecision> {
    const letterId = Number((row.payload as { letterId?: unknown } | null)?.letterId ?? row.letterId);
    const l = Number.isInteger(letterId) ? await this.letters.find(row.practiceId, letterId) : null;
    if (!l) return { action: 'cancel', reason: 'the letter no longer exists' };
    if (l.status === 'sent' || l.status === 'skipped') return { action: 'cancel', reason: `the letter was already ${l.status}` };
    // A failed letter whose message the front desk sent again is on its way once more.
    if (l.status === 'failed') await this.letters.reopen(l.id);
    const p = await this.letters.parties(row.practiceId, l.referralId);
    if (!p) return { action: 'cancel', reason: 'the referral no longer exists' };
    if (!p.dentist.email) return { action: 'skip', reason: 'no e-mail address on file for the referring dentist' };
    if (p.dentist.letterChannel !== 'email') return { action: 'skip', reason: `the referring dentist prefers letters by ${p.dentist.letterChannel}; send it that way` };
    const practice = p.practice;
    const location = { name: p.location.name, address: p.location.address, phone: p.location.phone };
    const patient = { firstName: p.patient.firstName, lastName: p.patient.lastName };

    let mail: ComposedLetter;
    let facts: Record<string, unknown>;
    const attachments: OutgoingAttachment[] = [];
    switch (l.kind) {
      case 'acknowledgement': {
        const f = { practice, location, dentist: { name: p.dentist.name }, patient, receivedOn: p.referral.receivedOn };
        mail = composeAcknowledgement(f);
        facts = { ...f };
        break;
      }
      case 'booking_notice': {
        const first = l.caseId ? await this.completion.firstVisit(row.practiceId, l.caseId) : null;
        if (!first) return { action: 'cancel', reason: 'the visits were cancelled before the notice went out' };
        const c = await this.referrals.getCase(row.practiceId, l.caseId!);
        const f = {
          practice,
          location: { ...location, timeZone: first.visit.timeZone },
          dentist: { name: p.dentist.name },
          patient,
          toothFdi: c.toothFdi,
          procedure: c.procedure,
          firstVisit: { start: first.visit.start.toISOString(), end: first.visit.end.toISOString(), endodontist: first.visit.endodontist },
          visitCount: first.count,
        };
        mail = composeBookingNotice(f);
        facts = { ...f };
        break;
      }
      case 'completion_report': {
        const f = await this.completion.reportFacts(l, p, now);
        if (!f) return { action: 'cancel', reason: 'the case has no completion any more' };
        mail = composeCompletionReportEmail(f);
        attachments.push({ filename: reportFileName(f), contentType: 'application/pdf', content: await renderCompletionReportPdf(f) });
        facts = { ...f };
        break;
      }
    }
    await this.letters.recordComposed(l.id, { toAddress: p.dentist.email, subject: mail.subject, content: { kind: l.kind, facts } });
    const send: SendWithHtml = { action: 'send', to: p.dentist.email, subject: mail.subject, body: mail.text, html: mail.html, attachments };
    return send;
  }
}
