import type { AuditEntry, Page, UserSummary } from '@ostium/shared';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, DEMO_EMAIL, type TestApp } from './helpers/test-app.js';

type Agent = Awaited<ReturnType<TestApp['as']>>;

describe('audit log', () => {
  let t: TestApp;
  let admin: Agent;
  let adminId: number;
  let created: UserSummary;
  let createdAt: { before: number; after: number };
  let updatedAt: { before: number; after: number };
  const REQUEST_ID = 'audit-test-create-0001';

  const list = async (query = ''): Promise<Page<AuditEntry>> => {
    const res = await admin.get(`/api/audit${query}`);
    expect(res.status).toBe(200);
    return res.body;
  };

  beforeAll(async () => {
    t = await createTestApp();
    admin = await t.as('admin');
    adminId = (await admin.get('/api/auth/me')).body.id;

    const t0 = Date.now();
    const res = await admin
      .post('/api/users')
      .set('X-Request-Id', REQUEST_ID)
      .send({ email: 'audited.colleague@quillfern-endo.test', name: 'Audited Colleague', role: 'frontdesk', password: 'a-long-enough-secret' });
    expect(res.status).toBe(201);
    created = res.body;
    createdAt = { before: t0, after: Date.now() };

    // A gap, so the create and the update fall on different milliseconds for the from/to filters.
    await new Promise((r) => setTimeout(r, 20));
    const t1 = Date.now();
    const upd = await admin.patch(`/api/users/${created.id}`).send({ role: 'manager', name: 'Audited Manager' });
    expect(upd.status).toBe(200);
    updatedAt = { before: t1, after: Date.now() };
  });
  afterAll(async () => t?.close());

  const forCreated = (page: Page<AuditEntry>) => page.items.filter((e) => e.entity === 'users' && e.entityId === String(created.id));

  it('records the creation: who, when, what, with the password hash redacted', async () => {
    const entry = forCreated(await list()).find((e) => e.action === 'create');
    expect(entry).toBeDefined();
    expect(entry).toMatchObject({ userId: adminId, userEmail: DEMO_EMAIL.admin, action: 'create', entity: 'users', entityId: String(created.id), before: null });
    const at = Date.parse(entry!.at);
    expect(new Date(at).toISOString()).toBe(entry!.at);
    // The database keeps milliseconds, so allow the rounding of one.
    expect(at).toBeGreaterThanOrEqual(createdAt.before - 1);
    expect(at).toBeLessThanOrEqual(createdAt.after + 1);
    expect(entry!.after).toMatchObject({ id: created.id, email: 'audited.colleague@quillfern-endo.test', name: 'Audited Colleague', role: 'frontdesk', active: true });
    expect(entry!.after!.passwordHash).toBe('[redacted]');
    expect(entry!.requestId).toBe(REQUEST_ID);
  });

  it('records the update with only the changed values, before and after', async () => {
    const entry = forCreated(await list()).find((e) => e.action === 'update' && e.userId === adminId);
    expect(entry).toBeDefined();
    expect(entry).toMatchObject({ userEmail: DEMO_EMAIL.admin, entity: 'users', entityId: String(created.id) });
    expect(entry!.before).toMatchObject({ role: 'frontdesk', name: 'Audited Colleague' });
    expect(entry!.after).toMatchObject({ role: 'manager', name: 'Audited Manager' });
    // The role change bumps the token version; its value is kept out of the log.
    expect(entry!.after!.tokenVersion).toBe('[redacted]');
    expect(entry!.before).not.toHaveProperty('email');
    expect(entry!.after).not.toHaveProperty('email');
    const at = Date.parse(entry!.at);
    expect(at).toBeGreaterThanOrEqual(updatedAt.before - 1);
    expect(at).toBeLessThanOrEqual(updatedAt.after + 1);
  });

  it('redacts a password change on both sides and never shows a hash', async () => {
    const res = await admin.patch(`/api/users/${created.id}`).send({ password: 'another-long-secret' });
    expect(res.status).toBe(200);
    const page = await list(`?entity=users&entityId=${created.id}`);
    const entry = page.items.find((e) => e.action === 'update' && e.after && 'passwordHash' in e.after);
    expect(entry).toBeDefined();
    expect(entry!.before!.passwordHash).toBe('[redacted]');
    expect(entry!.after!.passwordHash).toBe('[redacted]');
    expect(JSON.stringify(await list('?pageSize=500'))).not.toMatch(/\$argon2/);
  });

  it('lists newest first, with the page fields', async () => {
    const page = await list();
    expect(Object.keys(page).sort()).toEqual(['items', 'page', 'pageSize', 'total']);
    expect(page).toMatchObject({ page: 1, pageSize: 50 });
    expect(page.total).toBeGreaterThanOrEqual(page.items.length);
    const times = page.items.map((e) => Date.parse(e.at));
    expect(times).toEqual([...times].sort((a, b) => b - a));
    for (const e of page.items) {
      expect(Object.keys(e).sort()).toEqual(['action', 'after', 'at', 'before', 'entity', 'entityId', 'id', 'requestId', 'userEmail', 'userId']);
    }
  });

  it('pages through the entries', async () => {
    const all = await list('?pageSize=500');
    expect(all.total).toBeGreaterThanOrEqual(2);
    const first = await list('?pageSize=1&page=1');
    const second = await list('?pageSize=1&page=2');
    expect(first.items).toHaveLength(1);
    expect(first.total).toBe(all.total);
    expect(first.items[0]).toEqual(all.items[0]);
    expect(second.items[0]).toEqual(all.items[1]);
  });

  it('filters by user', async () => {
    const mine = await list(`?userId=${adminId}&pageSize=500`);
    expect(mine.items.length).toBeGreaterThanOrEqual(2);
    expect(mine.items.every((e) => e.userId === adminId)).toBe(true);
    const nobody = await list('?userId=999999');
    expect(nobody).toMatchObject({ items: [], total: 0 });
  });

  it('filters by entity and entity id', async () => {
    const users = await list('?entity=users&pageSize=500');
    expect(users.items.length).toBeGreaterThanOrEqual(2);
    expect(users.items.every((e) => e.entity === 'users')).toBe(true);
    const one = await list(`?entity=users&entityId=${created.id}&pageSize=500`);
    expect(one.items.length).toBeGreaterThanOrEqual(3);
    expect(one.items.every((e) => e.entityId === String(created.id))).toBe(true);
    expect((await list('?entity=no_such_table')).total).toBe(0);
  });

  it('filters by time: from is inclusive, to is exclusive', async () => {
    const one = await list(`?entity=users&entityId=${created.id}&pageSize=500`);
    const creation = one.items.find((e) => e.action === 'create')!;
    const update = one.items.find((e) => e.action === 'update' && e.after?.role === 'manager')!;
    expect(Date.parse(update.at)).toBeGreaterThan(Date.parse(creation.at));

    const fromCreation = await list(`?entity=users&entityId=${created.id}&from=${encodeURIComponent(creation.at)}&pageSize=500`);
    expect(fromCreation.items.map((e) => e.id)).toContain(creation.id);
    const toCreation = await list(`?entity=users&entityId=${created.id}&to=${encodeURIComponent(creation.at)}&pageSize=500`);
    expect(toCreation.items.map((e) => e.id)).not.toContain(creation.id);

    const fromUpdate = await list(`?entity=users&entityId=${created.id}&from=${encodeURIComponent(update.at)}&pageSize=500`);
    expect(fromUpdate.items.map((e) => e.id)).toContain(update.id);
    expect(fromUpdate.items.map((e) => e.id)).not.toContain(creation.id);

    const window = await list(`?entity=users&entityId=${created.id}&from=${encodeURIComponent(creation.at)}&to=${encodeURIComponent(update.at)}&pageSize=500`);
    expect(window.items.map((e) => e.id)).toEqual([creation.id]);

    const future = new Date(Date.now() + 3_600_000).toISOString();
    expect((await list(`?from=${encodeURIComponent(future)}`)).total).toBe(0);
  });

  it('names the bad query field', async () => {
    for (const [query, field] of [
      ['?from=yesterday', 'from'],
      ['?to=2026-13-45', 'to'],
      ['?userId=abc', 'userId'],
      ['?pageSize=501', 'pageSize'],
      ['?page=0', 'page'],
      ['?colour=blue', 'colour'],
    ] as const) {
      const res = await admin.get(`/api/audit${query}`);
      expect(res.status, query).toBe(400);
      expect(res.body.errors.map((e: { field: string }) => e.field), query).toContain(field);
    }
  });

  it('only the admin can read it', async () => {
    for (const role of ['manager', 'endodontist', 'assistant', 'frontdesk'] as const) {
      const res = await (await t.as(role)).get('/api/audit');
      expect(res.status, role).toBe(403);
    }
    expect((await t.http().get('/api/audit')).status).toBe(401);
  });

  it('records nothing for a refused change', async () => {
    // Sign the manager in first: a sign-in itself records the new last-sign-in time.
    const manager = await t.as('manager');
    const before = (await list('?pageSize=500')).total;
    const res = await manager.patch(`/api/users/${created.id}`).send({ role: 'admin' });
    expect(res.status).toBe(403);
    const bad = await admin.patch(`/api/users/${created.id}`).send({ role: 'owner' });
    expect(bad.status).toBe(400);
    expect((await list('?pageSize=500')).total).toBe(before);
  });
});
