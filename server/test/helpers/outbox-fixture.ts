// Shared pieces of the outbox tests: the SMS fake, a practice and patients written straight into a
// database, fictional numbers, and the built server spawned as a second process.
import { startSmsFake, type SmsFake } from '@ostium/sms-fake';
import mariadb, { type Connection } from 'mariadb';
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { daytimeZone } from '../../src/bench/daytime-zone.util.js';
import type { AppConfig } from '../../src/config/configuration.js';
import { freePort } from './private-mariadb.js';

export const serverMain = join(dirname(fileURLToPath(import.meta.url)), '..', '..', 'dist', 'main.js');

/** +1 NXX 555-01xx: only the fictional 555-0100…0199 range (references.md, NANP), 100 per area code. */
export function fakeNumber(i: number): string {
  return `+1${201 + Math.floor(i / 100)}55501${String(i % 100).padStart(2, '0')}`;
}

export function startFake(config: AppConfig, opts: { statusDelayMs?: number } = {}): Promise<SmsFake> {
  return startSmsFake({ port: 0, accountSid: config.sms.accountSid, authToken: config.sms.authToken, inboundUrl: null, statusDelayMs: opts.statusDelayMs ?? 50 });
}

export function connect(config: AppConfig): Promise<Connection> {
  const { host, port, user, password, name } = config.db;
  return mariadb.createConnection({ host, port, user, password, database: name, timezone: '+00:00', bigIntAsNumber: true, insertIdAsNumber: true });
}

/** A practice with one New York location, straight into the tables. */
export async function insertPractice(db: Connection, name = 'Outbox Test Endodontics'): Promise<number> {
  const now = new Date();
  const p = await db.query('INSERT INTO practices (name, settings, created_at, updated_at) VALUES (?, ?, ?, ?)', [name, JSON.stringify({ toothNotation: 'fdi' }), now, now]);
  const practiceId = Number(p.insertId);
  await db.query('INSERT INTO locations (practice_id, name, time_zone, opening_hours, created_at, updated_at) VALUES (?, ?, ?, ?, ?, ?)', [
    practiceId,
    'Main office',
    'America/New_York',
    '[]',
    now,
    now,
  ]);
  return practiceId;
}

export interface FixturePatient {
  id: number;
  phone: string;
}

/**
 * Patients numbered from `first` (their phones are fakeNumber(first + i)), with the given consent and
 * zone; by default a zone where it is daytime now, so texts on the real clock are not held by quiet hours.
 */
export async function insertPatients(
  db: Connection,
  practiceId: number,
  count: number,
  opts: { consent?: boolean; timeZone?: string | null; first?: number } = {},
): Promise<FixturePatient[]> {
  const now = new Date();
  const first = opts.first ?? 0;
  const rows = Array.from({ length: count }, (_, i) => [
    practiceId,
    'Outbox',
    `Patient ${first + i}`,
    '1980-01-01',
    fakeNumber(first + i),
    opts.consent ?? true,
    opts.timeZone === undefined ? daytimeZone() : opts.timeZone,
    now,
    now,
  ]);
  await db.batch(
    'INSERT INTO patients (practice_id, first_name, last_name, date_of_birth, phone, sms_consent, time_zone, created_at, updated_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)',
    rows,
  );
  const found = (await db.query('SELECT id, phone FROM patients WHERE practice_id = ? AND phone IN (?) ORDER BY id', [practiceId, rows.map((r) => r[4])])) as FixturePatient[];
  return found;
}

/** Pending texts due at `dueAt`, one per patient (cycled), each with its own body `<tag> #<n> …`. */
export async function insertTexts(db: Connection, practiceId: number, patients: FixturePatient[], count: number, tag: string, dueAt: Date): Promise<string[]> {
  const now = new Date();
  const bodies = Array.from({ length: count }, (_, n) => `${tag} #${n}: your visit is on Tue at 9:00. Reply C to confirm, STOP to opt out`);
  await db.batch(
    "INSERT INTO outbox_messages (practice_id, channel, purpose, dedupe_key, patient_id, to_address, body, status, due_at, planned_at, attempts, created_at, updated_at) VALUES (?, 'sms', 'desk_reply', ?, ?, ?, ?, 'pending', ?, ?, 0, ?, ?)",
    bodies.map((body, n) => {
      const p = patients[n % patients.length]!;
      return [practiceId, `${tag}:${n}`, p.id, p.phone, body, dueAt, dueAt, now, now];
    }),
  );
  return bodies;
}

/** How often each body reached the fake (outbound only). */
export function countsByBody(fake: SmsFake): Map<string, number> {
  const out = new Map<string, number>();
  for (const m of fake.messages({ direction: 'outbound-api' })) out.set(m.body, (out.get(m.body) ?? 0) + 1);
  return out;
}

export async function statusCounts(db: Connection, tag: string): Promise<Record<string, number>> {
  const rows = (await db.query('SELECT status, COUNT(*) AS n FROM outbox_messages WHERE dedupe_key LIKE ? GROUP BY status', [`${tag}:%`])) as { status: string; n: number }[];
  return Object.fromEntries(rows.map((r) => [r.status, Number(r.n)]));
}

export async function waitFor<T>(what: string, probe: () => Promise<T | null | undefined | false>, timeoutMs: number, everyMs = 200): Promise<T> {
  const end = Date.now() + timeoutMs;
  for (;;) {
    const v = await probe();
    if (v) return v;
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, everyMs));
  }
}

export interface SpawnedServer {
  child: ChildProcess;
  url: string;
  port: number;
  exited: Promise<number | null>;
}

/** The built server (server/dist/main.js) as a separate process on the given database and fake. */
export async function spawnServer(config: AppConfig, env: Record<string, string>): Promise<SpawnedServer> {
  if (!existsSync(serverMain)) throw new Error('build the server first: npm run build -w server');
  const port = await freePort();
  const child = spawn(process.execPath, [serverMain], {
    env: {
      ...process.env,
      NODE_ENV: 'test',
      PORT: String(port),
      PUBLIC_URL: `http://127.0.0.1:${port}`,
      DB_HOST: config.db.host,
      DB_PORT: String(config.db.port),
      DB_NAME: config.db.name,
      DB_USER: config.db.user,
      DB_PASSWORD: config.db.password,
      JWT_SECRET: config.jwt.secret,
      TWILIO_ACCOUNT_SID: config.sms.accountSid,
      TWILIO_AUTH_TOKEN: config.sms.authToken,
      LOG_LEVEL: process.env.TEST_LOG_LEVEL ?? 'silent',
      CLIENT_DIST: '',
      ...env,
    },
    stdio: process.env.TEST_LOG_LEVEL ? 'inherit' : 'ignore',
  });
  const exited = new Promise<number | null>((resolve) => child.once('exit', (code) => resolve(code)));
  const url = `http://127.0.0.1:${port}`;
  await waitFor(
    'the spawned server to answer /api/health',
    async () => {
      if (child.exitCode !== null) throw new Error(`the spawned server exited with ${child.exitCode}`);
      const r = await fetch(`${url}/api/health`).catch(() => null);
      return r?.status === 200;
    },
    30_000,
    100,
  );
  return { child, url, port, exited };
}
