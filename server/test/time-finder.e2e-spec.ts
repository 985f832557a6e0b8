import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { at, local, plusDays, schedulingFixture, type SchedulingFixture } from './helpers/scheduling-fixture.js';
import { createTestApp, type TestApp } from './helpers/test-app.js';

// Hand-made fixture (values worked out by hand): location Mon–Fri 08:00–17:00 America/New_York, chair 1 with
// the only (fixed) microscope, chair 2 without; every fixture operator works Mon–Fri 08:00–12:00; the
// practice's turnover default is 10 minutes (common practice, no source).
describe('time finder API', () => {
  let t: TestApp;
  let f: SchedulingFixture;
  let opA: number, opB: number, opC: number, opD: number;

  beforeAll(async () => {
    t = await createTestApp();
    f = await schedulingFixture(t, 'Finderbay', 4);
    [opA, opB, opC, opD] = f.operators as [number, number, number, number];
    const desk = await t.as('frontdesk');
    // Operator B holds chair 1 and its microscope on Monday 08:00–10:00 (chair busy to 10:10 with turnover).
    const { caseId } = await f.newCase();
    const booked = await desk.post('/api/appointments').send({
      caseId,
      visits: [{ start: at(f.monday, '08:00'), end: at(f.monday, '10:00'), chairId: f.chair1, operatorId: opB, microscopeId: f.microscopeId }],
    });
    expect(booked.status, JSON.stringify(booked.body)).toBe(201);
  });
  afterAll(async () => t?.close());

  const find = async (body: object) => {
    const res = await (await t.as('frontdesk')).post('/api/time-finder').send({ locationId: f.locationId, from: at(f.monday, '00:00'), to: at(plusDays(f.monday, 28), '00:00'), ...body });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    return res.body as { proposals: { visits: { start: string; end: string; chairId: number; operatorId: number; microscopeId?: number }[]; gapMinutesLeft: number; reasons: string[] }[]; unplaceable?: { reason: string } };
  };

  it('waits for the busy microscope and the chair turnover after it', async () => {
    const r = await find({ operatorId: opA, plan: { visits: [{ minutes: 90, needsMicroscope: true }] } });
    const first = r.proposals[0]!.visits[0]!;
    // Microscope free at 10:00, but its chair is being turned over until 10:10.
    expect(local(first.start)).toBe(`${f.monday} 10:10`);
    expect(local(first.end)).toBe(`${f.monday} 11:40`);
    expect(first).toMatchObject({ chairId: f.chair1, microscopeId: f.microscopeId, operatorId: opA });
    // Without a microscope the free chair 2 takes the visit at opening.
    const plain = await find({ operatorId: opA, plan: { visits: [{ minutes: 90, needsMicroscope: false }] } });
    expect(local(plain.proposals[0]!.visits[0]!.start)).toBe(`${f.monday} 08:00`);
    expect(plain.proposals[0]!.visits[0]!.chairId).toBe(f.chair2);
  });

  it('skips a day the operator is off', async () => {
    const admin = await t.as('admin');
    const off = await admin.post(`/api/operators/${opC}/time-off`).send({ start: at(f.monday, '00:00'), end: at(plusDays(f.monday, 1), '00:00'), reason: 'course' });
    expect(off.status).toBe(201);
    const r = await find({ operatorId: opC, plan: { visits: [{ minutes: 60, needsMicroscope: false }] } });
    expect(local(r.proposals[0]!.visits[0]!.start)).toBe(`${plusDays(f.monday, 1)} 08:00`);
  });

  it('places the second visit 7–21 days after the first with the same operator, around time off', async () => {
    const admin = await t.as('admin');
    // Off on days 8–10 after the Monday: visit 1 is Tuesday (day 1), so days 8, 9 and 10 are out.
    await admin.post(`/api/operators/${opC}/time-off`).send({ start: at(plusDays(f.monday, 8), '00:00'), end: at(plusDays(f.monday, 11), '00:00') });
    const r = await find({
      operatorId: opC,
      plan: { visits: [{ minutes: 60, needsMicroscope: false }, { minutes: 60, needsMicroscope: false, earliestDaysAfterPrevious: 7, latestDaysAfterPrevious: 21 }] },
    });
    const [v1, v2] = r.proposals[0]!.visits;
    expect(local(v1!.start).slice(0, 10)).toBe(plusDays(f.monday, 1));
    const day2 = local(v2!.start).slice(0, 10);
    expect(day2 >= plusDays(f.monday, 11)).toBe(true);
    expect(day2 <= plusDays(f.monday, 22)).toBe(true);
    expect(v2!.operatorId).toBe(v1!.operatorId);
    for (const p of r.proposals) {
      const gap = (Date.parse(p.visits[1]!.start) - Date.parse(p.visits[0]!.start)) / 86_400_000;
      expect(gap).toBeGreaterThan(6);
      expect(gap).toBeLessThan(22);
    }
  });

  it('keeps an emergency hold for urgent cases only', async () => {
    const admin = await t.as('admin');
    const hold = await admin.post('/api/holds').send({ operatorId: opD, locationId: f.locationId, rrule: 'FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR', start: '08:00', end: '09:00' });
    expect(hold.status, JSON.stringify(hold.body)).toBe(201);
    const routine = await find({ operatorId: opD, plan: { visits: [{ minutes: 60, needsMicroscope: false }] } });
    expect(local(routine.proposals[0]!.visits[0]!.start)).toBe(`${f.monday} 09:00`);
    const urgent = await find({ operatorId: opD, urgent: true, plan: { visits: [{ minutes: 60, needsMicroscope: false }] } });
    expect(local(urgent.proposals[0]!.visits[0]!.start)).toBe(`${f.monday} 08:00`);
  });

  it('says why nothing fits', async () => {
    const r = await find({ operatorId: opA, plan: { visits: [{ minutes: 300, needsMicroscope: false }] } });
    expect(r.proposals).toEqual([]);
    expect(r.unplaceable!.reason).toMatch(/300 min/);
  });

  it('plans from the case estimate, and refuses a case without one', async () => {
    const { caseId } = await f.newCase({ tooth: '46' });
    const desk = await t.as('frontdesk');
    const none = await desk.post('/api/time-finder').send({ caseId });
    expect(none.status).toBe(400);
    expect(none.body.message).toBe('The case has no chair-time estimate yet; open the case sheet first');
    const sheet = await (await t.as('endodontist')).patch(`/api/cases/${caseId}`).send({ assessment: { canalVisibility: 'high' }, facts: { curvatureDegrees: 35 } });
    expect(sheet.status, JSON.stringify(sheet.body)).toBe(200);
    const r = await find({ caseId, operatorId: opA });
    expect(r.proposals.length).toBeGreaterThan(0);
    const p = r.proposals[0]!;
    expect(p.visits).toHaveLength(sheet.body.estimate.visits.length);
    p.visits.forEach((v, i) => expect((Date.parse(v.end) - Date.parse(v.start)) / 60_000).toBe(sheet.body.bookedMinutesPerVisit[i]));
  });

  it('checks its input and its callers', async () => {
    const desk = await t.as('frontdesk');
    expect((await desk.post('/api/time-finder').send({})).status).toBe(400);
    expect((await desk.post('/api/time-finder').send({ plan: { visits: [] } })).status).toBe(400);
    const assistant = await t.as('assistant');
    expect((await assistant.post('/api/time-finder').send({ plan: { visits: [{ minutes: 30, needsMicroscope: false }] } })).status).toBe(403);
  });
});
