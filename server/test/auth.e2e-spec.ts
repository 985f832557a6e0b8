import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, DEMO_EMAIL, DEMO_PASSWORD, type TestApp } from './helpers/test-app.js';

describe('sign-in', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp();
  });
  afterAll(async () => t?.close());

  it('signs in a demo user and returns the token and user', async () => {
    const res = await t.http().post('/api/auth/login').send({ email: DEMO_EMAIL.frontdesk, password: DEMO_PASSWORD });
    expect(res.status).toBe(200);
    expect(res.body.user).toMatchObject({ email: DEMO_EMAIL.frontdesk, role: 'frontdesk' });
    expect(typeof res.body.accessToken).toBe('string');
  });

  it('gives one generic 401 for a wrong password and an unknown e-mail', async () => {
    const a = await t.http().post('/api/auth/login').send({ email: DEMO_EMAIL.admin, password: 'not-the-password' });
    const b = await t.http().post('/api/auth/login').send({ email: 'nobody@quillfern-endo.test', password: 'not-the-password' });
    expect(a.status).toBe(401);
    expect(b.status).toBe(401);
    expect(a.body.message).toBe(b.body.message);
  });
});
