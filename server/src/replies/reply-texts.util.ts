// The few texts the replies module sends back. Each names the practice, carries no clinical detail
// (HHS FAQ 198: only what confirms the appointment) and fits one segment (references.md "Messages":
// ≤ 160 characters, counted by encoding); all but the opt-out acknowledgement say how to opt out.
import { DateTime } from 'luxon';
import { visitDate, visitTime } from '../reminders/reminder-values.util.js';
import { isGsm7Char, smsLength } from '../reminders/rules/sms-encoding.util.js';
import { namesOptOutWord } from '../reminders/rules/templates.util.js';

export const OPT_OUT_HINT = 'Reply STOP to opt out.';

/** "Thu 3 Dec 9:00 AM" in the location's zone (the reminders' date and time, side by side). */
export function visitWhen(start: Date | number, zone: string): string {
  return `${visitDate(start, zone)} ${visitTime(start, zone)}`;
}

/** A local calendar date "2026-12-03" in the zone, for consent sources. */
export function localDate(at: Date, zone: string): string {
  return DateTime.fromJSDate(at, { zone }).toISODate()!;
}

export function fitsOneSegment(text: string): boolean {
  const l = smsLength(text);
  return l.units <= l.limit;
}

/** The first candidate that fits one segment; the last one cut to fit when none does. */
export function firstThatFits(candidates: string[]): string {
  for (const c of candidates) if (fitsOneSegment(c)) return c;
  let last = [...candidates[candidates.length - 1]!];
  while (last.length > 0 && !fitsOneSegment(last.join(''))) last = last.slice(0, -1);
  return last.join('');
}

// Shorter and shorter forms of the practice's name: a text must name the provider (references.md
// "Messages"), so the name is shortened before the hint or the time is ever cut. Accents outside GSM-7
// would turn the whole text into UCS-2 (70 characters), so the shorter forms drop them ("Clínica" →
// "Clinica"), and a cut name ends in "..." rather than "…" for the same reason.
const NAME_LENGTHS = [Infinity, 40, 30, 20, 12];
function shortNames(practice: string): string[] {
  const full = practice.trim();
  const fold = (ch: string) => {
    if (isGsm7Char(ch)) return ch;
    const bare = ch.normalize('NFD').replace(/\p{M}/gu, '');
    return [...bare].every(isGsm7Char) ? bare : '';
  };
  const folded = [...full].map(fold).join('');
  const cut = (chars: string[], n: number) => (chars.length <= n ? chars.join('') : `${chars.slice(0, n - 3).join('').trimEnd()}...`);
  const forms = [full, ...NAME_LENGTHS.map((n) => cut([...folded], n))];
  return forms.filter((v, i) => v !== '' && forms.indexOf(v) === i);
}

/** The text with the longest form of the practice name that fits one segment, for each shape in turn. */
function withName(practice: string, ...shapes: ((name: string) => string)[]): string {
  const candidates = shapes.flatMap((shape) => shortNames(practice).map(shape));
  return firstThatFits(candidates);
}

export const optOutAck = (practice: string) => withName(practice, (p) => `You will get no more texts from ${p}. Reply START to resume.`);

export const optInAck = (practice: string) => withName(practice, (p) => `Texts from ${p} are on again. ${OPT_OUT_HINT}`);

export function helpText(practice: string, phone: string | null): string {
  const call = phone ? `Call ${phone}` : 'Call the practice';
  return withName(practice, (p) => `${p}: questions about your visit? ${call}. ${OPT_OUT_HINT}`, (p) => `${p}: ${call}. ${OPT_OUT_HINT}`);
}

export const rescheduleAck = (practice: string) =>
  withName(practice, (p) => `Thanks. ${p} will call you to find a new time. ${OPT_OUT_HINT}`, (p) => `Thanks. ${p} will call you. ${OPT_OUT_HINT}`);

export const waitlistOfferText = (practice: string, when: string, location: string) =>
  withName(
    practice,
    (p) => `${p}: an earlier time is free, ${when} at ${location}. Reply YES to take it. ${OPT_OUT_HINT}`,
    (p) => `${p}: an earlier time is free, ${when}. Reply YES to take it. ${OPT_OUT_HINT}`,
  );

export const waitlistBookedText = (practice: string, when: string, location: string) =>
  withName(practice, (p) => `${p}: you are booked for ${when} at ${location}. ${OPT_OUT_HINT}`, (p) => `${p}: you are booked for ${when}. ${OPT_OUT_HINT}`);

export const waitlistGoneText = (practice: string) =>
  withName(practice, (p) => `${p}: sorry, that time has been taken. You stay on our waitlist. ${OPT_OUT_HINT}`, (p) => `${p}: sorry, that time has been taken. ${OPT_OUT_HINT}`);

/** A desk reply as sent: the text, with the opt-out hint added unless it already names an opt-out word. */
export function deskReplyText(body: string): string {
  const text = body.trim();
  return namesOptOutWord(text) ? text : `${text} ${OPT_OUT_HINT}`;
}
