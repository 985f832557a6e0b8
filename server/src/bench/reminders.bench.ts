// Benchmark of the outbox job (messaging.md "Sending reliably"): 10,000 due texts for consenting patients
// in a fresh database, drained by two built server processes at once through the local SMS fake.
// Prints the time to drain, messages per second, duplicates at the fake (must be 0: exits 1 otherwise)
// and how many rows each worker sent.
// The texts are reminder-shaped but queued under purpose desk_reply, so the default composer sends each
// row as written (the reminders composer would re-read appointments this bench does not create); consent
// and quiet hours are checked for them like for any text. Patients live in a zone where it is daytime
// while the bench runs, so quiet hours never hold a text back.
// Run after building, with the DB_* variables of the test server (npm run bench does this):
//   node server/dist/bench/reminders.bench.js [messages]
import { startSmsFake, type SmsFake } from '@ostium/sms-fake';
import mariadb, { type Connection } from 'mariadb';
import { spawn, type ChildProcess } from 'node:child_process';
import { createServer } from 'node:net';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { Sequelize } from 'sequelize-typescript';
import { loadConfig, type AppConfig } from '../config/configuration.js';
import { createMigrator } from '../database/migrator.js';
import { daytimeZone } from './daytime-zone.util.js';

const MAIN = join(dirname(fileURLToPath(import.meta.url)), '..', 'main.js');
const INTERVAL_MS = 200;
const BATCH_SIZE = 100;

const freePort = () =>
  new Promise<number>((resolve, reject) => {
    const s = createServer();
    s.once('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const { port } = s.address() as { port: number };
      s.close(() => resolve(port));
    });
  });

/** +1 NXX 555-01xx: only the fictional 555-0100…0199 numbers, a hundred per area code. */
const phone = (i: number) => `+1${201 + Math.floor(i / 100)}55501${String(i % 100).padStart(2, '0')}`;

async function recreateDatabase(config: AppConfig): Promise<void> {
  const { host, port, user, password, name } = config.db;
  const conn = await mariadb.createConnection({ host, port, user, password });
  await conn.query(`DROP DATABASE IF EXISTS \`${name}\``);
  await conn.query(`CREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  await conn.end();
  const sequelize = new Sequelize({ dialect: 'mariadb', host, port, username: user, password, database: name, timezone: '+00:00', logging: false });
  await createMigrator(sequelize).up();
  await sequelize.close();
}

/** One practice, `count` consenting patients in `zone`, and one due text each (due at `dueAt`). */
async function seed(conn: Connection, count: number, zone: string, dueAt: Date): Promise<string[]> {
  const now = new Date();
  const practice = await conn.query('INSERT INTO practices (name, settings, created_at, updated_at) VALUES (?, ?, ?, ?)', ['Bench Endodontics', '{}', now, now]);
  const practiceId = Number(practice.insertId);
  await conn.query("INSERT INTO locations (practice_id, name, time_zone, opening_hours, created_at, updated_at) VALUES (?, 'Bench office', 'America/New_York', '[]', ?, ?)", [practiceId, now, now]);
  await conn.batch(
    "INSERT INTO patients (practice_id, first_name, last_name, date_of_birth, phone, sms_consent, time_zone, created_at, updated_at) VALUES (?, 'Bench', ?, '1980-01-01', ?, 1, ?, ?, ?)",
    Array.from({ length: count }, (_, i) => [practiceId, `Patient ${i}`, phone(i), zone, now, now]),
  );
  const ids = ((await conn.query('SELECT id FROM patients WHERE practice_id = ? ORDER BY id', [practiceId])) as { id: number }[]).map((r) => Number(r.id));
  const bodies = ids.map((_, i) => `Bench Endodontics: visit #${i} on Tue at 9:00. Reply C to confirm, R to reschedule. STOP to opt out`);
  await conn.batch(
    "INSERT INTO outbox_messages (practice_id, channel, purpose, dedupe_key, patient_id, to_address, body, status, due_at, planned_at, attempts, created_at, updated_at) VALUES (?, 'sms', 'desk_reply', ?, ?, ?, ?, 'pending', ?, ?, 0, ?, ?)",
    ids.map((id, i) => [practiceId, `bench:${i}`, id, phone(i), bodies[i], dueAt, dueAt, now, now]),
  );
  return bodies;
}

interface Server {
  child: ChildProcess;
  exited: Promise<void>;
}

async function startServer(config: AppConfig, fake: SmsFake, worker: string): Promise<Server> {
  const port = await freePort();
  const child = spawn(process.execPath, [MAIN], {
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
      TWILIO_API_BASE: fake.url,
      TWILIO_ACCOUNT_SID: config.sms.accountSid,
      TWILIO_AUTH_TOKEN: config.sms.authToken,
      MESSAGING_JOB: 'on',
      MESSAGING_WORKER_ID: worker,
      MESSAGING_INTERVAL_MS: String(INTERVAL_MS),
      MESSAGING_BATCH_SIZE: String(BATCH_SIZE),
      LOG_LEVEL: 'error',
      CLIENT_DIST: '',
    },
    stdio: ['ignore', 'inherit', 'inherit'],
  });
  const exited = new Promise<void>((r) => child.once('exit', () => r()));
  for (let i = 0; ; i++) {
    if (child.exitCode !== null) throw new Error(`server ${worker} exited with ${child.exitCode}`);
    const ok = await fetch(`http://127.0.0.1:${port}/api/health`).then((r) => r.ok, () => false);
    if (ok) return { child, exited };
    if (i > 300) throw new Error(`server ${worker} did not start`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

export async function runRemindersBench(count = 10_000, log: (line: string) => void = (l) => console.log(l)) {
  const base = loadConfig({ ...process.env, NODE_ENV: 'test' });
  const config: AppConfig = { ...base, db: { ...base.db, name: `${process.env.DB_NAME ?? 'ostium_bench'}_reminders` } };
  const zone = daytimeZone();
  log(`reminders bench: ${count} due texts, 2 server processes (interval ${INTERVAL_MS} ms, batch ${BATCH_SIZE}), patients in ${zone} (daytime now), database ${config.db.name}`);
  await recreateDatabase(config);
  const fake = await startSmsFake({ port: 0, accountSid: config.sms.accountSid, authToken: config.sms.authToken, inboundUrl: null });
  const servers: Server[] = [];
  const conn = await mariadb.createConnection({ host: config.db.host, port: config.db.port, user: config.db.user, password: config.db.password, database: config.db.name, timezone: '+00:00' });
  try {
    servers.push(...(await Promise.all([startServer(config, fake, 'bench-a'), startServer(config, fake, 'bench-b')])));
    // Due a few seconds ahead: both servers are polling and every row is in place when the clock starts.
    const dueAt = new Date(Date.now() + 3_000);
    const bodies = await seed(conn, count, zone, dueAt);
    const waitStart = dueAt.getTime() - Date.now();
    if (waitStart > 0) await new Promise((r) => setTimeout(r, waitStart));
    const t0 = performance.now();
    const open = async () =>
      Number(((await conn.query("SELECT COUNT(*) AS n FROM outbox_messages WHERE status IN ('pending', 'sending')")) as { n: bigint }[])[0]!.n);
    for (;;) {
      if ((await open()) === 0) break;
      if (performance.now() - t0 > 15 * 60_000) throw new Error('the outbox did not drain within 15 minutes');
      await new Promise((r) => setTimeout(r, 100));
    }
    const seconds = (performance.now() - t0) / 1000;

    const seen = new Map<string, number>();
    for (const m of fake.messages({ direction: 'outbound-api' })) seen.set(m.body, (seen.get(m.body) ?? 0) + 1);
    const duplicates = bodies.reduce((n, b) => n + Math.max(0, (seen.get(b) ?? 0) - 1), 0);
    const missing = bodies.filter((b) => !seen.has(b)).length;
    const statuses = (await conn.query('SELECT status, COUNT(*) AS n FROM outbox_messages GROUP BY status ORDER BY status')) as { status: string; n: bigint }[];
    const workers = (await conn.query("SELECT SUBSTRING_INDEX(claimed_by, '-', 2) AS worker, COUNT(*) AS n FROM outbox_messages GROUP BY worker ORDER BY worker")) as { worker: string; n: bigint }[];
    log(`time to drain: ${seconds.toFixed(2)} s`);
    log(`messages per second: ${(count / seconds).toFixed(0)}`);
    log(`duplicates at the fake: ${duplicates}; missing: ${missing}`);
    log(`rows per status: ${statuses.map((s) => `${s.status} ${s.n}`).join(', ')}`);
    log(`rows per worker: ${workers.map((w) => `${w.worker} ${w.n}`).join(', ')}`);
    const ok = duplicates === 0 && missing === 0 && statuses.every((s) => s.status === 'sent' || s.status === 'delivered');
    if (!ok) {
      log('FAILED: every text must reach the fake exactly once and every row end sent');
      process.exitCode = 1;
    }
    return { seconds, perSecond: count / seconds, duplicates, missing, workers: workers.map((w) => ({ worker: w.worker, rows: Number(w.n) })) };
  } finally {
    for (const s of servers) s.child.kill('SIGTERM');
    await Promise.all(servers.map((s) => s.exited));
    await fake.close();
    await conn.end();
  }
}

const invokedDirectly = process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href;
if (invokedDirectly) {
  const count = process.argv[2] !== undefined ? Number(process.argv[2]) : undefined;
  runRemindersBench(count).catch((error: unknown) => {
    console.error(error);
    process.exitCode = 1;
  });
}
