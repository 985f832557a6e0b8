import type { LocationSummary, Patient } from '@ostium/shared';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, type TestApp } from './helpers/test-app.js';

type Agent = Awaited<ReturnType<TestApp['as']>>;

const fieldsOf = (body: { errors?: { field: string }[] }) => [...new Set((body.errors ?? []).map((e) => e.field))].sort();

let seq = 0;
const uniq = () => `${Date.now().toString(36)}${(++seq).toString(36)}`.replace(/\d/g, (d) => 'abcdefghij'[Number(d)]!);
const newPatient = (over: Record<string, unknown> = {}) => ({ firstName: `Noor${uniq()}`, lastName: `Whitlock${uniq()}`, dateOfBirth: '1992-10-05', ...over });

describe('patients', () => {
  let t: TestApp;
  let frontdesk: Agent;
  let manager: Agent;
  let assistant: Agent;

  beforeAll(async () => {
    t = await createTestApp();
    [frontdesk, manager, assistant] = await Promise.all([t.as('frontdesk'), t.as('manager'), t.as('assistant')]);
  });
  afterAll(async () => t?.close());

  async function create(body: Record<string, unknown>): Promise<Patient> {
    const res = await frontdesk.post('/api/patients').send(body);
    if (res.status !== 201) throw new Error(`create patient: ${res.status} ${JSON.stringify(res.body)}`);
    return res.body;
  }

  it('creates a patient with defaults and answers the Patient shape', async () => {
    const input = newPatient({ email: ' Noor.W@Example.com ', notes: ' prefers mornings ' });
    const p = await create(input);
    expect(p).toEqual({
      id: expect.any(Number),
      firstName: input.firstName,
      lastName: input.lastName,
      dateOfBirth: '1992-10-05',
      phone: null,
      email: 'noor.w@example.com',
      preferredChannel: 'text',
      smsConsent: false,
      smsConsentAt: null,
      smsConsentSource: null,
      timeZone: null,
      notes: 'prefers mornings',
      createdAt: expect.any(String),
    });
    expect((await frontdesk.get(`/api/patients/${p.id}`)).body).toEqual(p);
  });

  it('stores phones as E.164 from national or international input (libphonenumber-js), fictional 555-01xx included', async () => {
    // NANP 555-0100…0199 is reserved for fiction (references.md) and still parses as a valid US number.
    for (const [input, e164] of [
      ['(202) 555-0150', '+12025550150'],
      ['202.555.0151', '+12025550151'],
      ['+1 202 555 0152', '+12025550152'],
      ['1-212-555-0153', '+12125550153'],
    ]) {
      const p = await create(newPatient({ phone: input }));
      expect(p.phone, input).toBe(e164);
    }
  });

  it('refuses a phone that is not a valid number, naming phone', async () => {
    for (const phone of ['call me', '555-01', '+1 202 555 0150 ext 4', '(202) 555-01500000', '+999 1234']) {
      const res = await frontdesk.post('/api/patients').send(newPatient({ phone }));
      expect(res.status, phone).toBe(400);
      expect(res.body.errors, phone).toEqual([{ field: 'phone', message: expect.stringMatching(/^phone: /) }]);
    }
  });

  it('names every other bad field', async () => {
    const res = await frontdesk.post('/api/patients').send({
      firstName: '',
      dateOfBirth: '1990-02-30',
      email: 'nope',
      preferredChannel: 'fax',
      smsConsent: 'yes',
      timeZone: 'Mars/Olympus_Mons',
      smsConsentAt: '2026-01-01T00:00:00Z',
    });
    expect(res.status).toBe(400);
    expect(fieldsOf(res.body)).toEqual(['dateOfBirth', 'email', 'firstName', 'lastName', 'preferredChannel', 'smsConsent', 'smsConsentAt', 'timeZone']);
    const future = await frontdesk.post('/api/patients').send(newPatient({ dateOfBirth: '2999-01-01' }));
    expect(future.body.errors).toEqual([{ field: 'dateOfBirth', message: 'dateOfBirth cannot be in the future' }]);
    const old = await frontdesk.post('/api/patients').send(newPatient({ dateOfBirth: '1850-01-01' }));
    expect(fieldsOf(old.body)).toEqual(['dateOfBirth']);
  });

  it('records SMS consent with the server’s time and how it was given, and clears both when withdrawn', async () => {
    const before = Date.now();
    const p = await create(newPatient({ phone: '(202) 555-0154', smsConsent: true, smsConsentSource: 'verbal at desk', timeZone: 'America/Chicago' }));
    const after = Date.now();
    expect(p.smsConsent).toBe(true);
    expect(p.smsConsentSource).toBe('verbal at desk');
    expect(p.timeZone).toBe('America/Chicago');
    const at = Date.parse(p.smsConsentAt!);
    expect(at).toBeGreaterThanOrEqual(before - 1000);
    expect(at).toBeLessThanOrEqual(after + 1000);

    const off = await frontdesk.patch(`/api/patients/${p.id}`).send({ smsConsent: false });
    expect(off.status).toBe(200);
    expect(off.body).toMatchObject({ smsConsent: false, smsConsentAt: null, smsConsentSource: null });
    const on = await frontdesk.patch(`/api/patients/${p.id}`).send({ smsConsent: true, smsConsentSource: 'text reply START' });
    expect(on.body).toMatchObject({ smsConsent: true, smsConsentSource: 'text reply START' });
    expect(Date.parse(on.body.smsConsentAt)).toBeGreaterThanOrEqual(at);
    // Changing something else leaves the consent time alone.
    const other = await frontdesk.patch(`/api/patients/${p.id}`).send({ notes: 'call after 4' });
    expect(other.body.smsConsentAt).toBe(on.body.smsConsentAt);
  });

  it('warns of a patient with the same name and date of birth, whatever the case, and creates it with confirmNew', async () => {
    const first = await create(newPatient());
    const twin = { firstName: first.firstName.toLowerCase(), lastName: first.lastName.toUpperCase(), dateOfBirth: first.dateOfBirth };
    const dup = await frontdesk.post('/api/patients').send(twin);
    expect(dup.status).toBe(409);
    expect(dup.body).toEqual({
      statusCode: 409,
      message: `A patient named ${first.firstName} ${first.lastName} born ${first.dateOfBirth} already exists; use the existing record, or send confirmNew: true to add a new one`,
      existing: [first],
    });
    const other = await create({ ...twin, dateOfBirth: '1992-10-06' });
    expect(other.id).not.toBe(first.id);
    const second = await create({ ...twin, confirmNew: true });
    const third = await frontdesk.post('/api/patients').send(twin);
    expect(third.body.existing.map((p: Patient) => p.id)).toEqual([first.id, second.id]);
  });

  it('warns when a change would make a patient match another, unless confirmed', async () => {
    const a = await create(newPatient());
    const b = await create(newPatient());
    const clash = await frontdesk.patch(`/api/patients/${b.id}`).send({ firstName: a.firstName, lastName: a.lastName });
    expect(clash.status).toBe(409);
    expect(clash.body.existing.map((p: Patient) => p.id)).toEqual([a.id]);
    const ok = await frontdesk.patch(`/api/patients/${b.id}`).send({ firstName: a.firstName, lastName: a.lastName, confirmNew: true });
    expect(ok.status).toBe(200);
  });

  it('searches by name words, e-mail and phone', async () => {
    const p = await create(newPatient({ email: `unique.${uniq()}@example.com`, phone: '(202) 555-0155' }));
    const byLast = (await frontdesk.get(`/api/patients?q=${encodeURIComponent(p.lastName.slice(2))}`)).body;
    expect(byLast.map((x: Patient) => x.id)).toEqual([p.id]);
    const byBoth = (await frontdesk.get(`/api/patients?q=${encodeURIComponent(`${p.firstName} ${p.lastName}`.toUpperCase())}`)).body;
    expect(byBoth.map((x: Patient) => x.id)).toEqual([p.id]);
    const reversed = (await frontdesk.get(`/api/patients?q=${encodeURIComponent(`${p.lastName}, ${p.firstName}`)}`)).body;
    expect(reversed.map((x: Patient) => x.id)).toEqual([p.id]);
    const byMail = (await frontdesk.get(`/api/patients?q=${encodeURIComponent(p.email!)}`)).body;
    expect(byMail.map((x: Patient) => x.id)).toEqual([p.id]);
    const byPhone = (await frontdesk.get('/api/patients?q=2025550155')).body;
    expect(byPhone.map((x: Patient) => x.id)).toContain(p.id);
    // LIKE wildcards in the query are taken literally.
    expect((await frontdesk.get('/api/patients?q=%25')).body).toEqual([]);
    // The demo patients are there (seeds/demo/referrals.json).
    const demo = (await frontdesk.get('/api/patients?q=halloway')).body;
    expect(demo.map((x: Patient) => `${x.firstName} ${x.lastName}`)).toEqual(['Wren Halloway']);
    expect(demo[0].phone).toBe('+12025550130');
  });

  it('lists in name order and honours limit', async () => {
    const all: Patient[] = (await frontdesk.get('/api/patients?limit=200')).body;
    const names = all.map((p) => `${p.lastName}\u0000${p.firstName}`.toLowerCase());
    expect(names).toEqual([...names].sort((a, b) => a.localeCompare(b, 'en')));
    expect((await frontdesk.get('/api/patients?limit=2')).body).toHaveLength(2);
    expect(fieldsOf((await frontdesk.get('/api/patients?limit=0')).body)).toEqual(['limit']);
  });

  it('deletes a patient without referrals and refuses one with referrals', async () => {
    const p = await create(newPatient());
    expect((await frontdesk.delete(`/api/patients/${p.id}`)).status).toBe(204);
    expect((await frontdesk.get(`/api/patients/${p.id}`)).status).toBe(404);
    const locations: LocationSummary[] = (await frontdesk.get('/api/locations')).body;
    const r = await frontdesk.post('/api/referrals').send({
      patient: newPatient(),
      referringDentist: { name: `Dr. Test ${uniq()}` },
      locationId: locations[0]!.id,
      urgency: 'routine',
      procedure: 'consult',
      teeth: [{ tooth: '9' }],
    });
    expect(r.status).toBe(201);
    const refused = await frontdesk.delete(`/api/patients/${r.body.patient.id}`);
    expect(refused.status).toBe(409);
    expect(refused.body.message).toBe(`Patient ${r.body.patient.id} has 1 referral and cannot be deleted`);
  });

  it('lets front desk write, manager read only, and keeps the assistant out', async () => {
    expect((await manager.get('/api/patients?q=a')).status).toBe(200);
    expect((await manager.post('/api/patients').send(newPatient())).status).toBe(403);
    expect((await assistant.get('/api/patients')).status).toBe(403);
    expect((await assistant.get('/api/patients/1')).status).toBe(403);
  });
});
