import { describe, expect, it } from 'vitest';
import { formPath, freshId, insertAt, isShownPath, newRule, newTemplate, serverErrors, validateSettings } from './reminder-settings.util';
import { settings } from './test/reminder-settings.fixtures';

describe('insertAt', () => {
  it('inserts at the cursor and puts the cursor after the token', () => {
    expect(insertAt('visit  at', 6, 6, '{date}')).toEqual({ text: 'visit {date} at', cursor: 12 });
  });
  it('replaces a selection', () => {
    expect(insertAt('visit TODAY at', 6, 11, '{date}')).toEqual({ text: 'visit {date} at', cursor: 12 });
  });
  it('clamps a cursor past the end to the end', () => {
    expect(insertAt('abc', 10, 12, '{x}')).toEqual({ text: 'abc{x}', cursor: 6 });
  });
});

describe('formPath and serverErrors', () => {
  it('reads the server’s paths as the form’s', () => {
    expect(formPath('settings.rules.0.hoursBefore')).toBe('rules.0.hoursBefore');
    expect(formPath('settings.rules[2].templateId')).toBe('rules.2.templateId');
    expect(formPath('quietHours.start')).toBe('quietHours.start');
  });
  it('joins two messages for one field', () => {
    expect(serverErrors([{ field: 'settings.caps.perDay', message: 'a' }, { field: 'caps.perDay', message: 'b' }])).toEqual({ 'caps.perDay': 'a; b' });
  });
  it('drops the path the server puts at the start of its message, since the field shows where', () => {
    // The server's wording (server/src/reminders/reminder-settings.util.ts).
    expect(
      serverErrors([
        { field: 'rules.1.hoursBefore', message: 'rules.1.hoursBefore must be a whole number of hours from 1 to 336' },
        { field: 'quietHours.end', message: 'quietHours.end: texts may not go after 21:00 (47 CFR 64.1200(c)(1))' },
        { field: 'caps.perWeek', message: 'caps.perWeek must be at least caps.perDay' },
      ]),
    ).toEqual({
      'rules.1.hoursBefore': 'must be a whole number of hours from 1 to 336',
      'quietHours.end': 'texts may not go after 21:00 (47 CFR 64.1200(c)(1))',
      'caps.perWeek': 'must be at least caps.perDay',
    });
  });
  it('knows which paths have a field on the page', () => {
    const s = settings();
    expect(isShownPath('rules.1.hoursBefore', s)).toBe(true);
    expect(isShownPath('rules.9.hoursBefore', s)).toBe(false);
    expect(isShownPath('templates.0.body', s)).toBe(true);
    expect(isShownPath('templates.0.id', s)).toBe(false);
    expect(isShownPath('caps.perWeek', s)).toBe(true);
    expect(isShownPath('retention', s)).toBe(false);
  });
});

describe('validateSettings', () => {
  it('accepts the defaults of design/messaging.md', () => {
    expect(validateSettings(settings())).toEqual({});
  });
  it('catches the plain slips', () => {
    const s = settings();
    s.rules[1]!.hoursBefore = 0;
    s.rules[2]!.templateId = 'booked-email';
    s.templates[1]!.subject = ' ';
    s.quietHours = { start: '21:00', end: '08:00' };
    s.caps = { perDay: 2, perWeek: 1 };
    expect(validateSettings(s)).toEqual({
      'rules.1.hoursBefore': 'Whole hours, 1 to 336',
      'rules.2.templateId': 'This is an e-mail template',
      'templates.1.subject': 'An e-mail needs a subject',
      'quietHours.end': 'Must be later than the start',
      'caps.perWeek': 'At least the daily cap',
    });
  });
  it('refuses a time that is not HH:MM', () => {
    const s = settings();
    s.quietHours.start = '8am';
    expect(validateSettings(s)).toEqual({ 'quietHours.start': 'A time, HH:MM' });
  });
});

describe('new rules and templates', () => {
  it('gets ids that are free and fit the outbox key', () => {
    expect(freshId('rule', ['rule-1', 'rule-2'])).toBe('rule-3');
    const s = settings();
    const r = newRule(s);
    expect(r.id).toMatch(/^[a-z0-9-]+$/);
    expect(r).toMatchObject({ enabled: false, channel: 'sms', templateId: 'reminder-text', trigger: 'before_visit', hoursBefore: 24 });
    const t = newTemplate(s, 'email');
    expect(t).toMatchObject({ id: 'email-1', channel: 'email' });
    expect(validateSettings({ ...s, rules: [...s.rules, r], templates: [...s.templates, t] })).toEqual({});
  });
});
