import type { ReminderSettings, ReminderSettingsResponse, TemplatePreviewResponse } from '@ostium/shared';

// Settings in the server's shape, close to the defaults of design/messaging.md: an e-mail with a calendar
// file when booked, a text 48 h before, a second 24 h before if still unconfirmed.
export function settings(): ReminderSettings {
  return {
    rules: [
      { id: 'booked-email', label: 'Booking e-mail', enabled: true, channel: 'email', trigger: 'on_booking', hoursBefore: null, onlyIfUnconfirmed: false, attachCalendar: true, templateId: 'booked-email' },
      { id: 'text-48h', label: 'Text 48 h before', enabled: true, channel: 'sms', trigger: 'before_visit', hoursBefore: 48, onlyIfUnconfirmed: false, attachCalendar: false, templateId: 'reminder-text' },
      { id: 'text-24h', label: 'Text 24 h before', enabled: true, channel: 'sms', trigger: 'before_visit', hoursBefore: 24, onlyIfUnconfirmed: true, attachCalendar: false, templateId: 'reminder-text' },
    ],
    templates: [
      { id: 'reminder-text', label: 'Reminder text', channel: 'sms', subject: null, body: '{practice}: visit {date} {time} at {location}. {confirmHint} {optOut}' },
      { id: 'booked-email', label: 'Booking e-mail', channel: 'email', subject: 'Your visit at {practice}', body: 'Your visit is on {date} at {time}, {location}.\n\n{confirmLink}' },
    ],
    quietHours: { start: '08:00', end: '21:00' },
    caps: { perDay: 1, perWeek: 3 },
    confirmLinkValidHours: 0,
    waitlistOfferMinutes: 30,
    waitlistOfferCount: 3,
  };
}

export function response(version = 2, over: Partial<ReminderSettings> = {}): ReminderSettingsResponse {
  return {
    settings: { ...settings(), ...over },
    version,
    updatedAt: '2026-12-01T15:00:00.000Z',
    updatedBy: 'Alex Admin',
    placeholders: [
      { name: 'practice', meaning: 'The practice’s name' },
      { name: 'date', meaning: 'The visit’s day, e.g. Thu 3 Dec' },
      { name: 'time', meaning: 'The visit’s local start time' },
      { name: 'location', meaning: 'The location’s name' },
      { name: 'confirmHint', meaning: 'How to confirm: Reply C to confirm, R for another time' },
      { name: 'optOut', meaning: 'How to opt out: STOP to opt out' },
      { name: 'confirmLink', meaning: 'The signed link to the visit page' },
    ],
  };
}

export function preview(over: Partial<TemplatePreviewResponse> = {}): TemplatePreviewResponse {
  const text = 'Quillfern Endodontics: visit Thu 3 Dec 09:30 at Riverside. Reply C to confirm, R for another time. STOP to opt out.';
  return { subject: null, text, encoding: 'GSM-7', characters: text.length, limit: 160, segments: 1, fitsOneSegment: true, problems: [], ...over };
}
