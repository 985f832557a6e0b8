import type { SmsFake } from '@ostium/sms-fake';
import type { Connection } from 'mariadb';
import { DateTime } from 'luxon';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { WaitlistOffersService } from '../src/replies/waitlist-offers.service.js';
import { connect, startFake, waitFor } from './helpers/outbox-fixture.js';
import { drain, inbound, repliesWorld, setClock, textingNow, type PatientCase, type RepliesWorld } from './helpers/replies-fixture.js';
import { at, plusDays, ZONE } from './helpers/scheduling-fixture.js';
import { createTestApp, testConfig, type TestApp } from './helpers/test-app.js';

const PRACTICE = 'Quillfern Endodontics';
const TAKEN = `${PRACTICE}: sorry, that time has been taken. You stay on our waitlist. Reply STOP to opt out.`;

interface SlotRow {
  id: number;
  status: string;
  chair_id: number;
  operator_id: number;
  start: Date;
  end: Date;
  expires_at: Date;
  taken_by_offer_id: number | null;
  booked_appointment_id: number | null;
}

describe('waitlist offers', () => {
  let t: TestApp;
  let w: RepliesWorld;
  let db: Connection;
  let fake: SmsFake;
  let desk: Awaited<ReturnType<TestApp['as']>>;
  let now: Date;
  let week = 0;

  const q = async <T>(sql: string, args: unknown[] = []) => (await db.query(sql, args)) as T[];
  /** A waitlisted patient whose case has an estimate (so the time finder knows its first visit's length). */
  const waiting = async (opts: { consent?: boolean; earliest?: string } = {}) => {
    const p = await w.patient({ consent: opts.consent, assessed: true });
    const res = await desk.post('/api/waitlist').send({ caseId: p.caseId, ...(opts.earliest ? { earliest: opts.earliest } : {}) });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    return { ...p, entryId: res.body.id as number };
  };
  /** Another patient's two-hour visit on chair 2 / operator 1, on a Monday of its own. */
  const freedVisit = async () => {
    const day = plusDays(w.f.monday, 7 * week++);
    const x = await w.patient();
    const appt = await w.book(x.caseId, day, '08:00', '10:00');
    return { day, appt };
  };
  const cancel = async (appt: { id: number; version: number }) => {
    const res = await desk.patch(`/api/appointments/${appt.id}`).send({ version: appt.version, state: 'cancelled', reason: 'patient unwell' });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
  };
  const slotOf = (appointmentId: number) => waitFor('the offer slot', async () => (await q<SlotRow>('SELECT * FROM waitlist_offer_slots WHERE freed_appointment_id = ?', [appointmentId]))[0], 10_000);
  const offersOf = (slotId: number) =>
    q<{ id: number; patient_id: number; status: string; outbox_message_id: number; answered_at: Date | null }>('SELECT id, patient_id, status, outbox_message_id, answered_at FROM waitlist_offers WHERE slot_id = ? ORDER BY id', [slotId]);
  const textsTo = (p: PatientCase) => fake.messages({ to: p.phone, direction: 'outbound-api' }).map((m) => m.body);
  const bookingsAt = async (start: Date) => q<{ id: number; case_id: number; state: string }>("SELECT id, case_id, state FROM appointments WHERE start = ? AND state <> 'cancelled'", [start]);

  beforeAll(async () => {
    fake = await startFake(testConfig());
    t = await createTestApp({ publicUrl: 'https://desk.quillfern.example.test', sms: { apiBase: fake.url } });
    now = textingNow();
    setClock(t, now);
    w = await repliesWorld(t, 'Waitbury', '201');
    db = await connect(t.config);
    desk = await t.as('frontdesk');
  });
  // Each case starts from an empty waitlist, so "the top N" are the patients the case adds.
  beforeEach(async () => {
    await db.query('DELETE FROM waitlist_entries');
  });
  afterAll(async () => {
    await db?.end();
    await t?.close();
    await fake?.close();
  });

  it('a cancellation opens a slot and texts the top waitlisted patients who fit; two YES at once book exactly one', async () => {
    const a = await waiting();
    const b = await waiting();
    const c = await waiting();
    const noConsent = await waiting({ consent: false });
    const tooLate = await waiting({ earliest: plusDays(w.f.monday, 7 * 30) });
    const fourth = await waiting();
    const { day, appt } = await freedVisit();
    await cancel(appt);
    const slot = await slotOf(appt.id);
    expect(slot).toMatchObject({ status: 'open', chair_id: w.f.chair2, operator_id: w.f.operators[0] });
    expect(new Date(slot.start).toISOString()).toBe(at(day, '08:00'));
    expect(new Date(slot.end).toISOString()).toBe(at(day, '10:00'));
    // Default reminder settings: an offer stays open 30 minutes (the slot is weeks away, so not "2 h before").
    expect(new Date(slot.expires_at).getTime()).toBe(now.getTime() + 30 * 60_000);
    const offers = await offersOf(slot.id);
    // waitlistOfferCount 3: the first three who fit and may be texted, in waitlist order.
    expect(offers.map((o) => o.patient_id)).toEqual([a.patientId, b.patientId, c.patientId]);
    for (const p of [noConsent, tooLate, fourth]) expect(offers.some((o) => o.patient_id === p.patientId)).toBe(false);
    const rows = await q<{ purpose: string; dedupe_key: string; body: string; appointment_id: number | null }>("SELECT purpose, dedupe_key, body, appointment_id FROM outbox_messages WHERE purpose = 'waitlist_offer' AND id IN (?)", [offers.map((o) => o.outbox_message_id)]);
    expect(rows.map((r) => r.dedupe_key).sort()).toEqual(offers.map((o) => `offer:${o.id}`).sort());
    const when = DateTime.fromISO(at(day, '08:00')).setZone(ZONE).setLocale('en-US');
    const offerText = `${PRACTICE}: an earlier time is free, ${when.toFormat('ccc d LLL h:mm a')} at Waitbury. Reply YES to take it. Reply STOP to opt out.`;
    for (const r of rows) expect(r).toMatchObject({ body: offerText, appointment_id: null });
    expect(offerText.length).toBeLessThanOrEqual(160);

    await drain(t);
    for (const p of [a, b, c]) expect(textsTo(p)).toEqual([offerText]);

    // Both answer at the same moment: one UPDATE of the slot row wins.
    const [ra, rb] = await Promise.all([inbound(t, { from: a.phone, body: 'YES' }), inbound(t, { from: b.phone, body: 'yes' })]);
    expect([ra.status, rb.status]).toEqual([200, 200]);
    const booked = await bookingsAt(new Date(at(day, '08:00')));
    expect(booked).toHaveLength(1);
    const winner = booked[0]!.case_id === a.caseId ? a : b;
    const loser = winner === a ? b : a;
    expect([a.caseId, b.caseId]).toContain(booked[0]!.case_id);
    const after = await q<SlotRow>('SELECT * FROM waitlist_offer_slots WHERE id = ?', [slot.id]);
    expect(after[0]).toMatchObject({ status: 'taken', booked_appointment_id: booked[0]!.id });
    const statuses = Object.fromEntries((await offersOf(slot.id)).map((o) => [o.patient_id, o.status]));
    expect(statuses).toEqual({ [winner.patientId]: 'accepted', [loser.patientId]: 'gone', [c.patientId]: 'gone' });
    // The winner leaves the waitlist; the others stay on it.
    const entries = (await q<{ id: number }>('SELECT id FROM waitlist_entries')).map((e) => e.id);
    expect(entries).not.toContain(winner.entryId);
    expect(entries).toEqual(expect.arrayContaining([loser.entryId, c.entryId]));
    const effects = Object.fromEntries(
      (await q<{ patient_id: number; kind: string; effect: string; appointment_id: number | null }>("SELECT patient_id, kind, effect, appointment_id FROM inbound_messages WHERE patient_id IN (?, ?)", [a.patientId, b.patientId])).map((m) => [m.patient_id, m]),
    );
    expect(effects[winner.patientId]).toMatchObject({ kind: 'waitlist_accept', appointment_id: booked[0]!.id });
    expect(effects[winner.patientId]!.effect).toMatch(/^Took the waitlist offer: booked .+ at Waitbury \(appointment \d+\); removed from the waitlist$/);
    expect(effects[loser.patientId]).toMatchObject({ kind: 'waitlist_accept', appointment_id: null });
    expect(effects[loser.patientId]!.effect).toMatch(/time had already been taken/);

    await drain(t);
    expect(textsTo(winner)).toEqual([offerText, `${PRACTICE}: you are booked for ${when.toFormat('ccc d LLL h:mm a')} at Waitbury. Reply STOP to opt out.`]);
    expect(textsTo(loser)).toEqual([offerText, TAKEN]);

    // A later YES hears the time is gone, once; a second YES is no longer an answer to the offer.
    await inbound(t, { from: c.phone, body: 'C' }).expect(200);
    await inbound(t, { from: c.phone, body: 'YES' }).expect(200);
    await drain(t);
    expect(textsTo(c)).toEqual([offerText, TAKEN]);
    const cRows = await q<{ kind: string; effect: string }>('SELECT kind, effect FROM inbound_messages WHERE patient_id = ? ORDER BY id', [c.patientId]);
    expect(cRows.map((r) => r.kind)).toEqual(['waitlist_accept', 'confirm']);
    expect(cRows[1]!.effect).toBe('No upcoming visit to confirm; left in the inbox for the front desk');
    // The booking went through the guarded path: the Chair board shows it like any other.
    const board = await desk.get(`/api/appointments/${booked[0]!.id}`);
    expect(board.body).toMatchObject({ caseId: winner.caseId, chairId: w.f.chair2, operatorId: w.f.operators[0], start: at(day, '08:00'), state: 'booked' });
  });

  it('an offer text not sent before the slot was taken is skipped at send time', async () => {
    const a = await waiting();
    const b = await waiting();
    const { appt } = await freedVisit();
    await cancel(appt);
    const slot = await slotOf(appt.id);
    const offers = await offersOf(slot.id);
    const bOffer = offers.find((o) => o.patient_id === b.patientId)!;
    // b's text waits (say, behind a slow provider) while a answers.
    await db.query('UPDATE outbox_messages SET due_at = ? WHERE id = ?', [new Date(now.getTime() + 10 * 60_000), bOffer.outbox_message_id]);
    await drain(t);
    await inbound(t, { from: a.phone, body: 'Yes' }).expect(200);
    expect((await q<SlotRow>('SELECT * FROM waitlist_offer_slots WHERE id = ?', [slot.id]))[0]!.status).toBe('taken');
    await drain(t, new Date(now.getTime() + 11 * 60_000));
    const [row] = await q<{ status: string; defer_reason: string }>('SELECT status, defer_reason FROM outbox_messages WHERE id = ?', [bOffer.outbox_message_id]);
    expect(row).toEqual({ status: 'skipped', defer_reason: 'the offered time was already taken' });
    expect(textsTo(b)).toEqual([]);
    // b never got the offer, so its YES is an ordinary confirm word.
    await inbound(t, { from: b.phone, body: 'YES' }).expect(200);
    expect((await q<{ kind: string }>('SELECT kind FROM inbound_messages WHERE patient_id = ?', [b.patientId])).map((r) => r.kind)).toEqual(['confirm']);
  });

  it('an expired offer books nothing: the late YES hears so, an unsent text is skipped', async () => {
    const a = await waiting();
    const b = await waiting();
    const { day, appt } = await freedVisit();
    await cancel(appt);
    const slot = await slotOf(appt.id);
    const bOffer = (await offersOf(slot.id)).find((o) => o.patient_id === b.patientId)!;
    await db.query('UPDATE outbox_messages SET due_at = ? WHERE id = ?', [new Date(now.getTime() + 40 * 60_000), bOffer.outbox_message_id]);
    await drain(t);
    const later = new Date(now.getTime() + 45 * 60_000);
    setClock(t, later);
    try {
      await inbound(t, { from: a.phone, body: 'YES' }).expect(200);
      await drain(t);
    } finally {
      setClock(t, now);
    }
    expect(await bookingsAt(new Date(at(day, '08:00')))).toEqual([]);
    expect((await q<SlotRow>('SELECT * FROM waitlist_offer_slots WHERE id = ?', [slot.id]))[0]!.status).toBe('expired');
    expect(textsTo(a).at(-1)).toBe(TAKEN);
    const [row] = await q<{ status: string; defer_reason: string }>('SELECT status, defer_reason FROM outbox_messages WHERE id = ?', [bOffer.outbox_message_id]);
    expect(row).toEqual({ status: 'skipped', defer_reason: 'the waitlist offer expired' });
  });

  it('when the desk books the freed time first, the YES is told the time is gone and nothing double-books', async () => {
    const a = await waiting();
    const { day, appt } = await freedVisit();
    await cancel(appt);
    const slot = await slotOf(appt.id);
    await drain(t);
    const other = await w.patient();
    await w.book(other.caseId, day, '08:00', '09:30');
    await inbound(t, { from: a.phone, body: 'YES' }).expect(200);
    const booked = await bookingsAt(new Date(at(day, '08:00')));
    expect(booked.map((b) => b.case_id)).toEqual([other.caseId]);
    expect((await q<SlotRow>('SELECT * FROM waitlist_offer_slots WHERE id = ?', [slot.id]))[0]).toMatchObject({ status: 'expired', booked_appointment_id: null });
    const [m] = await q<{ effect: string }>('SELECT effect FROM inbound_messages WHERE patient_id = ?', [a.patientId]);
    expect(m!.effect).toMatch(/^Took the waitlist offer for .+, but it could not be booked: the time is no longer free$/);
    await drain(t);
    expect(textsTo(a).at(-1)).toBe(TAKEN);
    expect((await q<{ id: number }>('SELECT id FROM waitlist_entries WHERE id = ?', [a.entryId]))).toHaveLength(1);
  });

  it('a move away from a time more than a day ahead frees it; a cancellation during quiet hours sends nothing', async () => {
    const a = await waiting();
    const { day, appt } = await freedVisit();
    const moved = await desk.patch(`/api/appointments/${appt.id}`).send({ version: appt.version, start: at(plusDays(day, 1), '08:00'), end: at(plusDays(day, 1), '10:00') });
    expect(moved.status, JSON.stringify(moved.body)).toBe(200);
    const slot = await slotOf(appt.id);
    expect(new Date(slot.start).toISOString()).toBe(at(day, '08:00'));
    expect((await offersOf(slot.id)).map((o) => o.patient_id)).toContain(a.patientId);

    // The same change delivered again (a sweep, another instance) opens no second slot.
    const again = await t.app.get(WaitlistOffersService).offerFreedTime(
      {
        practiceId: (await q<{ practice_id: number }>('SELECT practice_id FROM appointments WHERE id = ?', [appt.id]))[0]!.practice_id,
        appointmentId: appt.id,
        caseId: moved.body.caseId,
        referralId: moved.body.referralId,
        previous: { start: new Date(at(day, '08:00')), end: new Date(at(day, '10:00')), state: 'booked', chairId: w.f.chair2, operatorId: w.f.operators[0]!, microscopeId: null, locationId: w.f.locationId },
        current: { start: new Date(moved.body.start), end: new Date(moved.body.end), state: 'booked', chairId: w.f.chair2, operatorId: w.f.operators[0]!, microscopeId: null, locationId: w.f.locationId },
        actorId: null,
        at: now,
      },
      now,
    );
    expect(again).toBeNull();
    expect(await q('SELECT id FROM waitlist_offer_slots WHERE freed_appointment_id = ?', [appt.id])).toHaveLength(1);

    // Less than a day ahead, a move frees nothing for the waitlist (the desk fills such gaps by phone).
    const soon = await freedVisit();
    // Someone who would fit and holds no open offer, so only the 24-hour rule can keep the slot closed.
    await waiting();
    const close = new Date(Date.parse(at(soon.day, '08:00')) - 12 * 3_600_000);
    setClock(t, close);
    try {
      const res = await desk.patch(`/api/appointments/${soon.appt.id}`).send({ version: soon.appt.version, start: at(soon.day, '10:30'), end: at(soon.day, '12:30') });
      expect(res.status).toBe(200);
      const snapshot = (start: string, end: string) => ({ start: new Date(start), end: new Date(end), state: 'booked' as const, chairId: w.f.chair2, operatorId: w.f.operators[0]!, microscopeId: null, locationId: w.f.locationId });
      const offered = await t.app.get(WaitlistOffersService).offerFreedTime(
        { practiceId: (await q<{ practice_id: number }>('SELECT practice_id FROM appointments WHERE id = ?', [soon.appt.id]))[0]!.practice_id, appointmentId: soon.appt.id, caseId: res.body.caseId, referralId: res.body.referralId, previous: snapshot(at(soon.day, '08:00'), at(soon.day, '10:00')), current: snapshot(res.body.start, res.body.end), actorId: null, at: close },
        close,
      );
      expect(offered).toBeNull();
      expect(await q('SELECT id FROM waitlist_offer_slots WHERE freed_appointment_id = ?', [soon.appt.id])).toEqual([]);
    } finally {
      setClock(t, now);
    }

    // At 22:00 in New York an offer open for 30 minutes could only go after it lapsed: skipped, not sent at 08:00.
    const night = await freedVisit();
    const late = DateTime.fromISO(at(plusDays(night.day, -3), '22:00')).toJSDate();
    setClock(t, late);
    try {
      await cancel(night.appt);
      const s = await slotOf(night.appt.id);
      const [o] = await offersOf(s.id);
      await drain(t);
      const [row] = await q<{ status: string; defer_reason: string }>('SELECT status, defer_reason FROM outbox_messages WHERE id = ?', [o!.outbox_message_id]);
      expect(row).toEqual({ status: 'skipped', defer_reason: 'quiet hours in America/New_York last until after the offer expires' });
    } finally {
      setClock(t, now);
    }
  });
});
