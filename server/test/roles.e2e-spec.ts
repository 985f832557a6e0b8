import { ForbiddenException, type ExecutionContext } from '@nestjs/common';
import { Reflector } from '@nestjs/core';
import { ACCESS, ROLES, type Role } from '@ostium/shared';
import type request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Roles } from '../src/common/decorators/auth.decorators.js';
import { RolesGuard } from '../src/common/guards/roles.guard.js';
import { concretePath, controllerRoutes, expressRoutes, routeKey, type RouteInfo } from './helpers/routes.js';
import { createTestApp, type TestApp } from './helpers/test-app.js';

// The only routes anyone may call without signing in; a new public route has to be added here on purpose.
// Public webhooks of the text provider: no token, but TwilioSignatureGuard answers 403 without its signature.
const SIGNED_ROUTES = ['POST /api/sms/status', 'POST /api/sms/inbound'];
// The visit page behind the signed link in a reminder: the token in the path is its only key.
const VISIT_LINK_ROUTES = ['GET /api/public/visits/:token', 'POST /api/public/visits/:token'];
const PUBLIC_ROUTES = ['GET /api/health', 'POST /api/auth/login', 'POST /api/auth/refresh', 'POST /api/auth/logout', 'GET /api/feeds/:file', ...SIGNED_ROUTES, ...VISIT_LINK_ROUTES];

type Agent = Awaited<ReturnType<TestApp['as']>>;

function call(agent: Agent | ReturnType<TestApp['http']>, route: { method: string; path: string }): request.Test {
  const url = concretePath(route.path);
  const m = route.method.toLowerCase() as 'get' | 'post' | 'patch' | 'put' | 'delete';
  const req = (agent as unknown as Record<typeof m, (u: string) => request.Test>)[m](url);
  return m === 'get' || m === 'delete' ? req : req.send({});
}

describe('route access matrix', () => {
  let t: TestApp;
  let routes: RouteInfo[];
  const agents = {} as Record<Role, Agent>;

  beforeAll(async () => {
    t = await createTestApp();
    routes = controllerRoutes(t.app);
    for (const role of ROLES) agents[role] = await t.as(role);
  });
  afterAll(async () => t?.close());

  const find = (key: string) => {
    const r = routes.find((x) => routeKey(x) === key);
    if (!r) throw new Error(`route ${key} is not registered`);
    return r;
  };

  /** The roles that get past the guards on a route, found by calling it as each role. */
  async function observedRoles(route: { method: string; path: string }): Promise<Role[]> {
    const allowed: Role[] = [];
    for (const role of ROLES) {
      const res = await call(agents[role], route);
      if (res.status !== 401 && res.status !== 403) allowed.push(role);
    }
    return allowed;
  }

  it('finds the same routes on the Express router, in the controllers and in the OpenAPI document', async () => {
    const fromExpress = expressRoutes(t.app).map(routeKey).sort();
    const fromControllers = routes.map(routeKey).sort();
    const doc = await t.http().get('/api/docs/json');
    expect(doc.status).toBe(200);
    const fromOpenApi = Object.entries(doc.body.paths as Record<string, Record<string, unknown>>)
      .flatMap(([p, ops]) => Object.keys(ops).map((m) => `${m.toUpperCase()} ${p.replace(/\{(\w+)\}/g, ':$1')}`))
      .sort();
    expect(fromControllers).toEqual(fromExpress);
    expect(fromOpenApi).toEqual(fromExpress);
    // The enumeration really sees the foundation routes (guards against an empty, vacuous matrix).
    for (const key of ['GET /api/users', 'POST /api/users', 'PATCH /api/users/:id', 'GET /api/audit', 'PATCH /api/practice/settings', 'GET /api/auth/me']) {
      expect(fromExpress).toContain(key);
    }
  });

  it('has exactly the expected public routes', () => {
    expect(routes.filter((r) => r.isPublic).map(routeKey).sort()).toEqual([...PUBLIC_ROUTES].sort());
  });

  it('every signed-in route says who may call it (@Roles, @Allow or @AnyRole)', () => {
    const silent = routes.filter((r) => !r.isPublic && !r.anyRole && !r.roles?.length).map(routeKey);
    expect(silent).toEqual([]);
  });

  it('every route that needs sign-in answers 401 without a token or with a bad one', async () => {
    const wrong: string[] = [];
    for (const r of routes.filter((x) => !x.isPublic)) {
      const none = await call(t.http(), r);
      const bad = await call(t.http(), r).set('Authorization', 'Bearer not.a.token');
      if (none.status !== 401) wrong.push(`${routeKey(r)} without token: ${none.status}`);
      if (bad.status !== 401) wrong.push(`${routeKey(r)} with bad token: ${bad.status}`);
      else expect(none.body).toMatchObject({ statusCode: 401 });
    }
    expect(wrong).toEqual([]);
  });

  it('the public routes need no token', async () => {
    const wrong: string[] = [];
    for (const key of PUBLIC_ROUTES) {
      const res = await call(t.http(), find(key));
      // Sign-in with an empty body is a 400 and refresh without a cookie a 401 from the handler itself,
      // so the check is that the guard let the call through: its 401 message is a different one.
      const signatureRefusal = SIGNED_ROUTES.includes(key) && /^Refused: the X-Twilio-Signature header is missing$/.test(String(res.body?.message));
      if ((res.status === 403 && !signatureRefusal) || /access token/.test(String(res.body?.message))) wrong.push(`${key}: ${res.status} ${res.body?.message}`);
    }
    expect(wrong).toEqual([]);
  });

  it('every role-restricted route answers 403 to a role outside its list and lets a role inside it through', async () => {
    const wrong: string[] = [];
    for (const r of routes.filter((x) => !x.isPublic && !x.anyRole)) {
      for (const role of ROLES) {
        const res = await call(agents[role], r);
        const inside = r.roles!.includes(role);
        if (inside && (res.status === 401 || res.status === 403 || res.status >= 500)) wrong.push(`${routeKey(r)} as ${role} (allowed): ${res.status}`);
        if (!inside && res.status !== 403) wrong.push(`${routeKey(r)} as ${role} (not allowed): ${res.status}`);
        if (!inside && res.status === 403) expect(res.body).toEqual({ statusCode: 403, message: `The ${role} role cannot do this` });
      }
    }
    expect(wrong).toEqual([]);
  });

  it('every @AnyRole route lets every role through', async () => {
    const wrong: string[] = [];
    for (const r of routes.filter((x) => !x.isPublic && x.anyRole)) {
      for (const role of ROLES) {
        const res = await call(agents[role], r);
        if (res.status === 401 || res.status === 403 || res.status >= 500) wrong.push(`${routeKey(r)} as ${role}: ${res.status}`);
      }
    }
    expect(wrong).toEqual([]);
  });

  describe('named routes against the shared ACCESS table', () => {
    it('GET /api/users: admin, manager, frontdesk and endodontist; not the assistant', async () => {
      expect((await observedRoles(find('GET /api/users'))).sort()).toEqual(['admin', 'endodontist', 'frontdesk', 'manager']);
    });

    it('POST /api/users and PATCH /api/users/:id: admin only (ACCESS.users)', async () => {
      expect([...ACCESS.users]).toEqual(['admin']);
      expect(await observedRoles(find('POST /api/users'))).toEqual([...ACCESS.users]);
      expect(await observedRoles(find('PATCH /api/users/:id'))).toEqual([...ACCESS.users]);
    });

    it('GET /api/audit: admin only (ACCESS.audit)', async () => {
      expect([...ACCESS.audit]).toEqual(['admin']);
      expect(await observedRoles(find('GET /api/audit'))).toEqual([...ACCESS.audit]);
    });

    it('PATCH /api/practice/settings: admin only (ACCESS.settings)', async () => {
      expect([...ACCESS.settings]).toEqual(['admin']);
      expect(await observedRoles(find('PATCH /api/practice/settings'))).toEqual([...ACCESS.settings]);
      const denied = await agents.manager.patch('/api/practice/settings').send({ bookingGridMinutes: 10 });
      expect(denied.status).toBe(403);
      const practice = await agents.admin.get('/api/practice');
      expect(practice.body.settings.bookingGridMinutes).not.toBe(10);
    });

    it('GET /api/practice, GET /api/locations and GET /api/auth/me: every role', async () => {
      for (const key of ['GET /api/practice', 'GET /api/locations', 'GET /api/auth/me']) {
        expect((await observedRoles(find(key))).sort()).toEqual([...ROLES].sort());
      }
    });

    it('every @Roles list on a route names only known roles', () => {
      const unknown = routes.flatMap((r) => (r.roles ?? []).filter((x) => !(ROLES as readonly string[]).includes(x)).map((x) => `${routeKey(r)}: ${x}`));
      expect(unknown).toEqual([]);
    });
  });
});

describe('RolesGuard (deny by default)', () => {
  // A bare ExecutionContext for a handler/class pair, with the given signed-in user.
  const contextFor = (handler: () => void, cls: new () => unknown, user?: { role: Role }) =>
    ({
      getHandler: () => handler,
      getClass: () => cls,
      switchToHttp: () => ({ getRequest: () => ({ user }) }),
    }) as unknown as ExecutionContext;

  const guard = new RolesGuard(new Reflector());

  it('refuses a signed-in user on a route with no access decorator', () => {
    class Bare {
      handle() {}
    }
    expect(() => guard.canActivate(contextFor(Bare.prototype.handle, Bare, { role: 'admin' }))).toThrow(ForbiddenException);
  });

  it('refuses when there is no user at all', () => {
    class Restricted {
      @Roles('admin') handle() {}
    }
    expect(guard.canActivate(contextFor(Restricted.prototype.handle, Restricted))).toBe(false);
  });

  it('lets a listed role through and refuses the others', () => {
    class Restricted {
      @Roles('manager') handle() {}
    }
    expect(guard.canActivate(contextFor(Restricted.prototype.handle, Restricted, { role: 'manager' }))).toBe(true);
    expect(() => guard.canActivate(contextFor(Restricted.prototype.handle, Restricted, { role: 'admin' }))).toThrow(ForbiddenException);
  });
});
