import type { Role, UserSummary } from '@ostium/shared';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, DEMO_EMAIL, DEMO_PASSWORD, type TestApp } from './helpers/test-app.js';

type Agent = Awaited<ReturnType<TestApp['as']>>;

const fieldsOf = (body: { errors?: { field: string }[] }) => (body.errors ?? []).map((e) => e.field);

describe('users', () => {
  let t: TestApp;
  let admin: Agent;
  let seq = 0;
  // Each test makes its own colleague so tests do not depend on one another's changes.
  const newEmail = () => `colleague-${++seq}@quillfern-endo.test`;
  const PASSWORD = 'a-long-enough-secret';

  beforeAll(async () => {
    t = await createTestApp();
    admin = await t.as('admin');
  });
  afterAll(async () => t?.close());

  async function createUser(role: Role = 'frontdesk', email = newEmail()): Promise<UserSummary> {
    const res = await admin.post('/api/users').send({ email, name: `Colleague ${seq}`, role, password: PASSWORD });
    expect(res.status).toBe(201);
    return res.body;
  }

  async function signIn(email: string, password = PASSWORD) {
    return t.http().post('/api/auth/login').send({ email, password });
  }

  const me = (token: string) => t.http().get('/api/auth/me').set('Authorization', `Bearer ${token}`);

  it('lists the practice users for the admin, sorted by name, without secrets', async () => {
    const res = await admin.get('/api/users');
    expect(res.status).toBe(200);
    const emails = res.body.map((u: UserSummary) => u.email);
    for (const e of Object.values(DEMO_EMAIL)) expect(emails).toContain(e);
    const names = res.body.map((u: UserSummary) => u.name);
    expect(names).toEqual([...names].sort((a: string, b: string) => (a < b ? -1 : a > b ? 1 : 0)));
    for (const u of res.body) {
      expect(Object.keys(u).sort()).toEqual(['active', 'createdAt', 'email', 'id', 'lastSignInAt', 'name', 'role']);
    }
    expect(JSON.stringify(res.body)).not.toMatch(/passwordHash|tokenVersion|\$argon2/);
  });

  it('filters the list by role and refuses an unknown role naming the field', async () => {
    const endo = await admin.get('/api/users?role=endodontist');
    expect(endo.status).toBe(200);
    expect(endo.body.length).toBeGreaterThan(0);
    expect(endo.body.every((u: UserSummary) => u.role === 'endodontist')).toBe(true);
    const bad = await admin.get('/api/users?role=dentist');
    expect(bad.status).toBe(400);
    expect(fieldsOf(bad.body)).toEqual(['role']);
  });

  it('creates a user with a role (201), who can then sign in with that role', async () => {
    const email = newEmail();
    const res = await admin.post('/api/users').send({ email: `  ${email.toUpperCase()} `, name: '  Quinn Example  ', role: 'assistant', password: PASSWORD });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ email, name: 'Quinn Example', role: 'assistant', active: true, lastSignInAt: null });
    expect(Number.isInteger(res.body.id)).toBe(true);
    expect(new Date(res.body.createdAt).toISOString()).toBe(res.body.createdAt);
    expect(res.body).not.toHaveProperty('passwordHash');

    const login = await signIn(email);
    expect(login.status).toBe(200);
    expect(login.body.user).toEqual({ id: res.body.id, email, name: 'Quinn Example', role: 'assistant' });

    const listed = await admin.get('/api/users');
    const row = listed.body.find((u: UserSummary) => u.id === res.body.id);
    expect(row.lastSignInAt).not.toBeNull();
  });

  it('answers 409 naming email for a duplicate, whatever its case', async () => {
    const u = await createUser();
    for (const email of [u.email, u.email.toUpperCase(), DEMO_EMAIL.manager]) {
      const res = await admin.post('/api/users').send({ email, name: 'Twin', role: 'frontdesk', password: PASSWORD });
      expect(res.status).toBe(409);
      expect(res.body.statusCode).toBe(409);
      expect(fieldsOf(res.body)).toEqual(['email']);
      expect(res.body.message).toContain(email.toLowerCase());
    }
  });

  it('names every bad field on create', async () => {
    const empty = await admin.post('/api/users').send({});
    expect(empty.status).toBe(400);
    expect(new Set(fieldsOf(empty.body))).toEqual(new Set(['email', 'name', 'role', 'password']));

    const bad = await admin.post('/api/users').send({ email: 'not-an-address', name: '   ', role: 'dentist', password: 'short', extra: 1 });
    expect(bad.status).toBe(400);
    expect(new Set(fieldsOf(bad.body))).toEqual(new Set(['email', 'name', 'role', 'password', 'extra']));
    const byField = Object.fromEntries(bad.body.errors.map((e: { field: string; message: string }) => [e.field, e.message]));
    expect(byField.email).toBe('email must be a valid e-mail address');
    expect(byField.name).toBe('name must not be empty');
    expect(byField.role).toBe('role must be one of admin, manager, endodontist, assistant, frontdesk');
    expect(byField.password).toBe('password must be at least 10 characters');
    expect(byField.extra).toBe('extra is not a known field');
  });

  it('names every bad field on update, and refuses to change fields it does not know', async () => {
    const u = await createUser();
    const res = await admin.patch(`/api/users/${u.id}`).send({ name: '', role: 'owner', active: 'yes', password: 'short', email: 'x@example.com' });
    expect(res.status).toBe(400);
    expect(new Set(fieldsOf(res.body))).toEqual(new Set(['name', 'role', 'active', 'password', 'email']));
    const after = (await admin.get('/api/users')).body.find((x: UserSummary) => x.id === u.id);
    expect(after).toEqual(u);
  });

  it('answers 404 for an unknown user and 400 for a non-numeric id', async () => {
    expect((await admin.patch('/api/users/999999').send({ name: 'Nobody' })).status).toBe(404);
    expect((await admin.patch('/api/users/abc').send({ name: 'Nobody' })).status).toBe(400);
  });

  it('renaming keeps the user signed in', async () => {
    const u = await createUser();
    const token = (await signIn(u.email)).body.accessToken;
    const res = await admin.patch(`/api/users/${u.id}`).send({ name: 'Renamed Colleague' });
    expect(res.status).toBe(200);
    expect(res.body.name).toBe('Renamed Colleague');
    const who = await me(token);
    expect(who.status).toBe(200);
    expect(who.body.name).toBe('Renamed Colleague');
  });

  it('changing the role ends the old token at once; a new sign-in carries the new role', async () => {
    const u = await createUser('frontdesk');
    const login = await signIn(u.email);
    const oldToken = login.body.accessToken;
    expect((await me(oldToken)).status).toBe(200);

    const res = await admin.patch(`/api/users/${u.id}`).send({ role: 'manager' });
    expect(res.status).toBe(200);
    expect(res.body.role).toBe('manager');

    expect((await me(oldToken)).status).toBe(401);
    // The session cookie carries the same version, so it cannot mint a token with the old role either.
    const cookie = String(login.headers['set-cookie']).split(';')[0];
    expect((await t.http().post('/api/auth/refresh').set('Cookie', cookie)).status).toBe(401);

    const again = await signIn(u.email);
    expect(again.status).toBe(200);
    expect(again.body.user.role).toBe('manager');
    expect((await me(again.body.accessToken)).body.role).toBe('manager');
  });

  it('changing the password ends the old token and the old password', async () => {
    const u = await createUser();
    const oldToken = (await signIn(u.email)).body.accessToken;
    const res = await admin.patch(`/api/users/${u.id}`).send({ password: 'another-long-secret' });
    expect(res.status).toBe(200);
    expect((await me(oldToken)).status).toBe(401);
    expect((await signIn(u.email)).status).toBe(401);
    expect((await signIn(u.email, 'another-long-secret')).status).toBe(200);
  });

  it('deactivating ends the user’s token at once and stops sign-in; reactivating restores sign-in', async () => {
    const u = await createUser('endodontist');
    const token = (await signIn(u.email)).body.accessToken;
    const asUser = (url: string) => t.http().get(url).set('Authorization', `Bearer ${token}`);
    expect((await asUser('/api/users')).status).toBe(200);

    const res = await admin.patch(`/api/users/${u.id}`).send({ active: false });
    expect(res.status).toBe(200);
    expect(res.body.active).toBe(false);

    expect((await asUser('/api/users')).status).toBe(401);
    expect((await me(token)).status).toBe(401);
    const login = await signIn(u.email);
    expect(login.status).toBe(401);
    // Same message as a wrong password: sign-in does not reveal that the account exists.
    expect(login.body.message).toBe((await signIn('nobody-here@quillfern-endo.test')).body.message);

    expect((await admin.patch(`/api/users/${u.id}`).send({ active: true })).status).toBe(200);
    expect((await me(token)).status).toBe(401);
    expect((await signIn(u.email)).status).toBe(200);
  });

  it('the admin cannot deactivate themself or change their own role (400 naming the field)', async () => {
    const self = (await t.http().get('/api/auth/me').set('Authorization', `Bearer ${await t.token('admin')}`)).body;
    const off = await admin.patch(`/api/users/${self.id}`).send({ active: false });
    expect(off.status).toBe(400);
    expect(fieldsOf(off.body)).toEqual(['active']);
    const demote = await admin.patch(`/api/users/${self.id}`).send({ role: 'manager' });
    expect(demote.status).toBe(400);
    expect(fieldsOf(demote.body)).toEqual(['role']);
    // Nothing changed and the admin is still signed in.
    const still = await me(await t.token('admin'));
    expect(still.status).toBe(200);
    expect(still.body.role).toBe('admin');
    const row = (await admin.get('/api/users')).body.find((x: UserSummary) => x.id === self.id);
    expect(row.active).toBe(true);
  });

  it('non-admins get 403 on create and update, and nothing changes', async () => {
    const target = await createUser();
    for (const role of ['manager', 'endodontist', 'assistant', 'frontdesk'] as const) {
      const agent = await t.as(role);
      const email = newEmail();
      const create = await agent.post('/api/users').send({ email, name: 'Sneaky', role: 'admin', password: PASSWORD });
      expect(create.status).toBe(403);
      const update = await agent.patch(`/api/users/${target.id}`).send({ role: 'admin' });
      expect(update.status).toBe(403);
      expect((await signIn(email)).status).toBe(401);
    }
    const row = (await admin.get('/api/users')).body.find((x: UserSummary) => x.id === target.id);
    expect(row.role).toBe('frontdesk');
  });

  it('the assistant cannot list users', async () => {
    expect((await (await t.as('assistant')).get('/api/users')).status).toBe(403);
  });
});
