import { JwtService } from '@nestjs/jwt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, DEMO_EMAIL, DEMO_PASSWORD, type TestApp } from './helpers/test-app.js';

const BAD_LOGIN = 'The e-mail or password is not right';
const REFRESH_COOKIE = 'ostium_refresh';

/** The `ostium_refresh` Set-Cookie line of a response, if any. */
function refreshCookieLine(res: { headers: Record<string, unknown> }): string | undefined {
  const raw = res.headers['set-cookie'];
  const lines = Array.isArray(raw) ? (raw as string[]) : typeof raw === 'string' ? [raw] : [];
  return lines.find((l) => l.startsWith(`${REFRESH_COOKIE}=`));
}

/** Just `name=value`, ready for a Cookie request header. */
const cookiePair = (line: string) => line.split(';')[0];

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

  it('answers exactly {accessToken, user:{id,email,name,role}} and nothing more', async () => {
    const res = await t.http().post('/api/auth/login').send({ email: DEMO_EMAIL.manager, password: DEMO_PASSWORD });
    expect(res.status).toBe(200);
    expect(Object.keys(res.body).sort()).toEqual(['accessToken', 'user']);
    expect(Object.keys(res.body.user).sort()).toEqual(['email', 'id', 'name', 'role']);
    expect(res.body.user).toMatchObject({ email: DEMO_EMAIL.manager, role: 'manager' });
    expect(Number.isInteger(res.body.user.id)).toBe(true);
    expect(res.body.user.name).toEqual(expect.any(String));
    expect(res.body.user.name.length).toBeGreaterThan(0);
    // A compact JWT: three base64url parts.
    expect(res.body.accessToken).toMatch(/^[\w-]+\.[\w-]+\.[\w-]+$/);
  });

  it('accepts the e-mail in any case and with surrounding spaces', async () => {
    const res = await t.http().post('/api/auth/login').send({ email: `  ${DEMO_EMAIL.endodontist.toUpperCase()} `, password: DEMO_PASSWORD });
    expect(res.status).toBe(200);
    expect(res.body.user.email).toBe(DEMO_EMAIL.endodontist);
  });

  it('sets the refresh cookie HttpOnly, SameSite=Strict and scoped to /api/auth', async () => {
    const res = await t.http().post('/api/auth/login').send({ email: DEMO_EMAIL.admin, password: DEMO_PASSWORD });
    const line = refreshCookieLine(res);
    expect(line).toBeDefined();
    expect(line).toMatch(/;\s*HttpOnly/i);
    expect(line).toMatch(/;\s*SameSite=Strict/i);
    expect(line).toMatch(/;\s*Path=\/api\/auth(;|$)/i);
    // The refresh token must not also be handed to scripts in the body.
    expect(JSON.stringify(res.body)).not.toContain(cookiePair(line!).split('=')[1]);
  });

  it('gives one generic 401 for a wrong password and an unknown e-mail', async () => {
    const a = await t.http().post('/api/auth/login').send({ email: DEMO_EMAIL.admin, password: 'not-the-password' });
    const b = await t.http().post('/api/auth/login').send({ email: 'nobody@quillfern-endo.test', password: 'not-the-password' });
    expect(a.status).toBe(401);
    expect(b.status).toBe(401);
    expect(a.body.message).toBe(b.body.message);
    expect(a.body).toEqual({ statusCode: 401, message: BAD_LOGIN });
    expect(b.body).toEqual({ statusCode: 401, message: BAD_LOGIN });
    expect(refreshCookieLine(a)).toBeUndefined();
  });

  it.each([
    ['email', { password: DEMO_PASSWORD }],
    ['password', { email: DEMO_EMAIL.admin }],
    ['email', { email: '', password: DEMO_PASSWORD }],
    ['password', { email: DEMO_EMAIL.admin, password: '' }],
    ['email', { email: 42, password: DEMO_PASSWORD }],
  ])('answers 400 naming %s for %j', async (field, body) => {
    const res = await t.http().post('/api/auth/login').send(body);
    expect(res.status).toBe(400);
    expect(Object.keys(res.body).sort()).toEqual(['errors', 'message', 'statusCode']);
    expect(res.body.statusCode).toBe(400);
    expect(res.body.message).toEqual(expect.stringContaining(field));
    expect(res.body.errors.length).toBeGreaterThan(0);
    for (const e of res.body.errors) expect(Object.keys(e).sort()).toEqual(['field', 'message']);
    expect(res.body.errors.map((e: { field: string }) => e.field)).toContain(field);
  });

  it('names both fields when the body is empty', async () => {
    const res = await t.http().post('/api/auth/login').send({});
    expect(res.status).toBe(400);
    const fields = new Set(res.body.errors.map((e: { field: string }) => e.field));
    expect(fields).toEqual(new Set(['email', 'password']));
  });

  it('answers 400 naming an unknown field instead of ignoring it', async () => {
    const res = await t.http().post('/api/auth/login').send({ email: DEMO_EMAIL.admin, password: DEMO_PASSWORD, role: 'admin' });
    expect(res.status).toBe(400);
    expect(res.body.errors).toEqual([{ field: 'role', message: 'role is not a known field' }]);
  });

  describe('GET /api/auth/me', () => {
    it('returns the signed-in user for a valid token', async () => {
      const login = await t.http().post('/api/auth/login').send({ email: DEMO_EMAIL.assistant, password: DEMO_PASSWORD });
      const res = await t.http().get('/api/auth/me').set('Authorization', `Bearer ${login.body.accessToken}`);
      expect(res.status).toBe(200);
      expect(res.body).toEqual(login.body.user);
    });

    it('answers 401 without a token', async () => {
      const res = await t.http().get('/api/auth/me');
      expect(res.status).toBe(401);
      expect(res.body.statusCode).toBe(401);
      expect(res.body.message).toMatch(/sign in/i);
    });

    it('answers 401 for a malformed token and for a non-bearer scheme', async () => {
      const token = await t.token('admin');
      const garbage = await t.http().get('/api/auth/me').set('Authorization', 'Bearer not.a.token');
      const basic = await t.http().get('/api/auth/me').set('Authorization', `Basic ${token}`);
      expect(garbage.status).toBe(401);
      expect(basic.status).toBe(401);
    });
  });

  describe('tokens', () => {
    // The same secret testConfig() gives the app, so only the property under test differs.
    const sameSecret = new JwtService({ secret: 'test-secret' });

    async function realPayload() {
      const token = await t.token('frontdesk');
      const { sub, tv, typ } = sameSecret.decode(token) as { sub: number; tv: number; typ: string };
      return { sub, tv, typ };
    }

    it('accepts a token signed here with the app secret (control for the cases below)', async () => {
      const forged = await sameSecret.signAsync(await realPayload(), { expiresIn: 60 });
      const res = await t.http().get('/api/auth/me').set('Authorization', `Bearer ${forged}`);
      expect(res.status).toBe(200);
      expect(res.body.email).toBe(DEMO_EMAIL.frontdesk);
    });

    it('answers 401 for an expired token', async () => {
      const now = Math.floor(Date.now() / 1000);
      const expired = await sameSecret.signAsync({ ...(await realPayload()), iat: now - 120, exp: now - 60 });
      const res = await t.http().get('/api/auth/me').set('Authorization', `Bearer ${expired}`);
      expect(res.status).toBe(401);
    });

    it('answers 401 for a token signed with another secret', async () => {
      const other = new JwtService({ secret: 'some-other-secret' });
      const token = await other.signAsync(await realPayload(), { expiresIn: 60 });
      const res = await t.http().get('/api/auth/me').set('Authorization', `Bearer ${token}`);
      expect(res.status).toBe(401);
    });

    it('answers 401 for an unsigned ("alg": "none") token', async () => {
      const b64 = (o: object) => Buffer.from(JSON.stringify(o)).toString('base64url');
      const now = Math.floor(Date.now() / 1000);
      const token = `${b64({ alg: 'none', typ: 'JWT' })}.${b64({ ...(await realPayload()), iat: now, exp: now + 60 })}.`;
      const res = await t.http().get('/api/auth/me').set('Authorization', `Bearer ${token}`);
      expect(res.status).toBe(401);
    });

    it('does not accept a refresh token as an access token', async () => {
      const login = await t.http().post('/api/auth/login').send({ email: DEMO_EMAIL.frontdesk, password: DEMO_PASSWORD });
      const refresh = cookiePair(refreshCookieLine(login)!).slice(REFRESH_COOKIE.length + 1);
      const res = await t.http().get('/api/auth/me').set('Authorization', `Bearer ${refresh}`);
      expect(res.status).toBe(401);
    });
  });

  describe('refresh', () => {
    it('gives a new working access token for the cookie set at sign-in', async () => {
      const login = await t.http().post('/api/auth/login').send({ email: DEMO_EMAIL.endodontist, password: DEMO_PASSWORD });
      const line = refreshCookieLine(login);
      expect(line).toBeDefined();
      const res = await t.http().post('/api/auth/refresh').set('Cookie', cookiePair(line!));
      expect(res.status).toBe(200);
      expect(Object.keys(res.body).sort()).toEqual(['accessToken', 'user']);
      expect(res.body.user).toEqual(login.body.user);
      // The session cookie is renewed along with the access token.
      expect(refreshCookieLine(res)).toBeDefined();
      const me = await t.http().get('/api/auth/me').set('Authorization', `Bearer ${res.body.accessToken}`);
      expect(me.status).toBe(200);
      expect(me.body.email).toBe(DEMO_EMAIL.endodontist);
    });

    it('answers 401 without the cookie', async () => {
      const res = await t.http().post('/api/auth/refresh');
      expect(res.status).toBe(401);
      expect(res.body.message).toMatch(/sign in again/i);
    });

    it('answers 401 for a garbage cookie and for an access token put in the cookie', async () => {
      const access = await t.token('admin');
      const garbage = await t.http().post('/api/auth/refresh').set('Cookie', `${REFRESH_COOKIE}=nonsense`);
      const wrongKind = await t.http().post('/api/auth/refresh').set('Cookie', `${REFRESH_COOKIE}=${access}`);
      expect(garbage.status).toBe(401);
      expect(wrongKind.status).toBe(401);
    });

    it('sign-out answers 204 and expires the cookie', async () => {
      const res = await t.http().post('/api/auth/logout');
      expect(res.status).toBe(204);
      const line = refreshCookieLine(res);
      expect(line).toBeDefined();
      expect(line).toMatch(/^ostium_refresh=;/);
      expect(line).toMatch(/Expires=Thu, 01 Jan 1970/i);
    });
  });
});

describe('sign-in rate limit', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp({ loginRateLimit: { limit: 3, ttlMs: 60_000 } });
  });
  afterAll(async () => t?.close());

  it('answers 429 with a clear message on the 4th attempt for one e-mail, and still for the right password', async () => {
    const attempt = (password: string) => t.http().post('/api/auth/login').send({ email: DEMO_EMAIL.manager, password });
    for (let i = 0; i < 3; i++) expect((await attempt('wrong-password-guess')).status).toBe(401);
    const fourth = await attempt('wrong-password-guess');
    expect(fourth.status).toBe(429);
    expect(fourth.body).toEqual({ statusCode: 429, message: 'Too many sign-in attempts; wait a minute and try again' });
    // Guessing is slowed down for the account, so even the right password waits out the window.
    expect((await attempt(DEMO_PASSWORD)).status).toBe(429);
  });

  it('counts each e-mail on its own (case-insensitively), so other users can still sign in', async () => {
    const res = await t.http().post('/api/auth/login').send({ email: DEMO_EMAIL.frontdesk, password: DEMO_PASSWORD });
    expect(res.status).toBe(200);
    const sameAccount = await t.http().post('/api/auth/login').send({ email: DEMO_EMAIL.manager.toUpperCase(), password: DEMO_PASSWORD });
    expect(sameAccount.status).toBe(429);
  });

  it('does not limit other routes', async () => {
    for (let i = 0; i < 5; i++) expect((await t.http().get('/api/health')).status).toBe(200);
  });
});
