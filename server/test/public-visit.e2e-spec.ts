import type { Connection } from 'mariadb';
import { DateTime } from 'luxon';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeVisitToken } from '../src/reminders/confirm-link.util.js';
import { connect } from './helpers/outbox-fixture.js';
import { repliesWorld, setClock, textingNow, type RepliesWorld } from './helpers/replies-fixture.js';
import { plusDays, ZONE } from './helpers/scheduling-fixture.js';
import { createTestApp, type TestApp } from './helpers/test-app.js';

// HHS FAQ 198 (references.md "Messages"): the page discloses only what confirms the appointment.
const VIEW_KEYS = ['canAskToReschedule', 'canConfirm', 'locationName', 'practiceName', 'practicePhone', 'start', 'state', 'when'];

describe('public visit page', () => {
  let t: TestApp;
  let w: RepliesWorld;
  let db: Connection;
  let day = 0;
  let now: Date;

  const visit = async () => {
    const p = await w.patient();
    const appt = await w.book(p.caseId, plusDays(w.f.monday, day++), '10:00', '11:00');
    return { p, appt, token: makeVisitToken(t.config.messaging.linkSecret, appt.id, new Date(appt.start)) };
  };
  const page = (token: string) => t.http().get(`/api/public/visits/${token}`);
  const act = (token: string, action: string) => t.http().post(`/api/public/visits/${token}`).send({ action });
  const row = async (id: number) => ((await db.query('SELECT state, version, confirmed_via FROM appointments WHERE id = ?', [id])) as { state: string; version: number; confirmed_via: string | null }[])[0]!;

  beforeAll(async () => {
    t = await createTestApp();
    now = textingNow();
    setClock(t, now);
    w = await repliesWorld(t, 'Linkwater', '415');
    db = await connect(t.config);
  });
  afterAll(async () => {
    await db?.end();
    await t?.close();
  });

  it('shows, without sign-in, only the practice, its phone, the location and the local date and time', async () => {
    const { p, appt, token } = await visit();
    const res = await page(token);
    expect(res.status).toBe(200);
    expect(Object.keys(res.body).sort()).toEqual(VIEW_KEYS);
    const when = DateTime.fromISO(appt.start).setZone(ZONE).setLocale('en-US');
    expect(res.body).toEqual({
      practiceName: 'Quillfern Endodontics',
      practicePhone: '(202) 555-0100',
      locationName: 'Linkwater',
      when: `${when.toFormat('cccc d LLLL yyyy')}, ${when.toFormat('h:mm a')}`,
      start: appt.start,
      state: 'booked',
      canConfirm: true,
      canAskToReschedule: true,
    });
    // Nothing else of the patient: no name, number, e-mail, tooth or procedure anywhere in the answer.
    const text = JSON.stringify(res.body);
    for (const secret of [p.name.split(' ')[1]!, p.phone, p.phone.slice(2), 'Ansel', '@example.com', 'initial', '"14"']) expect(text).not.toContain(secret);
  });

  it('confirms once (confirmed_via link, version + 1); a second confirm is refused and changes nothing', async () => {
    const { appt, token } = await visit();
    const res = await act(token, 'confirm');
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(Object.keys(res.body).sort()).toEqual(VIEW_KEYS);
    expect(res.body).toMatchObject({ state: 'confirmed', canConfirm: false, canAskToReschedule: true });
    expect(await row(appt.id)).toEqual({ state: 'confirmed', version: appt.version + 1, confirmed_via: 'link' });
    const again = await act(token, 'confirm');
    expect(again.status).toBe(409);
    expect(again.body).toEqual({ statusCode: 409, message: 'This visit is already confirmed. Thank you.' });
    expect((await row(appt.id)).version).toBe(appt.version + 1);
    expect((await page(token)).body).toMatchObject({ state: 'confirmed', canConfirm: false });
    // The front desk sees it in the patient's thread.
    const [m] = (await db.query('SELECT channel, kind, effect, from_address FROM inbound_messages WHERE appointment_id = ?', [appt.id])) as Record<string, string>[];
    expect(m).toMatchObject({ channel: 'link', kind: 'confirm', from_address: 'visit link' });
    expect(m!.effect).toMatch(/^Confirmed the visit on .+ at Linkwater \(visit link\)$/);
  });

  it('five confirms at the same moment: one succeeds, the visit changes once', async () => {
    const { appt, token } = await visit();
    const codes = (await Promise.all(Array.from({ length: 5 }, () => act(token, 'confirm')))).map((r) => r.status).sort();
    expect(codes).toEqual([200, 409, 409, 409, 409]);
    expect(await row(appt.id)).toEqual({ state: 'confirmed', version: appt.version + 1, confirmed_via: 'link' });
  });

  it('asks to reschedule once: a task for the front desk, then the page says so and offers nothing', async () => {
    const { p, appt, token } = await visit();
    const res = await act(token, 'reschedule');
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ state: 'reschedule_requested', canConfirm: false, canAskToReschedule: false });
    const tasks = (await db.query('SELECT kind, detail, appointment_id FROM desk_tasks WHERE patient_id = ?', [p.patientId])) as Record<string, unknown>[];
    expect(tasks).toHaveLength(1);
    expect(tasks[0]).toMatchObject({ kind: 'reschedule_request', appointment_id: appt.id });
    expect(String(tasks[0]!.detail)).toMatch(/^Asks to reschedule the visit on \w{3} \d{1,2} \w{3} 10:00 AM at Linkwater \(visit page\)$/);
    const again = await act(token, 'reschedule');
    expect(again.status).toBe(409);
    expect(again.body.message).toBe('You have asked for another time; Quillfern Endodontics will call you.');
    expect((await act(token, 'confirm')).status).toBe(409);
    expect((await row(appt.id)).state).toBe('booked');
  });

  it('says a cancelled visit was cancelled and offers nothing', async () => {
    const { appt, token } = await visit();
    const desk = await t.as('frontdesk');
    expect((await desk.patch(`/api/appointments/${appt.id}`).send({ version: appt.version, state: 'cancelled', reason: 'patient moved away' })).status).toBe(200);
    expect((await page(token)).body).toMatchObject({ state: 'cancelled', canConfirm: false, canAskToReschedule: false });
    const res = await act(token, 'confirm');
    expect(res.status).toBe(409);
    expect(res.body.message).toBe('This visit was cancelled. To book a new time, call Quillfern Endodontics at (202) 555-0100.');
    expect((await row(appt.id)).state).toBe('cancelled');
  });

  it('says a past visit is past and offers nothing', async () => {
    const { appt } = await visit();
    const token = makeVisitToken(t.config.messaging.linkSecret, appt.id, Date.parse(appt.start) + 86_400_000);
    setClock(t, new Date(Date.parse(appt.start) + 3_600_000));
    try {
      expect((await page(token)).body).toMatchObject({ state: 'past', canConfirm: false, canAskToReschedule: false });
      const res = await act(token, 'reschedule');
      expect(res.status).toBe(409);
      expect(res.body.message).toBe('This visit is in the past. For anything else, call Quillfern Endodontics at (202) 555-0100.');
    } finally {
      setClock(t, now);
    }
    expect((await row(appt.id)).state).toBe('booked');
  });

  it('answers an expired link with 410 and a bad one with 404, in plain words', async () => {
    const { appt, token } = await visit();
    const expired = makeVisitToken(t.config.messaging.linkSecret, appt.id, now.getTime() - 1000);
    for (const res of [await page(expired), await act(expired, 'confirm')]) {
      expect(res.status).toBe(410);
      expect(res.body).toEqual({ statusCode: 410, message: 'This link has expired. Please call the practice about your visit.' });
    }
    const forged = makeVisitToken('another-secret-of-someone-else', appt.id, new Date(appt.start));
    const flipped = token.slice(0, -1) + (token.endsWith('A') ? 'B' : 'A');
    const missing = makeVisitToken(t.config.messaging.linkSecret, 9_999_999, new Date(appt.start));
    for (const bad of [forged, flipped, missing, 'not-a-token', 'x'.repeat(300)]) {
      const res = await page(bad);
      expect(res.status, bad).toBe(404);
      expect(res.body).toEqual({ statusCode: 404, message: 'This link is not valid. Check the link in your message, or call the practice.' });
    }
    expect((await row(appt.id)).state).toBe('booked');
  });

  it('names a bad action', async () => {
    const { token } = await visit();
    const res = await act(token, 'cancel');
    expect(res.status).toBe(400);
    expect(res.body.errors).toEqual([{ field: 'action', message: 'action must be one of confirm, reschedule' }]);
    expect((await t.http().post(`/api/public/visits/${token}`).send({ action: 'confirm', note: 'hi' })).body.errors).toEqual([{ field: 'note', message: 'note is not a known field' }]);
  });
});

describe('public visit page rate limit', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp({ loginRateLimit: { limit: 3, ttlMs: 60_000 } }, { seed: false });
  });
  afterAll(async () => t?.close());

  it('limits calls from one address like sign-in does', async () => {
    const codes: number[] = [];
    for (let i = 0; i < 5; i++) codes.push((await t.http().get('/api/public/visits/not-a-token')).status);
    expect(codes).toEqual([404, 404, 404, 429, 429]);
  });
});
