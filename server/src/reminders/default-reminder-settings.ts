// The reminder settings a practice starts with (messaging.md "Reminder rules"): an e-mail with the visit
// as an .ics file when booked, a text 48 h before asking for a reply, a second one 24 h before only while
// the visit is unconfirmed. Texts name no tooth and no procedure (HHS FAQ 198; minimum necessary,
// 45 CFR 164.502(b)), each says how to opt out and fits one GSM-7 segment for the demo's longest names.
import type { ReminderSettings, TemplatePlaceholderName } from '@ostium/shared';

/** What {confirmHint} becomes in a text: the reply keywords of keywords.util.ts. */
export const CONFIRM_HINT_TEXT = 'Reply C to confirm, R to reschedule';
/** What {confirmHint} becomes in an e-mail, where replies are not read by the keyword handler. */
export const CONFIRM_HINT_EMAIL = 'Use the link below to confirm or to ask for another time';
/** What {optOut} becomes: STOP is an opt-out word (references.md "Messages"). */
export const OPT_OUT_TEXT = 'Reply STOP to opt out';

export const DEFAULT_REMINDER_SETTINGS: ReminderSettings = {
  rules: [
    {
      id: 'booking-email',
      label: 'E-mail when booked, with the calendar file',
      enabled: true,
      channel: 'email',
      trigger: 'on_booking',
      hoursBefore: null,
      onlyIfUnconfirmed: false,
      attachCalendar: true,
      templateId: 'booking-email',
    },
    {
      id: 'text-48h',
      label: 'Text 48 hours before, asking for a reply',
      enabled: true,
      channel: 'sms',
      trigger: 'before_visit',
      hoursBefore: 48,
      onlyIfUnconfirmed: false,
      attachCalendar: false,
      templateId: 'text-48h',
    },
    {
      id: 'text-24h',
      label: 'Text 24 hours before, if still unconfirmed',
      enabled: true,
      channel: 'sms',
      trigger: 'before_visit',
      hoursBefore: 24,
      onlyIfUnconfirmed: true,
      attachCalendar: false,
      templateId: 'text-24h',
    },
  ],
  templates: [
    {
      id: 'booking-email',
      label: 'Booking e-mail',
      channel: 'email',
      subject: '{practice}: your visit on {date} at {time}',
      body:
        'Your visit at {practice} is booked for {date} at {time}, at our {location} office.\n\n' +
        '{confirmHint}: {confirmLink}\n\n' +
        'The attached calendar file adds the visit to your calendar.',
    },
    {
      id: 'text-48h',
      label: 'Text 48 hours before',
      channel: 'sms',
      subject: null,
      body: '{practice}: your visit is {date} at {time}, {location}. {confirmHint}. {optOut}',
    },
    {
      id: 'text-24h',
      label: 'Text 24 hours before (unconfirmed)',
      channel: 'sms',
      subject: null,
      body: '{practice}: visit {date} at {time}, {location}. Confirm: {confirmLink} {optOut}',
    },
  ],
  // 47 CFR 64.1200(c)(1): no calls before 8 a.m. or after 9 p.m. at the called party's location.
  quietHours: { start: '08:00', end: '21:00' },
  // 47 CFR 64.1200(a)(9)(iv) health-care conditions (from memory, references.md): one a day, three a week.
  caps: { perDay: 1, perWeek: 3 },
  // Until the visit starts (the shared type's default).
  confirmLinkValidHours: 0,
  waitlistOfferMinutes: 30,
  waitlistOfferCount: 3,
};

export const PLACEHOLDER_MEANINGS: { name: TemplatePlaceholderName; meaning: string }[] = [
  { name: 'practice', meaning: 'the practice’s name' },
  { name: 'date', meaning: 'the visit’s date in the location’s time zone, e.g. “Thu 3 Dec”' },
  { name: 'time', meaning: 'the visit’s start time in the location’s time zone, e.g. “9:00 AM”' },
  { name: 'location', meaning: 'the name of the location (office) of the visit' },
  { name: 'confirmHint', meaning: `how to answer: in a text “${CONFIRM_HINT_TEXT}”, in an e-mail “${CONFIRM_HINT_EMAIL}”` },
  { name: 'optOut', meaning: `how to stop texts: “${OPT_OUT_TEXT}” (every text must say it)` },
  { name: 'confirmLink', meaning: 'a signed link to a small page where the patient confirms or asks for another time, valid until the visit starts (plus the link hours below)' },
];
