import type { INestApplication } from '@nestjs/common';
import { rmSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../src/app.factory.js';
import type { AppConfig } from '../src/config/configuration.js';
import { ensureDatabase, freePort, mariadbPaths, runningPid, startMariadb, stopMariadb, type MariadbPaths } from './helpers/private-mariadb.js';
import { migrate, testConfig } from './helpers/test-app.js';

const repoRoot = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
// A private server: the shared test server (3308) must keep running for the other files.
const dataRoot = join(repoRoot, '.data', `health-test-${process.pid}`);

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

describe('health while the database goes away and comes back', () => {
  let paths: MariadbPaths;
  let config: AppConfig;
  let app: INestApplication | undefined;
  const http = () => request(app!.getHttpServer());

  /** Polls /api/health until it answers `status`, or gives up after `withinMs`. */
  async function healthBecomes(status: number, withinMs: number) {
    const deadline = Date.now() + withinMs;
    let last: request.Response | undefined;
    while (Date.now() < deadline) {
      last = await http().get('/api/health');
      if (last.status === status) return last;
      await sleep(200);
    }
    throw new Error(`health did not answer ${status} within ${withinMs} ms; last: ${last?.status} ${JSON.stringify(last?.body)}`);
  }

  beforeAll(async () => {
    paths = mariadbPaths(dataRoot, await freePort());
    await startMariadb(paths, { fresh: true, log: () => {} });
    const db = { host: '127.0.0.1', port: paths.port, name: 'ostium_health', user: 'ostium_health', password: 'ostium-health-test', poolMax: 20 };
    ensureDatabase(paths, { database: db.name, user: db.user, password: db.password, wildcard: true });
    config = testConfig({ db });
    await migrate(config);
    app = await createApp(config);
    await app.init();
  }, 90_000);

  afterAll(async () => {
    await app?.close();
    if (paths) await stopMariadb(paths);
    rmSync(dataRoot, { recursive: true, force: true });
  }, 60_000);

  it('answers 200 {"status":"ok","database":"up"} while the database answers', async () => {
    const res = await http().get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ status: 'ok', database: 'up' });
  });

  it('answers 503 with "database":"down" once the database stops, without a token', async () => {
    await stopMariadb(paths);
    expect(runningPid(paths)).toBeNull();
    const res = await healthBecomes(503, 10_000);
    expect(res.body).toEqual({ status: 'degraded', database: 'down' });
  }, 30_000);

  it('answers 503 (not 500) on a route that needs the database during the outage', async () => {
    const res = await http().post('/api/auth/login').send({ email: 'nobody@quillfern-endo.test', password: 'whatever-it-is' });
    expect(res.status).toBe(503);
    expect(res.body).toEqual({ statusCode: 503, message: 'The database is not reachable right now; try again shortly' });
  }, 30_000);

  it('answers 200 again once the database is back, without restarting the app', async () => {
    await startMariadb(paths, { log: () => {} });
    const res = await healthBecomes(200, 20_000);
    expect(res.body).toEqual({ status: 'ok', database: 'up' });
    // Real queries work again too: an unknown e-mail is looked up and refused, not a 503.
    const login = await http().post('/api/auth/login').send({ email: 'nobody@quillfern-endo.test', password: 'whatever-it-is' });
    expect(login.status).toBe(401);
  }, 40_000);
});
