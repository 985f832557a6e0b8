// Planning reminders from bookings, on the real database with a fixed clock. Sources: quiet hours
// 08:00–21:00 in the patient's zone (47 CFR 64.1200(c)(1), verified per references.md); one text a day,
// three a week (47 CFR 64.1200(a)(9)(iv), from memory); zone offsets and the 2026-11-01 change
// (America/New_York 06:00Z EDT → EST, America/Los_Angeles 09:00Z PDT → PST) from the IANA tz database
// (references.md "Calendars"). The expected instants are worked out by hand beside each check.
import { Sequelize } from 'sequelize-typescript';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { MessagingClock } from '../src/messaging/messaging-clock.service.js';
import { OutboxMessageRow } from '../src/messaging/models/outbox-message.model.js';
import { ReminderPlannerService } from '../src/reminders/reminder-planner.service.js';
import { book, byRule, reading, reminderLocation, reminderPatient, wall } from './helpers/reminders-fixture.js';
import { schedulingFixture, type SchedulingFixture } from './helpers/scheduling-fixture.js';
import { createTestApp, type TestApp } from './helpers/test-app.js';

const NY = 'America/New_York';
const LA = 'America/Los_Angeles';

describe('reminder planning', () => {
  let t: TestApp;
  let f: SchedulingFixture;
  let la: { locationId: number; chairId: number };
  let planner: ReminderPlannerService;
  let now = new Date();

  const rowsOf = async (patientId: number) => byRule(await OutboxMessageRow.findAll({ where: { patientId }, order: [['id', 'ASC']] }));
  const at = (d: Date | null) => (d ? d.toISOString() : null);
  /** Books through the API at the fixed clock and waits for the booking event's planning to finish. */
  const bookAt = async (clock: string, caseId: number, visits: Parameters<typeof book>[2]) => {
    now = new Date(clock);
    const appts = await book(t, caseId, visits);
    await planner.idle();
    return appts;
  };

  beforeAll(async () => {
    t = await createTestApp();
    planner = t.app.get(ReminderPlannerService);
    await planner.idle();
    vi.spyOn(t.app.get(MessagingClock), 'now').mockImplementation(() => now);
    f = await schedulingFixture(t, 'Remindbay', 2);
    la = await reminderLocation(t, 'Remindwest', LA);
  });
  afterAll(async () => {
    vi.restoreAllMocks();
    await t?.close();
  });

  it('a booking 3 days ahead in New York: the booking e-mail now, texts 48 h and 24 h before at the visit’s local time', async () => {
    const p = await reminderPatient(t, f.locationId, { phoneSuffix: 60 });
    // Booked Tue 1 Dec 2026 10:00 EST (15:00Z) for Fri 4 Dec 10:00 EST (UTC−5) = 15:00Z.
    const [a] = await bookAt('2026-12-01T15:00:00Z', p.caseId, [{ start: wall(NY, '2026-12-04', '10:00'), end: wall(NY, '2026-12-04', '11:00'), chairId: f.chair2, operatorId: f.operators[0]! }]);
    const rows = await rowsOf(p.patientId);
    expect(Object.keys(rows).sort()).toEqual(['booking-email', 'text-24h', 'text-48h']);
    expect(rows['booking-email']).toMatchObject({ purpose: 'booking_email', channel: 'email', status: 'pending', toAddress: p.email, appointmentId: null, dedupeKey: `series:${a!.seriesId}:email:booking-email` });
    expect(at(rows['booking-email']!.dueAt)).toBe('2026-12-01T15:00:00.000Z');
    // 48 h before: Wed 2 Dec 15:00Z = 10:00 EST; 24 h before: Thu 3 Dec 15:00Z = 10:00 EST.
    expect(rows['text-48h']).toMatchObject({ purpose: 'reminder', channel: 'sms', status: 'pending', toAddress: p.phone, appointmentId: a!.id, dedupeKey: `appt:${a!.id}:sms:text-48h`, deferReason: null });
    expect([at(rows['text-48h']!.plannedAt), at(rows['text-48h']!.dueAt)]).toEqual(['2026-12-02T15:00:00.000Z', '2026-12-02T15:00:00.000Z']);
    expect(reading(NY, rows['text-48h']!.dueAt)).toBe('2026-12-02 10:00');
    expect(at(rows['text-24h']!.dueAt)).toBe('2026-12-03T15:00:00.000Z');
    expect(reading(NY, rows['text-24h']!.dueAt)).toBe('2026-12-03 10:00');
  });

  it('the same in Los Angeles (UTC−8)', async () => {
    const p = await reminderPatient(t, la.locationId, { phoneSuffix: 61 });
    // Fri 4 Dec 2026 09:15 PST = 17:15Z; 48 h → Wed 2 Dec 17:15Z; 24 h → Thu 3 Dec 17:15Z (09:15 PST both).
    await bookAt('2026-12-01T18:00:00Z', p.caseId, [{ start: wall(LA, '2026-12-04', '09:15'), end: wall(LA, '2026-12-04', '10:00'), chairId: la.chairId, operatorId: f.operators[1]! }]);
    const rows = await rowsOf(p.patientId);
    expect(at(rows['text-48h']!.dueAt)).toBe('2026-12-02T17:15:00.000Z');
    expect(at(rows['text-24h']!.dueAt)).toBe('2026-12-03T17:15:00.000Z');
    expect([reading(LA, rows['text-48h']!.dueAt), reading(LA, rows['text-24h']!.dueAt)]).toEqual(['2026-12-02 09:15', '2026-12-03 09:15']);
  });

  it('a 07:30 visit after the 2026-11-01 change: the 48 h text lands at 08:00 local the day before yesterday', async () => {
    const p = await reminderPatient(t, f.locationId, { phoneSuffix: 62 });
    // Visit Tue 3 Nov 2026 07:30 EST (UTC−5) = 12:30Z. 48 h before = Sun 1 Nov 12:30Z, which reads 07:30 EST
    // (New York fell back at 06:00Z that morning): quiet until 08:00 EST = 13:00Z.
    await bookAt('2026-10-28T14:00:00Z', p.caseId, [{ start: wall(NY, '2026-11-03', '07:30'), end: wall(NY, '2026-11-03', '08:30'), chairId: f.chair2, operatorId: f.operators[0]! }]);
    const rows = await rowsOf(p.patientId);
    expect(rows['text-48h']).toMatchObject({ status: 'pending', deferReason: 'quiet hours in America/New_York until 08:00' });
    expect([at(rows['text-48h']!.plannedAt), at(rows['text-48h']!.dueAt)]).toEqual(['2026-11-01T12:30:00.000Z', '2026-11-01T13:00:00.000Z']);
    expect(reading(NY, rows['text-48h']!.dueAt)).toBe('2026-11-01 08:00');
    // 24 h before = Mon 2 Nov 12:30Z = 07:30 EST → 08:00 EST = 13:00Z.
    expect(at(rows['text-24h']!.dueAt)).toBe('2026-11-02T13:00:00.000Z');
  });

  it('counts real hours across the change: a 48 h text from Mon 2 Nov 07:30 EST reads 08:30 EDT and does not move', async () => {
    const p = await reminderPatient(t, f.locationId, { phoneSuffix: 63 });
    // Mon 2 Nov 07:30 EST = 12:30Z; 48 h before = Sat 31 Oct 12:30Z, still EDT (UTC−4): 08:30, inside quiet hours.
    await bookAt('2026-10-28T14:00:00Z', p.caseId, [{ start: wall(NY, '2026-11-02', '07:30'), end: wall(NY, '2026-11-02', '08:15'), chairId: f.chair2, operatorId: f.operators[0]! }]);
    const rows = await rowsOf(p.patientId);
    expect(rows['text-48h']).toMatchObject({ deferReason: null });
    expect(at(rows['text-48h']!.dueAt)).toBe('2026-10-31T12:30:00.000Z');
    expect(reading(NY, rows['text-48h']!.dueAt)).toBe('2026-10-31 08:30');
    // 24 h before = Sun 1 Nov 12:30Z = 07:30 EST (after the change) → 08:00 EST = 13:00Z.
    expect(rows['text-24h']).toMatchObject({ deferReason: 'quiet hours in America/New_York until 08:00' });
    expect(at(rows['text-24h']!.dueAt)).toBe('2026-11-01T13:00:00.000Z');
  });

  it('in Los Angeles across its change, judged in the patient’s own zone', async () => {
    const p = await reminderPatient(t, la.locationId, { phoneSuffix: 64, timeZone: LA });
    // Tue 3 Nov 07:30 PST (UTC−8) = 15:30Z; 48 h before = Sun 1 Nov 15:30Z = 07:30 PST → 08:00 PST = 16:00Z.
    await bookAt('2026-10-28T14:00:00Z', p.caseId, [{ start: wall(LA, '2026-11-03', '07:30'), end: wall(LA, '2026-11-03', '08:30'), chairId: la.chairId, operatorId: f.operators[1]! }]);
    const rows = await rowsOf(p.patientId);
    expect(at(rows['text-48h']!.dueAt)).toBe('2026-11-01T16:00:00.000Z');
    expect(rows['text-48h']!.deferReason).toBe('quiet hours in America/Los_Angeles until 08:00');
    // 24 h before = Mon 2 Nov 15:30Z = 07:30 PST → 16:00Z.
    expect(at(rows['text-24h']!.dueAt)).toBe('2026-11-02T16:00:00.000Z');
  });

  it('caps: two visits on consecutive days; the 1/day cap defers the third text and the reason says so; the fourth has no room', async () => {
    const p = await reminderPatient(t, f.locationId, { phoneSuffix: 65 });
    // Visits Thu 10 Dec and Fri 11 Dec 2026, 10:00 EST (15:00Z), booked Mon 7 Dec 09:00 EST.
    const [a, b] = await bookAt('2026-12-07T14:00:00Z', p.caseId, [
      { start: wall(NY, '2026-12-10', '10:00'), end: wall(NY, '2026-12-10', '11:00'), chairId: f.chair2, operatorId: f.operators[0]! },
      { start: wall(NY, '2026-12-11', '10:00'), end: wall(NY, '2026-12-11', '11:00'), chairId: f.chair2, operatorId: f.operators[0]! },
    ]);
    const rows = await OutboxMessageRow.findAll({ where: { patientId: p.patientId, purpose: 'reminder' }, order: [['id', 'ASC']] });
    const row = (apptId: number, rule: string) => rows.find((r) => r.appointmentId === apptId && r.ruleId === rule)!;
    // Visit 1: 48 h → Tue 8 Dec 15:00Z; 24 h → Wed 9 Dec 15:00Z.
    expect(at(row(a!.id, 'text-48h').dueAt)).toBe('2026-12-08T15:00:00.000Z');
    expect(at(row(a!.id, 'text-24h').dueAt)).toBe('2026-12-09T15:00:00.000Z');
    // Visit 2's 48 h text wants Wed 9 Dec 15:00Z, a day that already has a text → Thu 10 Dec 08:00 EST = 13:00Z.
    expect(row(b!.id, 'text-48h')).toMatchObject({ status: 'pending', deferReason: 'already texted today' });
    expect(at(row(b!.id, 'text-48h').plannedAt)).toBe('2026-12-09T15:00:00.000Z');
    expect(at(row(b!.id, 'text-48h').dueAt)).toBe('2026-12-10T13:00:00.000Z');
    // Its 24 h text wants Thu 10 Dec 15:00Z: taken → Fri 11 Dec 08:00, but that is a fourth text within a week of
    // Tue 8 Dec 15:00Z, which ages out Tue 15 Dec: after the visit. An explicit skip, not a silent drop.
    expect(row(b!.id, 'text-24h')).toMatchObject({
      status: 'skipped',
      deferReason: 'no allowed time for this reminder before the visit (already texted today; three texts this week)',
    });
    // One booking e-mail for the series.
    expect(await OutboxMessageRow.count({ where: { patientId: p.patientId, purpose: 'booking_email' } })).toBe(1);
  });

  it('no text consent: texts wait at their own rule times, say why, and take no place under the caps', async () => {
    const p = await reminderPatient(t, f.locationId, { phoneSuffix: 69, consent: false });
    // Booked Tue 15 Dec 2026 09:00 EST (14:00Z) for Thu 17 Dec 08:00 EST = 13:00Z: inside the 48 h rule's lead time.
    await bookAt('2026-12-15T14:00:00Z', p.caseId, [{ start: wall(NY, '2026-12-17', '08:00'), end: wall(NY, '2026-12-17', '09:00'), chairId: f.chair2, operatorId: f.operators[0]! }]);
    const rows = await rowsOf(p.patientId);
    const why = 'no text consent on file yet; it goes only if the patient agrees to texts before it is due';
    // 48 h: its time is past, so at once (15 Dec 14:00Z), to be looked at by the composer then.
    expect(rows['text-48h']!.status).toBe('pending');
    expect(rows['text-48h']!.deferReason).toBe(`${why} (booked 47 hours before the visit: sent at once)`);
    expect(at(rows['text-48h']!.dueAt)).toBe('2026-12-15T14:00:00.000Z');
    // 24 h: Wed 16 Dec 13:00Z = 08:00 EST, not moved for the 48 h text (which never goes without consent).
    expect(rows['text-24h']).toMatchObject({ status: 'pending', deferReason: why });
    expect(at(rows['text-24h']!.dueAt)).toBe('2026-12-16T13:00:00.000Z');
  });

  it('records a skipped booking e-mail when the patient has no address, and never plans twice', async () => {
    const p = await reminderPatient(t, f.locationId, { phoneSuffix: 66, email: null });
    const [a] = await bookAt('2026-12-14T15:00:00Z', p.caseId, [{ start: wall(NY, '2026-12-21', '09:00'), end: wall(NY, '2026-12-21', '10:00'), chairId: f.chair2, operatorId: f.operators[0]! }]);
    const rows = await rowsOf(p.patientId);
    expect(rows['booking-email']).toMatchObject({ status: 'skipped', deferReason: 'no e-mail address on file', toAddress: null });
    const again = await planner.planSeries(rows['text-48h']!.practiceId, a!.seriesId, now);
    expect(again).toEqual({ queued: 0, skipped: 0, existing: 3 });
    expect(await OutboxMessageRow.count({ where: { patientId: p.patientId } })).toBe(3);
  });

  it('a move recomputes the pending rows from the new start; a cancellation cancels them with the reason', async () => {
    const p = await reminderPatient(t, f.locationId, { phoneSuffix: 67 });
    const frontdesk = await t.as('frontdesk');
    const [a] = await bookAt('2026-12-14T15:00:00Z', p.caseId, [{ start: wall(NY, '2026-12-17', '10:00'), end: wall(NY, '2026-12-17', '11:00'), chairId: f.chair2, operatorId: f.operators[0]! }]);
    // Moved to Fri 18 Dec 14:00 EST = 19:00Z: 48 h → Wed 16 Dec 19:00Z; 24 h → Thu 17 Dec 19:00Z.
    const moved = await frontdesk.patch(`/api/appointments/${a!.id}`).send({ start: wall(NY, '2026-12-18', '14:00'), end: wall(NY, '2026-12-18', '15:00'), version: a!.version });
    expect(moved.status, JSON.stringify(moved.body)).toBe(200);
    await planner.idle();
    let rows = await rowsOf(p.patientId);
    expect([at(rows['text-48h']!.dueAt), at(rows['text-24h']!.dueAt)]).toEqual(['2026-12-16T19:00:00.000Z', '2026-12-17T19:00:00.000Z']);
    expect(at(rows['text-48h']!.plannedAt)).toBe('2026-12-16T19:00:00.000Z');

    // Moved to Mon 14 Dec 16:00 EST (21:00Z), an hour from "now": the 48 h text at once, the 24 h one has no room.
    now = new Date('2026-12-14T20:00:00Z');
    const soon = await frontdesk.patch(`/api/appointments/${a!.id}`).send({ start: wall(NY, '2026-12-14', '16:00'), end: wall(NY, '2026-12-14', '17:00'), version: moved.body.version });
    expect(soon.status, JSON.stringify(soon.body)).toBe(200);
    await planner.idle();
    rows = await rowsOf(p.patientId);
    expect(rows['text-48h']).toMatchObject({ status: 'pending', deferReason: 'moved 60 minutes before the visit: sent at once' });
    expect(at(rows['text-48h']!.dueAt)).toBe('2026-12-14T20:00:00.000Z');
    expect(rows['text-24h']).toMatchObject({ status: 'skipped', deferReason: 'moved 60 minutes before the visit: no allowed time for this reminder before it' });

    // Back to a week later: the skipped one comes back.
    const later = await frontdesk.patch(`/api/appointments/${a!.id}`).send({ start: wall(NY, '2026-12-22', '10:00'), end: wall(NY, '2026-12-22', '11:00'), version: soon.body.version });
    expect(later.status).toBe(200);
    await planner.idle();
    rows = await rowsOf(p.patientId);
    // Tue 22 Dec 10:00 EST = 15:00Z: 48 h → Sun 20 Dec 15:00Z; 24 h → Mon 21 Dec 15:00Z.
    expect(rows['text-24h']).toMatchObject({ status: 'pending', deferReason: null });
    expect([at(rows['text-48h']!.dueAt), at(rows['text-24h']!.dueAt)]).toEqual(['2026-12-20T15:00:00.000Z', '2026-12-21T15:00:00.000Z']);

    const cancelled = await frontdesk.patch(`/api/appointments/${a!.id}`).send({ state: 'cancelled', reason: 'patient asked', version: later.body.version });
    expect(cancelled.status).toBe(200);
    await planner.idle();
    rows = await rowsOf(p.patientId);
    expect(rows['text-48h']).toMatchObject({ status: 'cancelled', deferReason: 'the visit was cancelled' });
    expect(rows['text-24h']).toMatchObject({ status: 'cancelled', deferReason: 'the visit was cancelled' });
  });

  it('the sweep plans a booked visit that lacks its rows (a crash after the commit), once', async () => {
    const p = await reminderPatient(t, f.locationId, { phoneSuffix: 68 });
    const [a] = await bookAt('2026-12-15T15:00:00Z', p.caseId, [{ start: wall(NY, '2026-12-23', '09:00'), end: wall(NY, '2026-12-23', '10:00'), chairId: f.chair2, operatorId: f.operators[1]! }]);
    const before = await rowsOf(p.patientId);
    const db = t.app.get(Sequelize);
    const bookedAgo = (ms: number) => db.query('UPDATE appointments SET created_at = :at WHERE id = :id', { replacements: { at: new Date(now.getTime() - ms), id: a!.id } });
    // As if the process had died between the booking's commit (an hour ago) and its event.
    await OutboxMessageRow.destroy({ where: { patientId: p.patientId } });
    await bookedAgo(3_600_000);
    expect(await planner.sweepOnce(now)).toBeGreaterThanOrEqual(1);
    const after = await rowsOf(p.patientId);
    expect(Object.keys(after).sort()).toEqual(['booking-email', 'text-24h', 'text-48h']);
    for (const k of ['text-48h', 'text-24h']) expect(at(after[k]!.dueAt)).toBe(at(before[k]!.dueAt));
    expect(after['text-48h']!.appointmentId).toBe(a!.id);
    await planner.sweepOnce(now);
    expect(await OutboxMessageRow.count({ where: { patientId: p.patientId } })).toBe(3);

    // A booking found without rows days later still gets its texts, but no belated "you are booked" e-mail.
    await OutboxMessageRow.destroy({ where: { patientId: p.patientId } });
    await bookedAgo(5 * 86_400_000);
    await planner.sweepOnce(now);
    expect(Object.keys(await rowsOf(p.patientId)).sort()).toEqual(['text-24h', 'text-48h']);
  });
});
