import type { Procedure } from '@ostium/shared';
import { DateTime } from 'luxon';
import type { ComposedLetter } from './acknowledgement-letter.util.js';
import { capitalised, contactPhrase, LETTER_LOCALE, paragraphsHtml, placeLine, PROCEDURE_WORDS, toothWords } from './letter-format.util.js';

export interface BookingNoticeFacts {
  practice: { name: string; phone: string | null; email: string | null };
  location: { name: string; address: string | null; phone: string | null; timeZone: string };
  dentist: { name: string };
  patient: { firstName: string; lastName: string };
  toothFdi: string;
  procedure: Procedure;
  /** The first visit as booked now (ISO instants), read again at send time. */
  firstVisit: { start: string; end: string; endodontist: string };
  /** How many visits are planned for the tooth (the booked series). */
  visitCount: number;
}

export const bookingNoticeSubject = (practiceName: string) => `Treatment booked for your referral – ${practiceName}`;

/**
 * Tells the referring dentist that treatment is booked: the patient, the tooth, the procedure, the
 * first visit (local date and time at the location) and who treats — what the colleague needs to
 * know the referral is in hand; no date of birth, no clinical notes.
 */
export function composeBookingNotice(f: BookingNoticeFacts): ComposedLetter {
  const patient = `${f.patient.firstName} ${f.patient.lastName}`;
  const start = DateTime.fromISO(f.firstVisit.start, { zone: f.location.timeZone, locale: LETTER_LOCALE });
  const end = DateTime.fromISO(f.firstVisit.end, { zone: f.location.timeZone, locale: LETTER_LOCALE });
  const when = `${start.toFormat('cccc d LLLL yyyy')}, ${start.toFormat('HH:mm')}–${end.toFormat('HH:mm')} (${start.toFormat('ZZZZ')})`;
  const contact = contactPhrase(f.practice, f.location);
  const place = placeLine(f.location);
  const more = f.visitCount > 1 ? ` The treatment is planned in ${f.visitCount} visits.` : '';
  const paragraphs = [
    `Dear ${f.dentist.name},`,
    `the treatment of your patient ${patient} has been booked.`,
    [
      `Patient: ${patient}`,
      `Tooth: ${toothWords(f.toothFdi)}`,
      `Procedure: ${capitalised(PROCEDURE_WORDS[f.procedure])}`,
      `First visit: ${when}`,
      `Endodontist: ${f.firstVisit.endodontist}`,
      `Location: ${place}`,
    ].join('\n'),
    `We will send you a report when treatment ends.${more}`,
    contact ? `If you have any questions, please contact us (${contact}).` : 'If you have any questions, please contact us.',
    `Kind regards,\n${f.practice.name}`,
  ];
  return { subject: bookingNoticeSubject(f.practice.name), text: `${paragraphs.join('\n\n')}\n`, html: paragraphsHtml(paragraphs) };
}
