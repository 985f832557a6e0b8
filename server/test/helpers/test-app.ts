import 'reflect-metadata';
import type { INestApplication } from '@nestjs/common';
import type { Role } from '@ostium/shared';
import mariadb from 'mariadb';
import { randomBytes } from 'node:crypto';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { Sequelize } from 'sequelize-typescript';
import request from 'supertest';
import { createApp } from '../../src/app.factory.js';
import { loadConfig, type AppConfig } from '../../src/config/configuration.js';
import { createMigrator } from '../../src/database/migrator.js';
import { SeedsService } from '../../src/seeds/seeds.service.js';
import { installTransactionGuard, takeTransactionLeaks } from './transaction-guard.js';

installTransactionGuard();

const repoRoot = join(dirname(fileURLToPath(import.meta.url)), '..', '..', '..');

export const DEMO_PASSWORD = 'ostium-demo-2026';
export const DEMO_EMAIL: Record<Role, string> = {
  admin: 'admin@quillfern-endo.test',
  manager: 'manager@quillfern-endo.test',
  endodontist: 'endo@quillfern-endo.test',
  assistant: 'assistant@quillfern-endo.test',
  frontdesk: 'frontdesk@quillfern-endo.test',
};

/** Config overrides; `sms` and `messaging` may name only the fields a test changes. */
export type TestConfigOverrides = Omit<Partial<AppConfig>, 'sms' | 'messaging'> & { sms?: Partial<AppConfig['sms']>; messaging?: Partial<AppConfig['messaging']> };

/**
 * The test database server started by `npm test` (server/scripts/stack.mjs test). The outbox job is off
 * and texts have nowhere to go unless a test says otherwise (messaging.jobEnabled, sms.apiBase).
 */
export function testConfig(overrides: TestConfigOverrides = {}): AppConfig {
  const base = loadConfig({
    ...process.env,
    NODE_ENV: 'test',
    DB_PORT: process.env.DB_PORT ?? '3308',
    DB_USER: process.env.DB_USER ?? 'ostium_test',
    DB_PASSWORD: process.env.DB_PASSWORD ?? 'ostium-test',
    JWT_SECRET: 'test-secret',
    LOG_LEVEL: process.env.TEST_LOG_LEVEL ?? 'silent',
    LOGIN_RATE_LIMIT: process.env.LOGIN_RATE_LIMIT ?? '1000',
    SEEDS_DIR: join(repoRoot, 'seeds'),
    CLIENT_DIST: '',
  });
  return {
    ...base,
    ...overrides,
    sms: { ...base.sms, apiBase: null, ...overrides.sms },
    messaging: { ...base.messaging, jobEnabled: false, ...overrides.messaging },
    clientDist: null,
  };
}

/** Creates an empty database of its own for one test file (files run in parallel). */
export async function createDatabase(config: AppConfig, prefix = 'ostium_t_'): Promise<string> {
  const name = `${prefix}${randomBytes(5).toString('hex')}`;
  const conn = await mariadb.createConnection({ host: config.db.host, port: config.db.port, user: config.db.user, password: config.db.password });
  await conn.query(`CREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  await conn.end();
  return name;
}

export async function dropDatabase(config: AppConfig, name: string) {
  const conn = await mariadb.createConnection({ host: config.db.host, port: config.db.port, user: config.db.user, password: config.db.password });
  await conn.query(`DROP DATABASE IF EXISTS \`${name}\``);
  await conn.end();
}

export async function migrate(config: AppConfig) {
  const sequelize = new Sequelize({
    dialect: 'mariadb', host: config.db.host, port: config.db.port, username: config.db.user,
    password: config.db.password, database: config.db.name, timezone: '+00:00', logging: false,
  });
  await createMigrator(sequelize).up();
  await sequelize.close();
}

export interface TestApp {
  app: INestApplication;
  config: AppConfig;
  http: () => ReturnType<typeof request>;
  token: (role: Role) => Promise<string>;
  /** An agent with the role's bearer token already set on every call. */
  as: (role: Role) => Promise<{ get: (url: string) => request.Test; post: (url: string) => request.Test; patch: (url: string) => request.Test; put: (url: string) => request.Test; delete: (url: string) => request.Test }>;
  close: () => Promise<void>;
}

/** A migrated, seeded database of its own and the full Nest application on it. */
export async function createTestApp(overrides: TestConfigOverrides = {}, { seed = true } = {}): Promise<TestApp> {
  const probe = testConfig(overrides);
  const dbName = await createDatabase(probe);
  const config = { ...probe, db: { ...probe.db, name: dbName } };
  await migrate(config);
  const app = await createApp(config);
  await app.init();
  if (seed) await app.get(SeedsService).loadDemo({ dir: config.seedsDir ?? undefined });
  const server = app.getHttpServer();
  const tokens = new Map<Role, string>();
  const token = async (role: Role) => {
    if (!tokens.has(role)) {
      const res = await request(server).post('/api/auth/login').send({ email: DEMO_EMAIL[role], password: DEMO_PASSWORD });
      if (res.status !== 200) throw new Error(`login as ${role} failed: ${res.status} ${JSON.stringify(res.body)}`);
      tokens.set(role, res.body.accessToken);
    }
    return tokens.get(role)!;
  };
  return {
    app,
    config,
    http: () => request(server),
    token,
    as: async (role) => {
      const t = await token(role);
      const auth = (r: request.Test) => r.set('Authorization', `Bearer ${t}`);
      return {
        get: (u) => auth(request(server).get(u)),
        post: (u) => auth(request(server).post(u)),
        patch: (u) => auth(request(server).patch(u)),
        put: (u) => auth(request(server).put(u)),
        delete: (u) => auth(request(server).delete(u)),
      };
    },
    close: async () => {
      await app.close();
      await dropDatabase(config, dbName);
      const leaks = takeTransactionLeaks();
      if (leaks.length) throw new Error(`queries inside a transaction ran without it (each needs a second connection):\n${leaks.join('\n')}`);
    },
  };
}
