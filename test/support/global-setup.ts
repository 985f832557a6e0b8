import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import mariadb from 'mariadb';
import type { TestProject } from 'vitest/node';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const port = process.env.E2E_PORT ?? '3100';
let server: ChildProcess | undefined;
let dbName = '';

const db = () => ({
  host: '127.0.0.1',
  port: Number(process.env.DB_PORT ?? 3308),
  user: process.env.DB_USER ?? 'ostium_test',
  password: process.env.DB_PASSWORD ?? 'ostium-test',
});

/** Starts the built server (server/dist, client/dist) on a fresh, seeded database. */
export async function setup(project: TestProject) {
  dbName = `ostium_t_e2e_${randomBytes(4).toString('hex')}`;
  const conn = await mariadb.createConnection(db());
  await conn.query(`CREATE DATABASE \`${dbName}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  await conn.end();
  const env = {
    ...process.env,
    NODE_ENV: 'test',
    PORT: port,
    DB_NAME: dbName,
    DB_PORT: String(db().port),
    DB_USER: db().user,
    DB_PASSWORD: db().password,
    CLIENT_DIST: join(root, 'client', 'dist'),
    SEEDS_DIR: join(root, 'seeds'),
    LOG_LEVEL: 'warn',
    LOGIN_RATE_LIMIT: '1000',
    PUBLIC_URL: `http://127.0.0.1:${port}`,
  };
  for (const cmd of ['migrate', 'seed']) {
    const r = spawnSync(process.execPath, [join(root, 'server/dist/cli.js'), cmd], { env, encoding: 'utf8' });
    if (r.status !== 0) throw new Error(`cli ${cmd} failed: ${r.stderr}`);
  }
  server = spawn(process.execPath, [join(root, 'server/dist/main.js')], { env, stdio: ['ignore', 'ignore', 'inherit'] });
  const base = `http://127.0.0.1:${port}`;
  for (let i = 0; i < 100; i++) {
    try {
      const res = await fetch(`${base}/api/health`);
      if (res.ok) break;
    } catch {
      /* not listening yet */
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  project.provide('baseUrl', base);
}

export async function teardown() {
  server?.kill('SIGTERM');
  const conn = await mariadb.createConnection(db());
  await conn.query(`DROP DATABASE IF EXISTS \`${dbName}\``);
  await conn.end();
}

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string;
  }
}
