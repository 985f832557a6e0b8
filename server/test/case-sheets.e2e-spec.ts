import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, type TestApp } from './helpers/test-app.js';

const sum = (xs: number[]) => xs.reduce((s, x) => s + x, 0);

describe('case sheets', () => {
  let t: TestApp;
  let molarCaseId: number;
  let incisorCaseId: number;
  let referralId: number;

  beforeAll(async () => {
    t = await createTestApp();
    const desk = await t.as('frontdesk');
    const locations = (await desk.get('/api/locations')).body;
    const res = await desk.post('/api/referrals').send({
      patient: { firstName: 'Odile', lastName: 'Prentiss-Vane', dateOfBirth: '1979-04-02', phone: '(202) 555-0144' },
      referringDentist: { name: 'Dr. Casimir Thorne', practiceName: 'Thorne Family Dental', email: 'thorne@example.com' },
      locationId: locations[0].id,
      urgency: 'soon',
      procedure: 'retreatment',
      notation: 'fdi',
      teeth: [{ tooth: '37' }, { tooth: '11', procedure: 'initial' }],
    });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    referralId = res.body.id;
    molarCaseId = res.body.cases.find((c: { toothFdi: string }) => c.toothFdi === '37').id;
    incisorCaseId = res.body.cases.find((c: { toothFdi: string }) => c.toothFdi === '11').id;
  });
  afterAll(async () => t?.close());

  it('starts with no estimate', async () => {
    const res = await (await t.as('endodontist')).get(`/api/cases/${molarCaseId}`);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ toothFdi: '37', procedure: 'retreatment', estimate: null, override: null, patient: { name: 'Odile Prentiss-Vane' } });
  });

  it('stores the estimate of the hard molar with its table version and marks it planned', async () => {
    const endo = await t.as('endodontist');
    const res = await endo.patch(`/api/cases/${molarCaseId}`).send({
      assessment: { canalVisibility: 'high' },
      facts: { curvatureDegrees: 35, complications: ['ledge'] },
      markPlanned: true,
    });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.estimate.level).toBe('high');
    expect(res.body.estimate.visits).toHaveLength(2);
    expect(res.body.tableVersion).toBe(1);
    expect(res.body.status).toBe('planned');
    expect(sum(res.body.bookedMinutesPerVisit)).toBe(res.body.estimate.totalMinutes);
    expect(res.body.history.length).toBeGreaterThan(0);
    // One of two cases planned: the referral is triaged, not yet planned.
    const ref = await endo.get(`/api/referrals/${referralId}`);
    expect(ref.body.status).toBe('triaged');
  });

  it('lets an endodontist adjust the minutes with a reason and keeps both figures', async () => {
    const endo = await t.as('endodontist');
    const noReason = await endo.patch(`/api/cases/${molarCaseId}`).send({ override: { minutesPerVisit: [120, 90], reason: '' } });
    expect(noReason.status).toBe(400);
    expect(noReason.body.errors.map((e: { field: string }) => e.field)).toContain('override.reason');
    const wrongCount = await endo.patch(`/api/cases/${molarCaseId}`).send({ override: { minutesPerVisit: [120], reason: 'long history' } });
    expect(wrongCount.status).toBe(400);
    expect(wrongCount.body.errors[0].field).toBe('override.minutesPerVisit');
    const ok = await endo.patch(`/api/cases/${molarCaseId}`).send({ override: { minutesPerVisit: [120, 90], reason: 'patient needs breaks' } });
    expect(ok.status).toBe(200);
    expect(ok.body.bookedMinutesPerVisit).toEqual([120, 90]);
    expect(ok.body.override).toMatchObject({ reason: 'patient needs breaks', byName: 'Dr. Amara Voskuijl' });
    expect(ok.body.estimate.totalMinutes).not.toBe(210);
  });

  it('refuses an override from the front desk', async () => {
    const desk = await t.as('frontdesk');
    const res = await desk.patch(`/api/cases/${molarCaseId}`).send({ override: { minutesPerVisit: [60, 60], reason: 'x' } });
    expect(res.status).toBe(403);
  });

  it('plans the referral once every case is planned', async () => {
    const endo = await t.as('endodontist');
    const res = await endo.patch(`/api/cases/${incisorCaseId}`).send({ markPlanned: true });
    expect(res.status).toBe(200);
    expect(res.body.estimate.level).toBe('low');
    expect(res.body.estimate.visits).toHaveLength(1);
    const ref = await endo.get(`/api/referrals/${referralId}`);
    expect(ref.body.status).toBe('planned');
  });

  it('a booked case keeps its status when its sheet is saved again (markPlanned only plans cases not yet booked)', async () => {
    const desk = await t.as('frontdesk');
    const found = await desk.post('/api/time-finder').send({ caseId: incisorCaseId });
    expect(found.status, JSON.stringify(found.body)).toBe(200);
    const booked = await desk.post('/api/appointments').send({ caseId: incisorCaseId, visits: found.body.proposals[0].visits });
    expect(booked.status, JSON.stringify(booked.body)).toBe(201);
    const endo = await t.as('endodontist');
    const res = await endo.patch(`/api/cases/${incisorCaseId}`).send({ canals: 1, markPlanned: true });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.status).toBe('booked');
    expect((await endo.get(`/api/referrals/${referralId}`)).body.status).toBe('booked');
  });

  it('names the field of a bad assessment and keeps the stored sheet', async () => {
    const endo = await t.as('endodontist');
    const res = await endo.patch(`/api/cases/${incisorCaseId}`).send({ assessment: { sparkle: 'high' } });
    expect(res.status).toBe(400);
    expect(res.body.errors[0].field).toBe('assessment.sparkle');
    const after = await endo.get(`/api/cases/${incisorCaseId}`);
    expect(after.body.estimate.level).toBe('low');
  });

  it('is not for the assistant, and 404 for an unknown case', async () => {
    expect((await (await t.as('assistant')).get(`/api/cases/${molarCaseId}`)).status).toBe(403);
    expect((await (await t.as('endodontist')).get('/api/cases/999999')).status).toBe(404);
  });
});
