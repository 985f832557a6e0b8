// Reminders at send time, through the real outbox job (drainOnce with a fixed clock), the local SMS
// fake and the maildev inbox. Sources: quiet hours 08:00–21:00 (47 CFR 64.1200(c)(1), verified per
// references.md); one segment = 160 GSM-7 characters (3GPP TS 23.038/23.040); RFC 5545 for the .ics,
// read with ical.js (references.md "Calendars"); the link token scheme in confirm-link.util.ts.
import type { SmsFake } from '@ostium/sms-fake';
import ICAL from 'ical.js';
import { simpleParser } from 'mailparser';
import { Sequelize } from 'sequelize-typescript';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { MessagingClock } from '../src/messaging/messaging-clock.service.js';
import { OutboxMessageRow } from '../src/messaging/models/outbox-message.model.js';
import { OutboxDispatcherService } from '../src/messaging/outbox-dispatcher.service.js';
import { readVisitToken } from '../src/reminders/confirm-link.util.js';
import { ReminderComposerService } from '../src/reminders/reminder-composer.service.js';
import { ReminderPlannerService } from '../src/reminders/reminder-planner.service.js';
import { INBOX_URL, SMTP_PORT, waitForMail } from './helpers/mail-inbox.js';
import { startFake } from './helpers/outbox-fixture.js';
import { book, byRule, reminderPatient, wall } from './helpers/reminders-fixture.js';
import { schedulingFixture, type SchedulingFixture } from './helpers/scheduling-fixture.js';
import { createTestApp, testConfig, type TestApp } from './helpers/test-app.js';

const NY = 'America/New_York';

describe('reminders at send time', () => {
  let t: TestApp;
  let fake: SmsFake;
  let f: SchedulingFixture;
  let planner: ReminderPlannerService;
  let job: OutboxDispatcherService;
  let composer: ReminderComposerService;
  let now = new Date();

  const rowsOf = async (patientId: number) => byRule(await OutboxMessageRow.findAll({ where: { patientId }, order: [['id', 'ASC']] }));
  const textsTo = (phone: string) => fake.messages({ to: phone, direction: 'outbound-api' });
  const bookAt = async (clock: string, caseId: number, start: string, minutes = 60) => {
    now = new Date(clock);
    const end = new Date(Date.parse(start) + minutes * 60_000).toISOString();
    const appts = await book(t, caseId, [{ start, end, chairId: f.chair2, operatorId: f.operators[0]! }]);
    await planner.idle();
    return appts[0]!;
  };
  const drainAt = async (iso: string) => {
    now = new Date(iso);
    const r = await job.drainOnce(now);
    await fake.settled();
    return r;
  };

  beforeAll(async () => {
    fake = await startFake(testConfig());
    t = await createTestApp({ sms: { apiBase: fake.url }, mail: { ...testConfig().mail, host: '127.0.0.1', port: SMTP_PORT } });
    planner = t.app.get(ReminderPlannerService);
    job = t.app.get(OutboxDispatcherService);
    composer = t.app.get(ReminderComposerService);
    await planner.idle();
    // What the demo data queued stays out of these drains.
    await t.app.get(Sequelize).query("UPDATE outbox_messages SET status = 'cancelled' WHERE status = 'pending'");
    vi.spyOn(t.app.get(MessagingClock), 'now').mockImplementation(() => now);
    f = await schedulingFixture(t, 'Sendbay', 1);
  });
  afterAll(async () => {
    vi.restoreAllMocks();
    await t?.close();
    await fake?.close();
  });

  it('the booking e-mail arrives with the visit as an .ics file and a confirm link that reads back', async () => {
    const p = await reminderPatient(t, f.locationId, { phoneSuffix: 70 });
    // Booked Tue 1 Dec 2026 10:00 EST for Fri 4 Dec 10:00 EST (15:00Z).
    const a = await bookAt('2026-12-01T15:00:00Z', p.caseId, wall(NY, '2026-12-04', '10:00'), 90);
    const drained = await drainAt('2026-12-01T15:00:30Z');
    expect(drained.sent).toBeGreaterThanOrEqual(1);
    expect((await rowsOf(p.patientId))['booking-email']).toMatchObject({ status: 'sent' });
    const mail = await waitForMail((m) => m.to.some((x) => x.address === p.email));
    expect(mail, 'the booking e-mail reached the inbox').toBeTruthy();
    expect(mail!.subject).toBe('Quillfern Endodontics: your visit on Fri 4 Dec at 10:00 AM');
    const res = await fetch(`${INBOX_URL}/api/email/${mail!.id}/source`);
    const parsed = await simpleParser(Buffer.from(await res.arrayBuffer()));
    const text = parsed.text ?? '';
    expect(text).toContain('Your visit at Quillfern Endodontics is booked for Fri 4 Dec at 10:00 AM, at our Sendbay office.');
    expect(text).toContain('Where: Sendbay, Sendbay Clinic Building');
    expect(text).toContain('call Quillfern Endodontics at (202) 555-0100'); // seeds/demo/practice.json
    expect(text).toContain('reply STOP to any text to opt out');
    expect(text).not.toMatch(/tooth|canal|initial treatment|\b36\b/i);
    const token = /\/v\/([A-Za-z0-9_-]{22})\b/.exec(text)?.[1];
    expect(token, 'a confirm link in the e-mail').toBeTruthy();
    // Valid until the visit's start (confirmLinkValidHours 0), for this visit.
    expect(readVisitToken(t.config.messaging.linkSecret, token!, Date.parse(a.start) - 1)).toEqual({ appointmentId: a.id, expiresAt: new Date(a.start) });
    expect(readVisitToken(t.config.messaging.linkSecret, token!, Date.parse(a.start))).toEqual({ error: 'expired' });

    const ics = parsed.attachments.find((x) => x.filename === 'visit.ics');
    expect(ics, 'the .ics attachment').toBeTruthy();
    expect(ics!.contentType).toBe('text/calendar');
    const cal = new ICAL.Component(ICAL.parse(ics!.content.toString('utf8')));
    // RFC 5545 §3.7.3–3.7.4, §3.6.1: VERSION 2.0, a PRODID, one UID and one DTSTAMP per VEVENT.
    expect(cal.getFirstPropertyValue('version')).toBe('2.0');
    expect(cal.getFirstPropertyValue('prodid')).toBeTruthy();
    expect(cal.getFirstPropertyValue('method')).toBe('PUBLISH');
    const [event] = cal.getAllSubcomponents('vevent');
    expect(event!.getAllProperties('uid')).toHaveLength(1);
    expect(event!.getAllProperties('dtstamp')).toHaveLength(1);
    const e = new ICAL.Event(event!);
    expect(e.startDate.toJSDate().toISOString()).toBe('2026-12-04T15:00:00.000Z');
    expect(e.endDate.toJSDate().toISOString()).toBe('2026-12-04T16:30:00.000Z');
    expect(e.summary).toBe('Appointment at Quillfern Endodontics');
    expect(e.location).toMatch(/^Quillfern Endodontics, Sendbay, Sendbay Clinic Building/);
  });

  it('the 48 h text goes at its time with the visit’s local date, time and place', async () => {
    const p = await reminderPatient(t, f.locationId, { phoneSuffix: 71 });
    // Visit Mon 7 Dec 09:00 EST (14:00Z); 48 h → Sat 5 Dec 14:00Z.
    await bookAt('2026-12-02T15:00:00Z', p.caseId, wall(NY, '2026-12-07', '09:00'));
    await drainAt('2026-12-05T13:59:00Z');
    expect(textsTo(p.phone)).toEqual([]);
    await drainAt('2026-12-05T14:00:00Z');
    const [sms] = textsTo(p.phone);
    // 21 + 16 + 9 ("Mon 7 Dec") + 4 + 7 ("9:00 AM") + 2 + 7 ("Sendbay") + 2 + 35 + 2 + 21 = 126 characters.
    expect(sms!.body).toBe('Quillfern Endodontics: your visit is Mon 7 Dec at 9:00 AM, Sendbay. Reply C to confirm, R to reschedule. Reply STOP to opt out');
    expect(sms!.body).toHaveLength(126);
    expect(sms!.encoding).toBe('GSM-7');
    expect(sms!.numSegments).toBe(1);
    expect((await rowsOf(p.patientId))['text-48h']).toMatchObject({ status: 'sent', body: sms!.body });
  });

  it('no text consent: the row is skipped with the reason and nothing is sent', async () => {
    const p = await reminderPatient(t, f.locationId, { phoneSuffix: 72, consent: false });
    // Visit Tue 8 Dec 11:00 EST (16:00Z); 48 h → Sun 6 Dec 16:00Z.
    await bookAt('2026-12-02T15:00:00Z', p.caseId, wall(NY, '2026-12-08', '11:00'));
    expect((await rowsOf(p.patientId))['text-48h']).toMatchObject({ status: 'pending' });
    await drainAt('2026-12-06T16:00:00Z');
    expect((await rowsOf(p.patientId))['text-48h']).toMatchObject({ status: 'skipped', deferReason: 'no text consent' });
    expect(textsTo(p.phone)).toEqual([]);
  });

  it('cancelled a second before its reminder is due: nothing is sent', async () => {
    const p = await reminderPatient(t, f.locationId, { phoneSuffix: 73 });
    // Visit Wed 9 Dec 13:00 EST (18:00Z); 48 h → Mon 7 Dec 18:00Z.
    const a = await bookAt('2026-12-02T15:00:00Z', p.caseId, wall(NY, '2026-12-09', '13:00'));
    const row48 = (await rowsOf(p.patientId))['text-48h']!;
    expect(row48.dueAt.toISOString()).toBe('2026-12-07T18:00:00.000Z');
    now = new Date('2026-12-07T17:59:59Z');
    const res = await (await t.as('frontdesk')).patch(`/api/appointments/${a.id}`).send({ state: 'cancelled', reason: 'patient called', version: a.version });
    expect(res.status).toBe(200);
    await planner.idle();
    await drainAt('2026-12-07T18:00:00Z');
    expect(textsTo(p.phone)).toEqual([]);
    expect((await rowsOf(p.patientId))['text-48h']).toMatchObject({ status: 'cancelled', deferReason: 'the visit was cancelled' });
    // Had the cancellation's event been lost, the composer would still find the visit cancelled at send time.
    await row48.reload();
    expect(await composer.compose(row48, new Date('2026-12-07T18:00:00Z'))).toEqual({ action: 'cancel', reason: 'the visit was cancelled' });
  });

  it('cancelled behind the event’s back (straight in the database): the job re-reads it and cancels the row', async () => {
    const p = await reminderPatient(t, f.locationId, { phoneSuffix: 74 });
    // Visit Thu 10 Dec 13:00 EST (18:00Z); 48 h → Tue 8 Dec 18:00Z.
    const a = await bookAt('2026-12-02T15:00:00Z', p.caseId, wall(NY, '2026-12-10', '13:00'));
    await t.app.get(Sequelize).query("UPDATE appointments SET state = 'cancelled' WHERE id = :id", { replacements: { id: a.id } });
    await drainAt('2026-12-08T18:00:00Z');
    expect(textsTo(p.phone)).toEqual([]);
    expect((await rowsOf(p.patientId))['text-48h']).toMatchObject({ status: 'cancelled', deferReason: 'the visit was cancelled' });
  });

  it('booked 30 minutes ahead: the 48 h text goes at once, the 24 h one is a logged skip', async () => {
    const p = await reminderPatient(t, f.locationId, { phoneSuffix: 75 });
    // Now Fri 11 Dec 14:30 EST (19:30Z); visit 15:00 EST (20:00Z).
    await bookAt('2026-12-11T19:30:00Z', p.caseId, wall(NY, '2026-12-11', '15:00'));
    const rows = await rowsOf(p.patientId);
    expect(rows['text-48h']).toMatchObject({ status: 'pending', deferReason: 'booked 30 minutes before the visit: sent at once' });
    expect(rows['text-24h']).toMatchObject({ status: 'skipped', deferReason: 'booked 30 minutes before the visit: no allowed time for this reminder before it' });
    await drainAt('2026-12-11T19:30:05Z');
    const sent = textsTo(p.phone);
    expect(sent.map((m) => m.body)).toEqual(['Quillfern Endodontics: your visit is Fri 11 Dec at 3:00 PM, Sendbay. Reply C to confirm, R to reschedule. Reply STOP to opt out']);
  });

  it('moved: the text carries the new time; moved behind the event’s back, the job waits for the new time', async () => {
    const desk = await t.as('frontdesk');
    const p = await reminderPatient(t, f.locationId, { phoneSuffix: 76 });
    // Visit Thu 17 Dec 10:00 EST; moved to Fri 18 Dec 14:00 EST (19:00Z): 48 h → Wed 16 Dec 19:00Z.
    const a = await bookAt('2026-12-12T15:00:00Z', p.caseId, wall(NY, '2026-12-17', '10:00'));
    const moved = await desk.patch(`/api/appointments/${a.id}`).send({ start: wall(NY, '2026-12-18', '14:00'), end: wall(NY, '2026-12-18', '15:00'), version: a.version });
    expect(moved.status).toBe(200);
    await planner.idle();
    await drainAt('2026-12-15T15:00:00Z'); // the old 48 h time: nothing
    expect(textsTo(p.phone)).toEqual([]);
    await drainAt('2026-12-16T19:00:00Z');
    expect(textsTo(p.phone).map((m) => m.body)).toEqual(['Quillfern Endodontics: your visit is Fri 18 Dec at 2:00 PM, Sendbay. Reply C to confirm, R to reschedule. Reply STOP to opt out']);

    const q = await reminderPatient(t, f.locationId, { phoneSuffix: 77 });
    // Visit Sat 19 Dec 09:00 EST (14:00Z); 48 h → Thu 17 Dec 14:00Z. Then moved a day later in the table only.
    const b = await bookAt('2026-12-12T15:00:00Z', q.caseId, wall(NY, '2026-12-19', '09:00'));
    await t.app.get(Sequelize).query('UPDATE appointments SET start = :start, end = :end WHERE id = :id', {
      replacements: { start: new Date(wall(NY, '2026-12-20', '09:00')), end: new Date(wall(NY, '2026-12-20', '10:00')), id: b.id },
    });
    await drainAt('2026-12-17T14:00:00Z');
    expect(textsTo(q.phone)).toEqual([]);
    const row = (await rowsOf(q.patientId))['text-48h']!;
    expect(row).toMatchObject({ status: 'pending', deferReason: 'the visit moved to Sun 20 Dec 2026, 9:00 AM' });
    expect(row.dueAt.toISOString()).toBe('2026-12-18T14:00:00.000Z');
  });

  it('the 24 h text is skipped once the visit is confirmed; when unconfirmed it carries a link valid until the visit', async () => {
    const desk = await t.as('frontdesk');
    const p = await reminderPatient(t, f.locationId, { phoneSuffix: 78 });
    const q = await reminderPatient(t, f.locationId, { phoneSuffix: 79 });
    // Visits Tue 22 Dec 10:00 and 11:30 EST; 24 h → Mon 21 Dec 15:00Z and 16:30Z.
    const a = await bookAt('2026-12-14T15:00:00Z', p.caseId, wall(NY, '2026-12-22', '10:00'));
    const b = await bookAt('2026-12-14T15:00:00Z', q.caseId, wall(NY, '2026-12-22', '11:30'));
    expect((await desk.patch(`/api/appointments/${a.id}`).send({ state: 'confirmed', version: a.version })).status).toBe(200);
    await planner.idle();
    await drainAt('2026-12-20T16:30:00Z'); // the 48 h texts
    await drainAt('2026-12-21T16:30:00Z');
    expect((await rowsOf(p.patientId))['text-24h']).toMatchObject({ status: 'skipped', deferReason: 'already confirmed' });
    const bodies = textsTo(q.phone).map((m) => m.body);
    const last = bodies[bodies.length - 1]!;
    const m = /^Quillfern Endodontics: visit Tue 22 Dec at 11:30 AM, Sendbay\. Confirm: (http:\/\/127\.0\.0\.1:\d+)\/v\/([A-Za-z0-9_-]{22}) Reply STOP to opt out$/.exec(last);
    expect(m, last).toBeTruthy();
    expect(m![1]).toBe(t.config.publicUrl);
    expect(readVisitToken(t.config.messaging.linkSecret, m![2]!, Date.parse('2026-12-21T16:30:00Z'))).toEqual({ appointmentId: b.id, expiresAt: new Date(b.start) });
    expect(last.length).toBeLessThanOrEqual(160);
  });
});
