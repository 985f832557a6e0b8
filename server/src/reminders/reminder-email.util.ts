// Reminder e-mails: the practice's template filled in, then the visit list, the practice's phone and the
// caution product.md asks for (texts carry no clinical detail; only with consent, inside quiet hours,
// STOP honoured), as plain text and as simple HTML with the same words.
import type { QuietHours } from '@ostium/shared';
import { DateTime } from 'luxon';
import { fillPlaceholders, phoneForPeople, visitWhen } from './reminder-values.util.js';
import type { TemplateValues } from './rules/index.js';

export interface EmailVisit {
  start: Date;
  zone: string;
  locationName: string;
  address: string | null;
}

export interface ReminderEmailInput {
  subject: string;
  body: string;
  values: TemplateValues;
  visits: EmailVisit[];
  practiceName: string;
  practicePhone: string | null;
  quietHours: QuietHours;
}

export interface ReminderEmail {
  subject: string;
  text: string;
  html: string;
}

const escapeHtml = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;');


/** "8:00 AM" from "08:00". */
const clock = (hhmm: string) => DateTime.fromFormat(hhmm, 'HH:mm', { zone: 'UTC' }).setLocale('en-US').toFormat('h:mm a');

const place = (v: EmailVisit) => (v.address ? `${v.locationName}, ${v.address}` : v.locationName);

/** The paragraphs of the e-mail, in order; the first ones come from the practice's template. */
function paragraphs(input: ReminderEmailInput): string[] {
  const out = fillPlaceholders(input.body, input.values)
    .split(/\n\s*\n/)
    .map((p) => p.trim())
    .filter(Boolean);
  if (input.visits.length === 1) out.push(`Where: ${place(input.visits[0]!)}`);
  else out.push(['Your visits:', ...input.visits.map((v) => `- ${visitWhen(v.start, v.zone)} at ${place(v)}`)].join('\n'));
  if (input.practicePhone) out.push(`To change or cancel a visit, call ${input.practiceName} at ${phoneForPeople(input.practicePhone)}.`);
  out.push(
    `Our reminder texts carry only the date, time and place of your visit, no clinical details. We text only if you agreed to it, ` +
      `between ${clock(input.quietHours.start)} and ${clock(input.quietHours.end)} your time; reply STOP to any text to opt out.`,
  );
  out.push(input.practiceName);
  return out;
}

export function reminderEmail(input: ReminderEmailInput): ReminderEmail {
  const parts = paragraphs(input);
  const link = input.values.confirmLink;
  const html = parts
    .map((p) => {
      let h = escapeHtml(p).replace(/\n/g, '<br>\n');
      // The confirm link as a link; the token is base64url, so escaping left it unchanged.
      if (link) h = h.split(escapeHtml(link)).join(`<a href="${escapeHtml(link)}">${escapeHtml(link)}</a>`);
      return `<p>${h}</p>`;
    })
    .join('\n');
  return {
    subject: fillPlaceholders(input.subject, input.values).replace(/\s+/g, ' ').trim().slice(0, 255),
    text: `${parts.join('\n\n')}\n`,
    html: `<!doctype html>\n<html><body style="font-family: sans-serif; line-height: 1.5">\n${html}\n</body></html>\n`,
  };
}
