import type { LocationSummary, ReferringDentist } from '@ostium/shared';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, type TestApp } from './helpers/test-app.js';

type Agent = Awaited<ReturnType<TestApp['as']>>;

const fieldsOf = (body: { errors?: { field: string }[] }) => [...new Set((body.errors ?? []).map((e) => e.field))].sort();

let seq = 0;
const uniq = () => `${Date.now().toString(36)}${(++seq).toString(36)}`.replace(/\d/g, (d) => 'abcdefghij'[Number(d)]!);

describe('referring dentists', () => {
  let t: TestApp;
  let frontdesk: Agent;
  let admin: Agent;
  let manager: Agent;
  let assistant: Agent;
  let locationId: number;

  beforeAll(async () => {
    t = await createTestApp();
    [frontdesk, admin, manager, assistant] = await Promise.all([t.as('frontdesk'), t.as('admin'), t.as('manager'), t.as('assistant')]);
    locationId = ((await frontdesk.get('/api/locations')).body as LocationSummary[])[0]!.id;
  });
  afterAll(async () => t?.close());

  async function create(body: Record<string, unknown>): Promise<ReferringDentist> {
    const res = await frontdesk.post('/api/referring-dentists').send(body);
    if (res.status !== 201) throw new Error(`create dentist: ${res.status} ${JSON.stringify(res.body)}`);
    return res.body;
  }

  async function refer(referringDentistId: number): Promise<number> {
    const res = await frontdesk.post('/api/referrals').send({
      patient: { firstName: `Ansel${uniq()}`, lastName: `Brightwater${uniq()}`, dateOfBirth: '1970-01-20' },
      referringDentistId,
      locationId,
      urgency: 'routine',
      procedure: 'initial',
      teeth: [{ tooth: '14' }],
    });
    if (res.status !== 201) throw new Error(`refer: ${res.status} ${JSON.stringify(res.body)}`);
    return res.body.id;
  }

  it('adds a referring dentist with defaults and answers the ReferringDentist shape', async () => {
    const name = `Dr. Marguerite Sallow-${uniq()}`;
    const d = await create({ name: `  ${name} `, practiceName: 'Fernhollow Dental', email: 'M.Sallow@Fernhollow.test', phone: '(202) 555-0160' });
    expect(d).toEqual({
      id: expect.any(Number),
      name,
      practiceName: 'Fernhollow Dental',
      email: 'm.sallow@fernhollow.test',
      phone: '+12025550160',
      address: null,
      letterChannel: 'email',
      notes: null,
      referralCount: 0,
      createdAt: expect.any(String),
    });
    expect((await frontdesk.get(`/api/referring-dentists/${d.id}`)).body).toEqual(d);
  });

  it('names each bad field', async () => {
    const res = await frontdesk.post('/api/referring-dentists').send({ name: ' ', email: 'x@', phone: 'fax me', letterChannel: 'pigeon', website: 'x' });
    expect(res.status).toBe(400);
    expect(fieldsOf(res.body)).toEqual(['email', 'letterChannel', 'name', 'phone', 'website']);
    const patch = await frontdesk.patch('/api/referring-dentists/1').send({ phone: '12' });
    expect(fieldsOf(patch.body)).toEqual(['phone']);
  });

  it('changes fields and clears them with null or an empty string', async () => {
    const d = await create({ name: `Dr. Keir Ambry-${uniq()}`, practiceName: 'Old Name', notes: 'x' });
    const res = await frontdesk.patch(`/api/referring-dentists/${d.id}`).send({ practiceName: 'Stonecrop Dental', notes: '', letterChannel: 'post', address: null });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ practiceName: 'Stonecrop Dental', notes: null, letterChannel: 'post', address: null });
    expect((await frontdesk.patch('/api/referring-dentists/999999').send({ notes: 'x' })).status).toBe(404);
  });

  it('searches by words of the name and practice, e-mail and phone', async () => {
    const tag = uniq();
    const d = await create({ name: `Dr. Sorrel Quince${tag}`, practiceName: `Brindle${tag} Dental`, email: `sorrel.${tag}@brindle.test`, phone: '(202) 555-0162' });
    const ids = async (q: string) => ((await frontdesk.get(`/api/referring-dentists?q=${encodeURIComponent(q)}`)).body as ReferringDentist[]).map((x) => x.id);
    expect(await ids(`quince${tag}`)).toEqual([d.id]);
    expect(await ids(`sorrel brindle${tag}`)).toEqual([d.id]);
    expect(await ids(`sorrel.${tag}@brindle.test`)).toEqual([d.id]);
    expect(await ids('555-0162')).toContain(d.id);
    expect(await ids(`nobody${tag}`)).toEqual([]);
    // The demo dentists are there with their referral counts (seeds/demo/referrals.json).
    const farrow: ReferringDentist[] = (await frontdesk.get('/api/referring-dentists?q=farrow')).body;
    expect(farrow.map((x) => [x.name, x.practiceName, x.referralCount])).toEqual([['Dr. Ottilie Farrow', 'Larchmere Family Dental', 3]]);
  });

  it('merges a duplicate: its referrals move over, blank fields are filled from it, and it is removed', async () => {
    const keep = await create({ name: `Dr. Ines Thackery-${uniq()}`, practiceName: 'Rookwood Dental' });
    const dup = await create({ name: 'Dr. I. Thackery', practiceName: 'Rookwood Dental Care', email: `ines.${uniq()}@rookwood.test`, phone: '(202) 555-0163' });
    const r1 = await refer(keep.id);
    const r2 = await refer(dup.id);
    const r3 = await refer(dup.id);

    const res = await frontdesk.post(`/api/referring-dentists/${keep.id}/merge`).send({ otherId: dup.id });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ id: keep.id, name: keep.name, practiceName: 'Rookwood Dental', email: dup.email, phone: '+12025550163', referralCount: 3 });
    expect((await frontdesk.get(`/api/referring-dentists/${dup.id}`)).status).toBe(404);
    for (const id of [r1, r2, r3]) expect((await frontdesk.get(`/api/referrals/${id}`)).body.referringDentist.id).toBe(keep.id);
    const queue = await frontdesk.get(`/api/referrals?referringDentistId=${keep.id}`);
    expect(queue.body.total).toBe(3);

    // Each moved referral is in the audit log as an update of referring_dentist_id.
    const audit = await admin.get(`/api/audit?entity=referrals&entityId=${r2}`);
    expect(audit.body.items.some((e: { action: string; after: Record<string, unknown> | null }) => e.action === 'update' && e.after?.referringDentistId === keep.id)).toBe(true);
    const gone = await admin.get(`/api/audit?entity=referring_dentists&entityId=${dup.id}`);
    expect(gone.body.items.map((e: { action: string }) => e.action)).toContain('delete');
  });

  it('refuses merging a record with itself or with one that does not exist', async () => {
    const d = await create({ name: `Dr. Lowen Parr-${uniq()}` });
    const self = await frontdesk.post(`/api/referring-dentists/${d.id}/merge`).send({ otherId: d.id });
    expect(self.status).toBe(400);
    expect(self.body.errors).toEqual([{ field: 'otherId', message: 'must be a different record' }]);
    const missing = await frontdesk.post(`/api/referring-dentists/${d.id}/merge`).send({ otherId: 999999 });
    expect(missing.status).toBe(400);
    expect(fieldsOf(missing.body)).toEqual(['otherId']);
    expect((await frontdesk.post(`/api/referring-dentists/999999/merge`).send({ otherId: d.id })).status).toBe(404);
    expect(fieldsOf((await frontdesk.post(`/api/referring-dentists/${d.id}/merge`).send({})).body)).toEqual(['otherId']);
    expect((await frontdesk.get(`/api/referring-dentists/${d.id}`)).status).toBe(200);
  });

  it('deletes a record without referrals and points to merging for one with referrals', async () => {
    const d = await create({ name: `Dr. Faye Underhill-${uniq()}` });
    expect((await frontdesk.delete(`/api/referring-dentists/${d.id}`)).status).toBe(204);
    const used = await create({ name: `Dr. Faye Overhill-${uniq()}` });
    await refer(used.id);
    const refused = await frontdesk.delete(`/api/referring-dentists/${used.id}`);
    expect(refused.status).toBe(409);
    expect(refused.body.message).toMatch(/has 1 referral; merge the record into another/);
  });

  it('lets front desk and admin write, manager read only, and keeps the assistant out', async () => {
    expect((await admin.post('/api/referring-dentists').send({ name: `Dr. Admin Added-${uniq()}` })).status).toBe(201);
    expect((await manager.get('/api/referring-dentists')).status).toBe(200);
    expect((await manager.post('/api/referring-dentists').send({ name: 'Dr. Nope' })).status).toBe(403);
    expect((await manager.post('/api/referring-dentists/1/merge').send({ otherId: 2 })).status).toBe(403);
    expect((await assistant.get('/api/referring-dentists')).status).toBe(403);
  });
});
