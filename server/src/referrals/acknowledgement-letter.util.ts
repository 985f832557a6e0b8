import { formatPhone } from '@ostium/shared';
import { DateTime } from 'luxon';

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

const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

function phoneShown(e164: string | null): string | null {
  if (!e164) return null;
  try {
    return formatPhone(e164);
  } catch {
    return e164;
  }
}

/**
 * The acknowledgement to the referring dentist. Minimum necessary (45 CFR 164.502(b), see
 * design/references.md): the patient's name and that the referral arrived, the practice's contact —
 * no tooth, no procedure, no urgency, no date of birth, no clinical note. Only the given facts can
 * appear, because nothing else is passed in.
 */
export function composeAcknowledgement(f: AcknowledgementFacts): ComposedLetter {
  const patient = `${f.patient.firstName} ${f.patient.lastName}`;
  const received = DateTime.fromISO(f.receivedOn, { zone: 'utc' }).toFormat('d LLLL yyyy');
  const phone = phoneShown(f.location.phone) ?? phoneShown(f.practice.phone);
  const contact = [phone ? `phone ${phone}` : null, f.practice.email ? `e-mail ${f.practice.email}` : null].filter(Boolean).join(', ');
  const place = [f.location.name, f.location.address].filter(Boolean).join(', ');
  const subject = `Referral received – ${f.practice.name}`;
  const paragraphs = [
    `Dear ${f.dentist.name},`,
    `thank you for your referral of ${patient}, which we received on ${received}.`,
    'We will contact the patient to arrange an appointment and will keep you informed.',
    contact ? `If you have any questions, please contact us (${contact}).` : 'If you have any questions, please contact us.',
    `Kind regards,\n${f.practice.name}${place ? `\n${place}` : ''}`,
  ];
  const text = `${paragraphs.join('\n\n')}\n`;
  const html = `<!doctype html><html><body style="font-family: sans-serif; line-height: 1.5">${paragraphs
    .map((p) => `<p>${escapeHtml(p).replace(/\n/g, '<br>')}</p>`)
    .join('')}</body></html>`;
  return { subject, text, html };
}
