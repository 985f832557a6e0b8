import { FACTOR_KEYS } from '@ostium/shared';
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, type TestApp } from './helpers/test-app.js';

const demoCsv = readFileSync(join(dirname(fileURLToPath(import.meta.url)), '..', '..', 'seeds', 'demo', 'visit-history.csv'), 'utf8');
const sum = (xs: { minutes: number }[]) => xs.reduce((s, x) => s + x.minutes, 0);

// The worked cases: a sharply curved, calcified lower second molar with a ledge from an
// earlier attempt, and a straight upper central incisor.
const hardMolar = {
  tooth: '37',
  procedure: 'retreatment',
  assessment: { canalVisibility: 'high' },
  facts: { curvatureDegrees: 35, complications: ['ledge'] },
};
const easyIncisor = { tooth: '11', procedure: 'initial' };

describe('estimates API', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp();
  });
  afterAll(async () => t?.close());

  it('lists every factor with its group and the meaning of each level', async () => {
    const res = await (await t.as('endodontist')).get('/api/estimates/factors');
    expect(res.status).toBe(200);
    expect(res.body.map((f: { key: string }) => f.key).sort()).toEqual([...FACTOR_KEYS].sort());
    for (const f of res.body) {
      expect(['patient', 'tooth', 'additional']).toContain(f.group);
      expect(Object.keys(f.levels).sort()).toEqual(['high', 'low', 'moderate']);
    }
  });

  it('rates the hard molar high: two visits with a microscope, every minute explained', async () => {
    const res = await (await t.as('endodontist')).post('/api/estimates').send(hardMolar);
    expect(res.status).toBe(200);
    expect(res.body.level).toBe('high');
    expect(res.body.cbctSuggested).toBe(true);
    expect(res.body.visits).toHaveLength(2);
    expect(res.body.visits.every((v: { needsMicroscope: boolean }) => v.needsMicroscope)).toBe(true);
    expect(res.body.visits[1].earliestDaysAfterPrevious).toBeGreaterThanOrEqual(7);
    expect(sum(res.body.breakdown)).toBe(res.body.totalMinutes);
    expect(sum(res.body.visits)).toBe(res.body.totalMinutes);
    expect(res.body.tableVersion).toBe(1);
  });

  it('rates the straight upper central incisor low, one visit, no microscope', async () => {
    const res = await (await t.as('frontdesk')).post('/api/estimates').send(easyIncisor);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ level: 'low', canals: 1, canalsAssumed: true, cbctSuggested: false });
    expect(res.body.visits).toHaveLength(1);
    expect(res.body.visits[0].needsMicroscope).toBe(false);
  });

  it('reads Universal numbers when asked (31 is FDI 47; ISO 3950 / HL7 crosswalk)', async () => {
    const api = await t.as('endodontist');
    const a = await api.post('/api/estimates').send({ tooth: '31', notation: 'universal', procedure: 'initial' });
    const b = await api.post('/api/estimates').send({ tooth: '47', procedure: 'initial' });
    expect(a.status).toBe(200);
    expect(a.body.totalMinutes).toBe(b.body.totalMinutes);
  });

  it.each([
    [{ tooth: '19', procedure: 'initial' }, 'tooth'],
    [{ tooth: '36', procedure: 'pulling' }, 'procedure'],
    [{ tooth: '36', procedure: 'initial', assessment: { sparkle: 'low' } }, 'assessment.sparkle'],
    [{ tooth: '36', procedure: 'initial', assessment: { disposition: 'extreme' } }, 'assessment.disposition'],
    [{ tooth: '36', procedure: 'initial', canals: 0 }, 'canals'],
    [{ tooth: '36', procedure: 'initial', colour: 'red' }, 'colour'],
  ])('answers 400 naming the field for %j', async (body, field) => {
    const res = await (await t.as('endodontist')).post('/api/estimates').send(body);
    expect(res.status).toBe(400);
    expect(res.body.errors.map((e: { field: string }) => e.field)).toContain(field);
  });

  it('refuses the assistant (no estimates for that role)', async () => {
    const res = await (await t.as('assistant')).post('/api/estimates').send(easyIncisor);
    expect(res.status).toBe(403);
  });

  it('imports nothing from a file with one bad line, and names the line', async () => {
    const lines = demoCsv.trim().split('\n').slice(0, 6);
    lines[3] = '2026-07-01,19,initial,3,extreme,endo@quillfern-endo.test,80';
    const admin = await t.as('admin');
    const res = await admin.post('/api/visit-history/import').attach('file', Buffer.from(lines.join('\n')), 'history.csv');
    expect(res.status).toBe(400);
    expect(res.body.message).toContain('line 4');
    expect(res.body.errors).toEqual([{ field: 'line 4', message: 'level must be low, moderate or high' }]);
    const acc = await admin.get('/api/estimates/accuracy');
    expect(acc.body).toEqual([]);
  });

  it('learns from the demo history: estimates change and the error falls', async () => {
    const admin = await t.as('admin');
    const endo2 = (await admin.get('/api/users?role=endodontist')).body.find((u: { email: string }) => u.email.startsWith('endo2@'));
    const before = await admin.post('/api/estimates').send({ tooth: '19', notation: 'universal', procedure: 'initial', operatorId: endo2.id });
    const res = await admin.post('/api/visit-history/import').attach('file', Buffer.from(demoCsv), 'visit-history.csv');
    expect(res.status).toBe(201);
    expect(res.body.imported).toBe(demoCsv.trim().split('\n').length - 1);
    const after = await admin.post('/api/estimates').send({ tooth: '19', notation: 'universal', procedure: 'initial', operatorId: endo2.id });
    // endo2 is slower than the table in the demo history, so the booked length grows.
    expect(after.body.totalMinutes).toBeGreaterThan(before.body.totalMinutes);
    const acc = (await admin.get('/api/estimates/accuracy')).body as { count: number; before: { meanAbsoluteError: number }; after: { meanAbsoluteError: number } }[];
    const weighted = (k: 'before' | 'after') => acc.reduce((s, c) => s + c[k].meanAbsoluteError * c.count, 0) / acc.reduce((s, c) => s + c.count, 0);
    expect(weighted('after')).toBeLessThan(weighted('before'));
  });

  it('saves the estimate table as a new version that estimates then name', async () => {
    const admin = await t.as('admin');
    const current = await admin.get('/api/settings/estimate-table');
    expect(current.status).toBe(200);
    const table = { ...current.body.table, turnoverMinutes: 15 };
    const saved = await admin.put('/api/settings/estimate-table').send(table);
    expect(saved.status).toBe(200);
    expect(saved.body.version).toBe(current.body.version + 1);
    expect(saved.body.versions.length).toBe(current.body.versions.length + 1);
    const est = await admin.post('/api/estimates').send(easyIncisor);
    expect(est.body.tableVersion).toBe(saved.body.version);
    expect(est.body.visits[0].turnoverMinutes).toBe(15);
  });

  it('rejects a table with an unknown or invalid setting, naming it', async () => {
    const admin = await t.as('admin');
    const { table } = (await admin.get('/api/settings/estimate-table')).body;
    const a = await admin.put('/api/settings/estimate-table').send({ ...table, sparkle: 1 });
    expect(a.status).toBe(400);
    expect(a.body.errors[0].field).toBe('table.sparkle');
    const b = await admin.put('/api/settings/estimate-table').send({ ...table, gridMinutes: 0 });
    expect(b.status).toBe(400);
    expect(b.body.errors[0].field).toBe('table.gridMinutes');
    const c = await (await t.as('manager')).put('/api/settings/estimate-table').send(table);
    expect(c.status).toBe(403);
  });
});
