import { METHOD_METADATA, PATH_METADATA } from '@nestjs/common/constants.js';
import { RequestMethod, type INestApplication } from '@nestjs/common';
import { DiscoveryService, MetadataScanner, ModulesContainer, Reflector } from '@nestjs/core';
import type { Role } from '@ostium/shared';
import { ANY_ROLE, IS_PUBLIC, ROLES_KEY } from '../../src/common/decorators/auth.decorators.js';

/** One controller route with who may call it, read from the decorators the guards read. */
export interface RouteInfo {
  /** Upper-case HTTP method. */
  method: string;
  /** Full path as Express matches it, e.g. `/api/users/:id`. */
  path: string;
  isPublic: boolean;
  anyRole: boolean;
  roles: Role[] | undefined;
}

export const routeKey = (r: { method: string; path: string }) => `${r.method} ${r.path}`;

const joinPath = (...parts: (string | undefined)[]) =>
  '/' +
  parts
    .flatMap((p) => (p ?? '').split('/'))
    .filter(Boolean)
    .join('/');

/**
 * Every route registered on the Express router, minus middleware mounts (Nest mounts them for every
 * method at once) and the Swagger UI's own pages.
 */
export function expressRoutes(app: INestApplication): { method: string; path: string }[] {
  const instance = app.getHttpAdapter().getInstance() as {
    router?: { stack: { route?: { path: string; methods: Record<string, boolean> } }[] };
    _router?: { stack: { route?: { path: string; methods: Record<string, boolean> } }[] };
  };
  // Express 5 exposes the router as `app.router`; Express 4 kept it in `app._router`.
  const router = instance.router ?? instance._router;
  if (!router) throw new Error('no Express router found on the application');
  const out: { method: string; path: string }[] = [];
  for (const layer of router.stack) {
    if (!layer.route) continue;
    const methods = Object.keys(layer.route.methods).filter((m) => m !== '_all');
    if (layer.route.methods._all || methods.length > 5) continue;
    const path = layer.route.path;
    if (path === '/api/docs' || path.startsWith('/api/docs/') || path.startsWith('/api/docs-')) continue;
    for (const m of methods) out.push({ method: m.toUpperCase(), path });
  }
  return out;
}

/** Every controller method with a route, found through Nest's own module container. */
export function controllerRoutes(app: INestApplication, globalPrefix = 'api'): RouteInfo[] {
  const discovery = new DiscoveryService(app.get(ModulesContainer));
  const scanner = new MetadataScanner();
  const reflector = new Reflector();
  const out: RouteInfo[] = [];
  for (const wrapper of discovery.getControllers()) {
    const controller = wrapper.metatype as (new (...args: never[]) => unknown) | undefined;
    if (!controller) continue;
    const base = Reflect.getMetadata(PATH_METADATA, controller) as string | string[] | undefined;
    const bases = Array.isArray(base) ? base : [base];
    const proto = controller.prototype as Record<string, (...args: unknown[]) => unknown>;
    for (const name of scanner.getAllMethodNames(proto)) {
      const handler = proto[name];
      const sub = Reflect.getMetadata(PATH_METADATA, handler) as string | string[] | undefined;
      const verb = Reflect.getMetadata(METHOD_METADATA, handler) as RequestMethod | undefined;
      if (sub === undefined || verb === undefined) continue;
      const targets = [handler, controller];
      const info = {
        method: RequestMethod[verb],
        isPublic: !!reflector.getAllAndOverride<boolean>(IS_PUBLIC, targets),
        anyRole: !!reflector.getAllAndOverride<boolean>(ANY_ROLE, targets),
        roles: reflector.getAllAndOverride<Role[] | undefined>(ROLES_KEY, targets),
      };
      for (const b of bases) for (const s of Array.isArray(sub) ? sub : [sub]) out.push({ ...info, path: joinPath(globalPrefix, b, s) });
    }
  }
  return out;
}

/** Fills path parameters with an id that exists nowhere, so an allowed call cannot change real rows. */
export const concretePath = (path: string, value = '999999') => path.replace(/:\w+/g, value);
