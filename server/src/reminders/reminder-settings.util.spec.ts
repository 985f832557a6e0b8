// Reminder settings checks. Sources: one segment is 160 GSM-7 / 70 UCS-2 characters (3GPP TS 23.038
// §6.2.1, TS 23.040); quiet hours 08:00–21:00 (47 CFR 64.1200(c)(1), verified per references.md); an
// opt-out in every text and one a day / three a week (47 CFR 64.1200(a)(9)(iv), from memory).
import type { ReminderSettings } from '@ostium/shared';
import { describe, expect, it } from 'vitest';
import { DEFAULT_REMINDER_SETTINGS } from './default-reminder-settings.js';
import { normalizeSettings, reminderSettingsProblems, textTemplateProblems } from './reminder-settings.util.js';

// The demo practice's names (seeds/demo/practice.json) and a local public address.
const NAMES = { practice: 'Quillfern Endodontics', locations: ['Riverside', 'Hilltop'], publicUrl: 'http://127.0.0.1:3000' };
const fields = (v: unknown) => reminderSettingsProblems(v, NAMES).map((p) => p.field);
const messages = (v: unknown) => reminderSettingsProblems(v, NAMES).map((p) => p.message);
const copy = (): ReminderSettings => structuredClone(DEFAULT_REMINDER_SETTINGS);

describe('DEFAULT_REMINDER_SETTINGS', () => {
  it('passes its own checks', () => {
    expect(reminderSettingsProblems(DEFAULT_REMINDER_SETTINGS, NAMES)).toEqual([]);
    expect(normalizeSettings(copy())).toEqual(DEFAULT_REMINDER_SETTINGS);
  });

  it('has the three rules of messaging.md: e-mail with .ics on booking, text 48 h, text 24 h only if unconfirmed', () => {
    expect(DEFAULT_REMINDER_SETTINGS.rules.map((r) => [r.id, r.channel, r.trigger, r.hoursBefore, r.onlyIfUnconfirmed, r.attachCalendar])).toEqual([
      ['booking-email', 'email', 'on_booking', null, false, true],
      ['text-48h', 'sms', 'before_visit', 48, false, false],
      ['text-24h', 'sms', 'before_visit', 24, true, false],
    ]);
    expect(DEFAULT_REMINDER_SETTINGS.quietHours).toEqual({ start: '08:00', end: '21:00' }); // 47 CFR 64.1200(c)(1)
    expect(DEFAULT_REMINDER_SETTINGS.caps).toEqual({ perDay: 1, perWeek: 3 }); // 47 CFR 64.1200(a)(9)(iv), from memory
    expect(DEFAULT_REMINDER_SETTINGS.waitlistOfferMinutes).toBe(30);
    expect(DEFAULT_REMINDER_SETTINGS.waitlistOfferCount).toBe(3);
  });

  it('texts fit one GSM-7 segment at their longest for the demo names, and say "Reply STOP to opt out"', () => {
    for (const t of DEFAULT_REMINDER_SETTINGS.templates.filter((x) => x.channel === 'sms')) {
      const { problems, longest } = textTemplateProblems(t.body, NAMES);
      expect(problems, t.id).toEqual([]);
      expect(longest!.length.encoding).toBe('GSM-7');
      expect(longest!.length.units).toBeLessThanOrEqual(160); // 3GPP TS 23.038: 160 septets
      expect(longest!.text).toContain('Reply STOP to opt out');
      expect(longest!.location).toBe('Riverside');
    }
  });

  it('carry no clinical detail: no tooth, procedure or difficulty words (HHS FAQ 198)', () => {
    for (const t of DEFAULT_REMINDER_SETTINGS.templates) {
      expect(`${t.subject ?? ''} ${t.body}`).not.toMatch(/tooth|canal|root|surgery|retreat|endodontic treatment|difficulty|procedure/i);
    }
  });
});

describe('reminderSettingsProblems', () => {
  it('names the rule field by position: rules.1.hoursBefore', () => {
    const s = copy();
    s.rules[1]!.hoursBefore = 0;
    expect(reminderSettingsProblems(s, NAMES)).toEqual([{ field: 'rules.1.hoursBefore', message: 'rules.1.hoursBefore must be a whole number of hours from 1 to 336' }]);
    s.rules[1]!.hoursBefore = 12.5;
    expect(fields(s)).toEqual(['rules.1.hoursBefore']);
    s.rules[1]!.hoursBefore = 337;
    expect(fields(s)).toEqual(['rules.1.hoursBefore']);
  });

  it('names the template field by id: an unknown placeholder, a missing opt-out, too long for one segment', () => {
    const s = copy();
    s.templates[1]!.body = '{practice}: tooth {tooth} on {date}. {optOut}';
    expect(messages(s)).toEqual(['templates.text-48h.body: unknown placeholder: {tooth}']);
    s.templates[1]!.body = '{practice}: visit {date} at {time}.';
    expect(messages(s)).toEqual(['templates.text-48h.body: a text must say how to opt out: add {optOut}']);
    s.templates[1]!.body = `{practice}: visit {date} at {time}, {location}. {confirmHint}. Call us at 202-555-0100 if anything changes. {confirmLink} {optOut}`;
    const [m] = messages(s);
    expect(fields(s)).toEqual(['templates.text-48h.body']);
    // By hand: 21 + 8 + 10 + 4 + 8 + 2 + 9 + 2 + 35 + 2 + 44 + 1 + 46 (21-character address + "/v/" + 22) + 1 + 21 = 214.
    expect(m).toMatch(/^templates\.text-48h\.body: too long for one text: 214 of 160 characters \(GSM-7\)/);
  });

  it('counts UCS-2 against 70 when a template needs characters outside GSM-7 (3GPP TS 23.038)', () => {
    const s = copy();
    s.templates[1]!.body = '{practice} ✅ {date} {time}. {optOut}'; // ✅ is not in the GSM-7 table
    // 21 + 3 + 10 + 1 + 8 + 2 + 21 = 66 UTF-16 units: fits 70.
    expect(fields(s)).toEqual([]);
    s.templates[1]!.body = '{practice} ✅ {date} {time}, {location}. {optOut}';
    // 66 + 2 + 9 = 77 > 70.
    expect(messages(s)).toEqual([expect.stringMatching(/^templates\.text-48h\.body: too long for one text: 77 of 70 characters \(UCS-2\)/)]);
  });

  it('judges the location with the worst encoding, not only the longest name', () => {
    const names = { ...NAMES, locations: ['Riverside Professional Centre', 'Hóll'] }; // ó is outside GSM-7
    const { longest } = textTemplateProblems('{practice} {location} {optOut}', names);
    expect(longest!.location).toBe('Hóll');
    expect(longest!.length).toMatchObject({ encoding: 'UCS-2', limit: 70 });
  });

  it('checks that a rule points at an existing template of its own channel', () => {
    const s = copy();
    s.rules[2]!.templateId = 'nope';
    s.rules[1]!.templateId = 'booking-email';
    expect(messages(s)).toEqual([
      'rules.1.templateId: template “booking-email” is for e-mail, the rule sends a text',
      'rules.2.templateId: there is no template “nope”',
    ]);
  });

  it('checks quiet hours: HH:MM, start before end, never wider than 08:00–21:00 (47 CFR 64.1200(c)(1))', () => {
    const s = copy();
    s.quietHours = { start: '8:00', end: '21:00' };
    expect(messages(s)).toEqual(['quietHours.start must be a time HH:MM (00:00–23:59)']);
    s.quietHours = { start: '12:00', end: '10:00' };
    expect(messages(s)).toEqual(['quietHours.end must be later than quietHours.start']);
    s.quietHours = { start: '07:30', end: '21:30' };
    expect(fields(s)).toEqual(['quietHours.start', 'quietHours.end']);
    s.quietHours = { start: '09:00', end: '20:00' };
    expect(fields(s)).toEqual([]);
  });

  it('checks caps are whole numbers of at least 1', () => {
    const s = copy();
    s.caps = { perDay: 0, perWeek: 2.5 };
    expect(messages(s)).toEqual(['caps.perDay must be a whole number from 1 to 5', 'caps.perWeek must be a whole number from 1 to 20']);
    s.caps = { perDay: 2, perWeek: 1 };
    expect(messages(s)).toEqual(['caps.perWeek must be at least caps.perDay']);
  });

  it('names unknown and missing fields at every level', () => {
    const s = copy() as unknown as Record<string, unknown>;
    s.colour = 'teal';
    delete s.waitlistOfferCount;
    (s.rules as Record<string, unknown>[])[0]!.tooth = '36';
    (s.templates as Record<string, unknown>[])[2]!.procedure = 'x';
    (s.quietHours as Record<string, unknown>).zone = 'UTC';
    expect(messages(s)).toEqual([
      'colour is not a known field',
      'waitlistOfferCount is missing',
      'templates.text-24h.procedure is not a known field',
      'rules.0.tooth is not a known field',
      'quietHours.zone is not a known field',
    ]);
  });

  it('checks ids, duplicates, types, the calendar only on e-mail and hoursBefore only before a visit', () => {
    const s = copy();
    s.rules[1]!.id = 'Text 48';
    s.rules[2]!.id = 'booking-email';
    s.rules[1]!.attachCalendar = true;
    s.rules[0]!.hoursBefore = 3;
    s.templates[2]!.id = 'text-48h';
    s.templates[1]!.subject = 'Hi';
    expect(messages(s)).toEqual([
      'templates.text-48h.subject must be null: a text has no subject',
      'templates.2.id “text-48h” is used by another template',
      'rules.0.hoursBefore must be null for a rule that fires on booking',
      'rules.1.id must be 1–40 lower-case letters, digits or dashes',
      'rules.1.attachCalendar: only an e-mail can carry a calendar file',
      'rules.2.id “booking-email” is used by another rule',
      // The second template was renamed, so the rule that used it now points at nothing.
      'rules.2.templateId: there is no template “text-24h”',
    ]);
    expect(reminderSettingsProblems(null, NAMES)).toEqual([{ field: 'settings', message: 'settings must be an object' }]);
  });

  it('checks e-mail templates for unknown placeholders too', () => {
    const s = copy();
    s.templates[0]!.subject = 'Your {procedure} visit';
    expect(messages(s)).toEqual(['templates.booking-email.subject: unknown placeholder: {procedure}']);
  });
});
