// Settings → Reminders over HTTP. Sources: one text is 160 GSM-7 / 70 UCS-2 characters (3GPP TS 23.038
// §6.2.1 alphabet, TS 23.040 segment sizes); quiet hours 08:00–21:00 (47 CFR 64.1200(c)(1), verified per
// references.md); an opt-out in every text (47 CFR 64.1200(a)(9)(iv), from memory).
import type { ReminderSettings, ReminderSettingsResponse } from '@ostium/shared';
import { DateTime } from 'luxon';
import { QueryTypes } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEFAULT_REMINDER_SETTINGS } from '../src/reminders/default-reminder-settings.js';
import { createTestApp, type TestApp } from './helpers/test-app.js';

describe('reminder settings API', () => {
  let t: TestApp;
  let db: Sequelize;
  const copy = (): ReminderSettings => structuredClone(DEFAULT_REMINDER_SETTINGS);

  beforeAll(async () => {
    t = await createTestApp();
    db = t.app.get(Sequelize);
  });
  afterAll(async () => t?.close());

  const rowCount = async () => Number((await db.query<{ n: number }>('SELECT COUNT(*) AS n FROM reminder_settings', { type: QueryTypes.SELECT }))[0]!.n);

  it('GET creates the row from the defaults on first read and answers ReminderSettingsResponse', async () => {
    expect(await rowCount()).toBe(0);
    const manager = await t.as('manager');
    const res = await manager.get('/api/settings/reminders');
    expect(res.status).toBe(200);
    const body = res.body as ReminderSettingsResponse;
    expect(body.settings).toEqual(DEFAULT_REMINDER_SETTINGS);
    expect(body.version).toBe(1);
    expect(body.updatedBy).toBeNull();
    expect(body.placeholders.map((p) => p.name)).toEqual(['practice', 'date', 'time', 'location', 'confirmHint', 'optOut', 'confirmLink']);
    expect(await rowCount()).toBe(1);
    expect((await manager.get('/api/settings/reminders')).body.version).toBe(1);
    expect(await rowCount()).toBe(1);
  });

  it('is for admin and manager only (ACCESS.reminderSettings)', async () => {
    for (const role of ['frontdesk', 'endodontist', 'assistant'] as const) {
      const agent = await t.as(role);
      expect((await agent.get('/api/settings/reminders')).status).toBe(403);
      expect((await agent.put('/api/settings/reminders').send({ settings: copy(), version: 1 })).status).toBe(403);
      expect((await agent.post('/api/settings/reminders/preview').send({ channel: 'sms', body: 'x {optOut}' })).status).toBe(403);
    }
    expect((await (await t.as('admin')).get('/api/settings/reminders')).status).toBe(200);
  });

  it('PUT saves over the version read, bumps it, names who saved, and is audited', async () => {
    const manager = await t.as('manager');
    const before = (await manager.get('/api/settings/reminders')).body as ReminderSettingsResponse;
    const next = { ...copy(), quietHours: { start: '09:00', end: '20:00' } };
    const res = await manager.put('/api/settings/reminders').send({ settings: next, version: before.version });
    expect(res.status).toBe(200);
    expect(res.body.version).toBe(before.version + 1);
    expect(res.body.settings.quietHours).toEqual({ start: '09:00', end: '20:00' });
    expect(res.body.updatedBy).toBe('Petra Linnell'); // seeds/demo/practice.json manager
    expect(Date.parse(res.body.updatedAt)).not.toBeNaN();
    expect((await manager.get('/api/settings/reminders')).body.settings.quietHours).toEqual({ start: '09:00', end: '20:00' });

    const audit = await (await t.as('admin')).get('/api/audit').query({ entity: 'reminder_settings' });
    expect(audit.status).toBe(200);
    const update = audit.body.items.find((e: { action: string }) => e.action === 'update');
    expect(update).toMatchObject({ userEmail: 'manager@quillfern-endo.test', entity: 'reminder_settings' });
    expect(update.before.version).toBe(before.version);
    expect(update.after.version).toBe(before.version + 1);
    expect(update.after.settings.quietHours).toEqual({ start: '09:00', end: '20:00' });
  });

  it('PUT with a stale version is a 409 and changes nothing', async () => {
    const admin = await t.as('admin');
    const current = (await admin.get('/api/settings/reminders')).body as ReminderSettingsResponse;
    const stale = await admin.put('/api/settings/reminders').send({ settings: { ...copy(), caps: { perDay: 1, perWeek: 2 } }, version: current.version - 1 });
    expect(stale.status).toBe(409);
    expect(stale.body).toEqual({
      statusCode: 409,
      message: `The reminder settings were changed by someone else (version ${current.version}, you had ${current.version - 1}); reload them and try again`,
    });
    const after = (await admin.get('/api/settings/reminders')).body as ReminderSettingsResponse;
    expect(after.version).toBe(current.version);
    expect(after.settings.caps).toEqual(current.settings.caps);
  });

  /** PUTs `settings` over the current version; returns the 400's errors. */
  async function problems(settings: unknown) {
    const admin = await t.as('admin');
    const { version } = (await admin.get('/api/settings/reminders')).body as ReminderSettingsResponse;
    const res = await admin.put('/api/settings/reminders').send({ settings, version });
    expect(res.status, JSON.stringify(res.body)).toBe(400);
    expect(res.body.message).toBe(res.body.errors.map((e: { message: string }) => e.message).join('; '));
    return res.body.errors as { field: string; message: string }[];
  }

  it('400s name the field: a rule’s hours, a template’s placeholder, opt-out and length, a wrong-channel template', async () => {
    const a = copy();
    a.rules[1]!.hoursBefore = 0;
    expect(await problems(a)).toEqual([{ field: 'rules.1.hoursBefore', message: 'rules.1.hoursBefore must be a whole number of hours from 1 to 336' }]);

    const b = copy();
    b.templates[1]!.body = '{practice}: {procedure} on {date}. {optOut}';
    expect(await problems(b)).toEqual([{ field: 'templates.text-48h.body', message: 'templates.text-48h.body: unknown placeholder: {procedure}' }]);

    const c = copy();
    c.templates[2]!.body = '{practice}: visit {date} at {time}, {location}. {confirmLink}';
    expect(await problems(c)).toEqual([{ field: 'templates.text-24h.body', message: 'templates.text-24h.body: a text must say how to opt out: add {optOut}' }]);

    const d = copy();
    d.rules[2]!.templateId = 'booking-email';
    d.rules[1]!.templateId = 'missing';
    expect((await problems(d)).map((e) => e.field)).toEqual(['rules.1.templateId', 'rules.2.templateId']);
  });

  it('judges the length with the practice’s own longest location name and the configured public address', async () => {
    // By hand, at the longest with "Riverside" (the demo's longest location): "{practice}: visit {date} at {time},
    // {location}." is 21 + 8 + 10 + 4 + 8 + 2 + 9 + 1 = 63; " Please bring your insurance card. " 35; 31 x; " " 1;
    // "Reply STOP to opt out" 21: 151 of 160.
    const body = `{practice}: visit {date} at {time}, {location}. Please bring your insurance card. ${'x'.repeat(31)} {optOut}`;
    const s = copy();
    s.templates[1]!.body = body;
    const admin = await t.as('admin');
    let { version } = (await admin.get('/api/settings/reminders')).body as ReminderSettingsResponse;
    const ok = await admin.put('/api/settings/reminders').send({ settings: s, version });
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    version = ok.body.version;
    // A new location of 26 characters (17 more than "Riverside") makes the same template 168 long.
    const loc = await admin.post('/api/locations').send({ name: 'Riverside Annex North Wing', timeZone: 'America/New_York', openingHours: [{ weekday: 1, open: '08:00', close: '17:00' }] });
    expect(loc.status, JSON.stringify(loc.body)).toBe(201);
    const again = await admin.put('/api/settings/reminders').send({ settings: s, version });
    expect(again.status).toBe(400);
    expect(again.body.errors).toEqual([
      {
        field: 'templates.text-48h.body',
        message:
          'templates.text-48h.body: too long for one text: 168 of 160 characters (GSM-7) with the longest names (“Quillfern Endodontics”, “Riverside Annex North Wing”, a date like “Wed 30 Sep”, “12:30 PM” and the full link)',
      },
    ]);
  });

  it('400s for quiet hours, caps, unknown fields and a body that is not {settings, version}', async () => {
    const q = copy();
    q.quietHours = { start: '21:00', end: '08:00' };
    expect(await problems(q)).toEqual([{ field: 'quietHours.end', message: 'quietHours.end must be later than quietHours.start' }]);
    const q2 = copy();
    q2.quietHours = { start: '7:00', end: '22:00' };
    expect((await problems(q2)).map((e) => e.message)).toEqual([
      'quietHours.start must be a time HH:MM (00:00–23:59)',
      'quietHours.end: texts may not go after 21:00 (47 CFR 64.1200(c)(1))',
    ]);
    const caps = copy();
    caps.caps = { perDay: 0, perWeek: 1.5 };
    expect((await problems(caps)).map((e) => e.field)).toEqual(['caps.perDay', 'caps.perWeek']);
    const extra = { ...copy(), theme: 'dark' } as unknown;
    expect(await problems(extra)).toEqual([{ field: 'theme', message: 'theme is not a known field' }]);

    const admin = await t.as('admin');
    const noVersion = await admin.put('/api/settings/reminders').send({ settings: copy() });
    expect(noVersion.status).toBe(400);
    expect(noVersion.body.errors.map((e: { field: string }) => e.field)).toContain('version');
    const stray = await admin.put('/api/settings/reminders').send({ settings: copy(), version: 1, colour: 'teal' });
    expect(stray.status).toBe(400);
    expect(stray.body.errors).toContainEqual({ field: 'colour', message: 'colour is not a known field' });
  });

  describe('preview', () => {
    it('fills a text with the practice’s names and its next demo visit, counted as GSM-7', async () => {
      const manager = await t.as('manager');
      const body = DEFAULT_REMINDER_SETTINGS.templates[1]!.body;
      const res = await manager.post('/api/settings/reminders/preview').send({ channel: 'sms', body });
      expect(res.status).toBe(200);
      const [next] = await db.query<{ start: Date; name: string; time_zone: string }>(
        `SELECT a.start, l.name, l.time_zone FROM appointments a JOIN locations l ON l.id = a.location_id
          WHERE a.state IN ('booked', 'confirmed') AND a.start > NOW() ORDER BY a.start, a.id LIMIT 1`,
        { type: QueryTypes.SELECT },
      );
      expect(next, 'the demo data books visits').toBeTruthy();
      const local = DateTime.fromJSDate(new Date(next!.start), { zone: next!.time_zone }).setLocale('en-US');
      const text = `Quillfern Endodontics: your visit is ${local.toFormat('ccc d LLL')} at ${local.toFormat('h:mm a')}, ${next!.name}. Reply C to confirm, R to reschedule. Reply STOP to opt out`;
      expect(res.body).toEqual({ subject: null, text, encoding: 'GSM-7', characters: text.length, limit: 160, segments: 1, fitsOneSegment: true, problems: [] });
    });

    it('counts UCS-2 against 70 for an accented or emoji template, in UTF-16 units (3GPP TS 23.038)', async () => {
      const manager = await t.as('manager');
      // "á" is not in the GSM-7 table; "😀" is one character but two UTF-16 units.
      const res = await manager.post('/api/settings/reminders/preview').send({ channel: 'sms', body: 'Hola {practice} 😀: visita {date} a las {time}. Está bien? {optOut}' });
      expect(res.status).toBe(200);
      expect(res.body.encoding).toBe('UCS-2');
      expect(res.body.limit).toBe(70);
      expect(res.body.characters).toBe(res.body.text.length); // String length is UTF-16 units: the emoji counts 2
      expect(res.body.characters).toBe([...res.body.text].length + 1);
      expect(res.body.characters).toBeGreaterThan(70);
      // Above 70, UCS-2 segments hold 67 units each (3GPP TS 23.040).
      expect(res.body.segments).toBe(Math.ceil(res.body.characters / 67));
      expect(res.body.fitsOneSegment).toBe(false);
      expect(res.body.problems).toEqual([expect.stringMatching(/^too long for one text: \d+ of 70 characters \(UCS-2\)/)]);

      const short = await manager.post('/api/settings/reminders/preview').send({ channel: 'sms', body: '😀 {date} {optOut}' });
      expect(short.body).toMatchObject({ encoding: 'UCS-2', limit: 70, segments: 1, fitsOneSegment: true, problems: [] });
    });

    it('lists problems that would stop a save, and fills e-mail subjects', async () => {
      const manager = await t.as('manager');
      const bad = await manager.post('/api/settings/reminders/preview').send({ channel: 'sms', body: 'Tooth {tooth} on {date}' });
      expect(bad.status).toBe(200);
      expect(bad.body.text).toMatch(/^Tooth \{tooth\} on \w{3} \d{1,2} \w{3}$/);
      expect(bad.body.problems).toEqual(['unknown placeholder: {tooth}']);
      const email = await manager.post('/api/settings/reminders/preview').send({ channel: 'email', subject: '{practice}: your visit', body: 'See you on {date}: {confirmLink}' });
      expect(email.body.subject).toBe('Quillfern Endodontics: your visit');
      expect(email.body.text).toMatch(/^See you on \w{3} \d{1,2} \w{3}: http:\/\/127\.0\.0\.1:\d+\/v\/[A-Za-z0-9_-]{22}$/);
      expect(email.body.problems).toEqual([]);
      const wrong = await manager.post('/api/settings/reminders/preview').send({ channel: 'fax', body: 'x' });
      expect(wrong.status).toBe(400);
      expect(wrong.body.errors.map((e: { field: string }) => e.field)).toEqual(['channel']);
    });
  });
});
