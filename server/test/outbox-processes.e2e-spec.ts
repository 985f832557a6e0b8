// The outbox across real processes: the built server (server/dist/main.js) killed mid-batch and started
// again, and two servers draining one database. Run `npm run build -w server` first (npm test does).
import type { SmsFake } from '@ostium/sms-fake';
import type { Connection } from 'mariadb';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { AppConfig } from '../src/config/configuration.js';
import { connect, countsByBody, insertPatients, insertPractice, insertTexts, spawnServer, startFake, statusCounts, waitFor, type FixturePatient, type SpawnedServer } from './helpers/outbox-fixture.js';
import { createDatabase, dropDatabase, migrate, testConfig } from './helpers/test-app.js';

describe('outbox across processes', () => {
  let config: AppConfig;
  let dbName: string;
  let db: Connection;
  let fake: SmsFake;
  let practiceId: number;
  let people: FixturePatient[];
  const children: SpawnedServer[] = [];

  const jobEnv = (worker: string) => ({
    TWILIO_API_BASE: fake.url,
    MESSAGING_JOB: 'on',
    MESSAGING_WORKER_ID: worker,
    MESSAGING_INTERVAL_MS: '100',
    MESSAGING_BATCH_SIZE: '40',
    MESSAGING_CLAIM_SECONDS: '3',
    MESSAGING_SEND_TIMEOUT_MS: '2000',
    MESSAGING_BACKOFF_BASE_MS: '500',
    MESSAGING_BACKOFF_MAX_MS: '2000',
  });
  const start = async (worker: string) => {
    const s = await spawnServer(config, jobEnv(worker));
    children.push(s);
    return s;
  };
  const open = async (tag: string) => {
    const c = await statusCounts(db, tag);
    return (c.pending ?? 0) + (c.sending ?? 0);
  };

  beforeAll(async () => {
    const probe = testConfig();
    dbName = await createDatabase(probe);
    config = { ...probe, db: { ...probe.db, name: dbName } };
    await migrate(config);
    db = await connect(config);
    practiceId = await insertPractice(db);
    people = await insertPatients(db, practiceId, 100);
    fake = await startFake(config);
  });
  afterAll(async () => {
    for (const c of children) if (c.child.exitCode === null && c.child.signalCode === null) c.child.kill('SIGTERM');
    await Promise.all(children.map((c) => c.exited));
    await fake?.close();
    await db?.end();
    if (dbName) await dropDatabase(config, dbName);
  });

  it('a server killed mid-batch loses nothing and sends nothing twice once it is started again', async () => {
    const bodies = await insertTexts(db, practiceId, people, 200, 'killed', new Date(Date.now() - 5_000));
    // Each answer takes 300 ms, so a kill catches texts the provider has accepted but the server never heard about.
    fake.setFault({ mode: 'slow', delayMs: 300, forMs: 10 * 60_000 });
    const first = await start('crash-a');
    await waitFor('the first server to have sent some texts', async () => (await statusCounts(db, 'killed')).sent! >= 20, 60_000, 50);
    first.child.kill('SIGKILL');
    const killedAt = Date.now();
    await first.exited;
    const left = await statusCounts(db, 'killed');
    expect(left.sending ?? 0).toBeGreaterThan(0);
    expect(left.pending ?? 0).toBeGreaterThan(0);

    const second = await start('crash-b');
    await waitFor('the second server to drain the outbox', async () => (await open('killed')) === 0, 120_000, 250);
    const counts = countsByBody(fake);
    expect(bodies.filter((b) => counts.get(b) !== 1)).toEqual([]);
    const done = await statusCounts(db, 'killed');
    expect((done.sent ?? 0) + (done.delivered ?? 0)).toBe(200);
    // Texts the provider took from the killed server, recorded by the new one after asking the provider.
    const rows = (await db.query("SELECT provider_id, claimed_by FROM outbox_messages WHERE dedupe_key LIKE 'killed:%'")) as { provider_id: string; claimed_by: string }[];
    const byB = new Set(rows.filter((r) => r.claimed_by.startsWith('crash-b')).map((r) => r.provider_id));
    const reconciled = fake.messages({ direction: 'outbound-api' }).filter((m) => bodies.includes(m.body) && Date.parse(m.dateCreated) < killedAt && byB.has(m.sid));
    expect(reconciled.length).toBeGreaterThan(0);
    fake.clearFault();
    second.child.kill('SIGTERM');
    await second.exited;
  }, 200_000);

  it('two servers on one database send each of 300 texts once between them', async () => {
    const [a, b] = await Promise.all([start('pair-a'), start('pair-b')]);
    fake.setFault({ mode: 'slow', delayMs: 30, forMs: 10 * 60_000 });
    const bodies = await insertTexts(db, practiceId, people, 300, 'pair', new Date(Date.now() - 5_000));
    await waitFor('both servers to drain the outbox', async () => (await open('pair')) === 0, 120_000, 250);
    const counts = countsByBody(fake);
    expect(bodies.filter((x) => counts.get(x) !== 1)).toEqual([]);
    const perWorker = (await db.query("SELECT SUBSTRING_INDEX(claimed_by, '-', 2) AS worker, COUNT(*) AS n FROM outbox_messages WHERE dedupe_key LIKE 'pair:%' GROUP BY worker")) as {
      worker: string;
      n: number;
    }[];
    const by = Object.fromEntries(perWorker.map((w) => [w.worker, Number(w.n)]));
    expect((by['pair-a'] ?? 0) + (by['pair-b'] ?? 0)).toBe(300);
    expect(by['pair-a']).toBeGreaterThan(0);
    expect(by['pair-b']).toBeGreaterThan(0);
    fake.clearFault();
    for (const s of [a, b]) s.child.kill('SIGTERM');
    await Promise.all([a.exited, b.exited]);
  }, 200_000);
});
