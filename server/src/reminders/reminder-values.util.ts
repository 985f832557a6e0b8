// What each template placeholder becomes for one visit, and the longest it can become (to judge a
// text's length before any visit exists). Dates and times read in the location's zone, en-US style.
import { formatPhone, type MessageChannel } from '@ostium/shared';
import { DateTime } from 'luxon';
import { VISIT_TOKEN_LENGTH, visitLink } from './confirm-link.util.js';
import { CONFIRM_HINT_EMAIL, CONFIRM_HINT_TEXT, OPT_OUT_TEXT } from './default-reminder-settings.js';
import type { TemplateValues } from './rules/index.js';

const LOCALE = 'en-US';
/** en-US weekday and month abbreviations are all three letters, so two-digit days and hours are the longest. */
export const LONGEST_DATE = 'Wed 30 Sep';
export const LONGEST_TIME = '12:30 PM';

/** "Thu 3 Dec" in the zone. */
export function visitDate(at: Date | number, zone: string): string {
  return DateTime.fromMillis(+at, { zone }).setLocale(LOCALE).toFormat('ccc d LLL');
}

/** "9:00 AM" in the zone. */
export function visitTime(at: Date | number, zone: string): string {
  return DateTime.fromMillis(+at, { zone }).setLocale(LOCALE).toFormat('h:mm a');
}

/** "Thu 3 Dec 2026, 9:00 AM" in the zone (e-mails and reasons, where the year helps). */
export function visitWhen(at: Date | number, zone: string): string {
  return DateTime.fromMillis(+at, { zone }).setLocale(LOCALE).toFormat("ccc d LLL yyyy', 'h:mm a");
}

export interface VisitValuesInput {
  channel: MessageChannel;
  practice: string;
  location: string;
  start: Date | number;
  zone: string;
  confirmLink: string;
}

export function placeholderValues(v: VisitValuesInput): TemplateValues {
  return {
    practice: v.practice,
    date: visitDate(v.start, v.zone),
    time: visitTime(v.start, v.zone),
    location: v.location,
    confirmHint: v.channel === 'sms' ? CONFIRM_HINT_TEXT : CONFIRM_HINT_EMAIL,
    optOut: OPT_OUT_TEXT,
    confirmLink: v.confirmLink,
  };
}

/** The names a practice's texts can carry: its own name, its locations' names and its public address. */
export interface PracticeNames {
  practice: string;
  locations: string[];
  publicUrl: string;
}

/** One set of the longest values per location (encodings differ, so each location is its own case). */
export function longestValues(names: PracticeNames, channel: MessageChannel): { location: string; values: TemplateValues }[] {
  const link = visitLink(names.publicUrl, 'x'.repeat(VISIT_TOKEN_LENGTH));
  const locations = names.locations.length ? names.locations : ['Main office'];
  return locations.map((location) => ({
    location,
    values: {
      practice: names.practice,
      date: LONGEST_DATE,
      time: LONGEST_TIME,
      location,
      confirmHint: channel === 'sms' ? CONFIRM_HINT_TEXT : CONFIRM_HINT_EMAIL,
      optOut: OPT_OUT_TEXT,
      confirmLink: link,
    },
  }));
}

/**
 * Fills the known placeholders in one pass (braces inside a value are never read again) and leaves
 * unknown ones as typed, so a preview can show where the problem is. E-mail has no opt-out rule, so it
 * is filled here rather than by renderTemplate.
 */
export function fillPlaceholders(template: string, values: TemplateValues): string {
  return template.replace(/\{([^{}]*)\}/g, (whole, name: string) => {
    const v = values[name.trim() as keyof TemplateValues];
    return v === undefined ? whole : v;
  });
}

/** "+12025550100" → "(202) 555-0100"; anything that is not a stored number is shown as it is. */
export function phoneForPeople(phone: string): string {
  try {
    return formatPhone(phone);
  } catch {
    return phone;
  }
}
