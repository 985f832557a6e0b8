import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, DEMO_EMAIL, DEMO_PASSWORD, type TestApp } from './helpers/test-app.js';

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;

describe('errors, headers and the API document', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp();
  });
  afterAll(async () => t?.close());

  describe('malformed JSON', () => {
    it.each([['{"email": '], ['{bad json}'], ['not json at all']])('answers 400 JSON saying the body is not JSON for %s', async (raw) => {
      const res = await t.http().post('/api/auth/login').set('Content-Type', 'application/json').send(raw);
      expect(res.status).toBe(400);
      expect(res.headers['content-type']).toMatch(/^application\/json/);
      expect(res.body.statusCode).toBe(400);
      expect(res.body.message).toBe('The request body is not valid JSON');
    });

    it('does so on a signed-in route as well, before any handler runs', async () => {
      const admin = await t.as('admin');
      const res = await admin.post('/api/users').set('Content-Type', 'application/json').send('{"email":');
      expect(res.status).toBe(400);
      expect(res.body.message).toMatch(/JSON/);
    });
  });

  describe('unknown routes', () => {
    it('answers 404 with a JSON error body, signed in or not', async () => {
      const anon = await t.http().get('/api/no-such-thing');
      const signedIn = await (await t.as('admin')).get('/api/no-such-thing');
      for (const res of [anon, signedIn]) {
        expect(res.status).toBe(404);
        expect(res.headers['content-type']).toMatch(/^application\/json/);
        expect(res.body).toEqual({ statusCode: 404, message: 'Cannot GET /api/no-such-thing' });
      }
    });

    it('answers 404 for a known path with a method it does not have', async () => {
      const res = await t.http().delete('/api/health');
      expect(res.status).toBe(404);
      expect(res.body.statusCode).toBe(404);
    });
  });

  describe('very large bodies', () => {
    it('answers 413 JSON and keeps serving', async () => {
      const huge = JSON.stringify({ email: DEMO_EMAIL.admin, password: 'x'.repeat(2 * 1024 * 1024) });
      const res = await t.http().post('/api/auth/login').set('Content-Type', 'application/json').send(huge);
      expect(res.status).toBe(413);
      expect(res.body.statusCode).toBe(413);
      expect(typeof res.body.message).toBe('string');
      const after = await t.http().post('/api/auth/login').send({ email: DEMO_EMAIL.admin, password: DEMO_PASSWORD });
      expect(after.status).toBe(200);
    });
  });

  describe('security headers', () => {
    it('sends the helmet headers and hides the framework', async () => {
      const res = await t.http().get('/api/health');
      expect(res.headers['x-content-type-options']).toBe('nosniff');
      expect(res.headers['x-frame-options']).toBe('SAMEORIGIN');
      expect(res.headers['referrer-policy']).toBe('no-referrer');
      expect(res.headers['strict-transport-security']).toMatch(/max-age=\d+/);
      expect(res.headers['cross-origin-opener-policy']).toBe('same-origin');
      const csp = String(res.headers['content-security-policy']);
      expect(csp).toContain("default-src 'self'");
      expect(csp).toContain("script-src 'self'");
      expect(csp).toContain("object-src 'none'");
      expect(res.headers['x-powered-by']).toBeUndefined();
    });

    it('sends them on error answers too', async () => {
      const res = await t.http().get('/api/no-such-thing');
      expect(res.headers['x-content-type-options']).toBe('nosniff');
      expect(res.headers['content-security-policy']).toBeDefined();
    });
  });

  describe('CORS stays closed', () => {
    it('gives no Access-Control-Allow-Origin to a cross-origin request', async () => {
      const res = await t.http().get('/api/health').set('Origin', 'https://elsewhere.example.com');
      expect(res.status).toBe(200);
      expect(res.headers['access-control-allow-origin']).toBeUndefined();
      expect(res.headers['access-control-allow-credentials']).toBeUndefined();
    });

    it('gives no CORS headers to a preflight either', async () => {
      const res = await t
        .http()
        .options('/api/auth/login')
        .set('Origin', 'https://elsewhere.example.com')
        .set('Access-Control-Request-Method', 'POST')
        .set('Access-Control-Request-Headers', 'content-type');
      expect(res.headers['access-control-allow-origin']).toBeUndefined();
      expect(res.headers['access-control-allow-methods']).toBeUndefined();
      expect(res.headers['access-control-allow-headers']).toBeUndefined();
    });
  });

  describe('X-Request-Id', () => {
    it('echoes a well-formed id the caller sends', async () => {
      const id = 'caller-trace.0001_ab';
      const res = await t.http().get('/api/health').set('X-Request-Id', id);
      expect(res.headers['x-request-id']).toBe(id);
    });

    it('echoes it on error answers too', async () => {
      const id = 'caller-trace-0002';
      const res = await t.http().get('/api/users').set('X-Request-Id', id);
      expect(res.status).toBe(401);
      expect(res.headers['x-request-id']).toBe(id);
    });

    it.each([
      ['too short', 'abc'],
      ['bad characters', 'id with spaces!'],
      ['too long', 'a'.repeat(65)],
    ])('replaces an id that is %s with a fresh UUID', async (_why, id) => {
      const res = await t.http().get('/api/health').set('X-Request-Id', id);
      expect(res.headers['x-request-id']).toMatch(UUID);
    });

    it('makes up a fresh UUID when none is sent, a different one each time', async () => {
      const a = await t.http().get('/api/health');
      const b = await t.http().get('/api/health');
      expect(a.headers['x-request-id']).toMatch(UUID);
      expect(b.headers['x-request-id']).toMatch(UUID);
      expect(a.headers['x-request-id']).not.toBe(b.headers['x-request-id']);
    });
  });

  describe('OpenAPI document', () => {
    it('is served as JSON at /api/docs/json and lists the sign-in route', async () => {
      const res = await t.http().get('/api/docs/json');
      expect(res.status).toBe(200);
      expect(res.headers['content-type']).toMatch(/^application\/json/);
      expect(res.body.openapi).toMatch(/^3\./);
      expect(res.body.info).toMatchObject({ title: 'Ostium API', version: '0.1.0' });
      expect(res.body.paths['/api/auth/login']).toHaveProperty('post');
      expect(res.body.paths['/api/health']).toHaveProperty('get');
      expect(res.body.components.securitySchemes).toHaveProperty('bearer');
    });

    it('describes the sign-in body with both fields', async () => {
      const res = await t.http().get('/api/docs/json');
      const ref: string = res.body.paths['/api/auth/login'].post.requestBody.content['application/json'].schema.$ref;
      const schema = res.body.components.schemas[ref.split('/').pop()!];
      expect(Object.keys(schema.properties).sort()).toEqual(['email', 'password']);
    });
  });
});
