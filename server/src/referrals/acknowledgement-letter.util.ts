import { DateTime } from 'luxon';
import { contactPhrase, LETTER_LOCALE, paragraphsHtml, placeLine } from './letter-format.util.js';

export interface AcknowledgementFacts {
  practice: { name: string; phone: string | null; email: string | null };
  location: { name: string; address: string | null; phone: string | null };
  dentist: { name: string };
  patient: { firstName: string; lastName: string };
  receivedOn: string; // YYYY-MM-DD
}

export interface ComposedLetter {
  subject: string;
  text: string;
  html: string;
}

export const acknowledgementSubject = (practiceName: string) => `Referral received – ${practiceName}`;

/**
 * The acknowledgement to the referring dentist. Minimum necessary (45 CFR 164.502(b), see
 * design/references.md): the patient's name and that the referral arrived, the practice's contact —
 * no tooth, no procedure, no urgency, no date of birth, no clinical note. Only the given facts can
 * appear, because nothing else is passed in.
 */
export function composeAcknowledgement(f: AcknowledgementFacts): ComposedLetter {
  const patient = `${f.patient.firstName} ${f.patient.lastName}`;
  const received = DateTime.fromISO(f.receivedOn, { zone: 'utc', locale: LETTER_LOCALE }).toFormat('d LLLL yyyy');
  const contact = contactPhrase(f.practice, f.location);
  const place = placeLine(f.location);
  const subject = acknowledgementSubject(f.practice.name);
  const paragraphs = [
    `Dear ${f.dentist.name},`,
    `thank you for your referral of ${patient}, which we received on ${received}.`,
    'We will contact the patient to arrange an appointment and will keep you informed.',
    contact ? `If you have any questions, please contact us (${contact}).` : 'If you have any questions, please contact us.',
    `Kind regards,\n${f.practice.name}${place ? `\n${place}` : ''}`,
  ];
  const text = `${paragraphs.join('\n\n')}\n`;
  return { subject, text, html: paragraphsHtml(paragraphs) };
}
