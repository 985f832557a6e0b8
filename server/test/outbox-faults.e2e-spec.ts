// A two-minute provider outage on the real clock, with the outbox job running on a short interval: every
// text goes exactly once afterwards, and none inside quiet hours. The job's clock is the real one moved
// to 20:58:30 in New York, so the outage runs past 21:00 there (Los Angeles is at 17:58).
import type { SmsFake } from '@ostium/sms-fake';
import { DateTime } from 'luxon';
import type { Connection } from 'mariadb';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { MessagingClock } from '../src/messaging/messaging-clock.service.js';
import { OutboxDispatcherService } from '../src/messaging/outbox-dispatcher.service.js';
import { isInsideWindow } from '../src/reminders/rules/index.js';
import { connect, countsByBody, insertPatients, insertPractice, insertTexts, startFake, waitFor } from './helpers/outbox-fixture.js';
import { createTestApp, testConfig, type TestApp } from './helpers/test-app.js';

interface Row {
  id: number;
  dedupe_key: string;
  status: string;
  due_at: Date;
  defer_reason: string | null;
  attempts: number;
  sent_at: Date | null;
  to_address: string;
  body: string;
}

describe('outbox under a provider outage', () => {
  let t: TestApp;
  let fake: SmsFake;
  let db: Connection;
  let offset = 0;

  beforeAll(async () => {
    fake = await startFake(testConfig(), { statusDelayMs: 20 });
    t = await createTestApp({
      sms: { apiBase: fake.url },
      messaging: { intervalMs: 200, batchSize: 50, backoffBaseMs: 2_000, backoffMaxMs: 20_000, maxAttempts: 40, sendTimeoutMs: 2_000, claimSeconds: 5 },
    });
    db = await connect(t.config);
    await db.query("UPDATE outbox_messages SET status = 'cancelled' WHERE status = 'pending'");
    vi.spyOn(t.app.get(MessagingClock), 'now').mockImplementation(() => new Date(Date.now() + offset));
  });
  afterAll(async () => {
    t?.app.get(OutboxDispatcherService).stop();
    await db?.end();
    await t?.close();
    await fake?.close();
  });

  it('sends every text exactly once after 500s for two minutes, and none at night', async () => {
    const practiceId = await insertPractice(db);
    const ny = await insertPatients(db, practiceId, 20, { timeZone: 'America/New_York', first: 0 });
    const la = await insertPatients(db, practiceId, 20, { timeZone: 'America/Los_Angeles', first: 20 });
    // 2026-11-05 01:58:30Z = 20:58:30 EST in New York (after the 1 November change), 17:58:30 PST in Los Angeles.
    const virtualStart = new Date('2026-11-05T01:58:30Z');
    offset = virtualStart.getTime() - Date.now();
    const due = new Date(virtualStart.getTime() - 60_000);
    const nyBodies = await insertTexts(db, practiceId, ny, 20, 'outage-ny', due);
    const laBodies = await insertTexts(db, practiceId, la, 20, 'outage-la', due);

    fake.setFault({ mode: 'http500', forMs: 120_000 });
    t.app.get(OutboxDispatcherService).start();
    const rows = async (tag: string) => (await db.query('SELECT * FROM outbox_messages WHERE dedupe_key LIKE ? ORDER BY id', [`${tag}:%`])) as Row[];

    // Los Angeles texts go once the provider is back; New York's wait for the morning.
    await waitFor('the Los Angeles texts to go', async () => (await rows('outage-la')).every((r) => r.status === 'sent' || r.status === 'delivered'), 170_000, 500);
    expect(fake.fault()).toBeNull();
    const nyNight = await rows('outage-ny');
    // references.md: 47 CFR 64.1200(c)(1), no texts after 21:00 local; 08:00 EST on 5 November = 13:00Z.
    for (const r of nyNight) {
      expect(r).toMatchObject({ status: 'pending', defer_reason: 'quiet hours in America/New_York until 08:00', due_at: new Date('2026-11-05T13:00:00Z') });
      expect(r.attempts).toBeGreaterThan(1);
    }
    const counts = countsByBody(fake);
    expect(nyBodies.map((b) => counts.get(b) ?? 0).every((n) => n === 0)).toBe(true);
    expect(fake.stats().refusedBy.http500).toBeGreaterThan(40);

    // The next morning in New York.
    const morning = Date.now();
    offset = new Date('2026-11-05T13:00:05Z').getTime() - Date.now();
    await waitFor('the New York texts to go in the morning', async () => (await rows('outage-ny')).every((r) => r.status === 'sent' || r.status === 'delivered'), 30_000, 250);

    const after = countsByBody(fake);
    expect([...nyBodies, ...laBodies].filter((b) => after.get(b) !== 1)).toEqual([]);
    for (const m of fake.messages({ direction: 'outbound-api' }).filter((x) => nyBodies.includes(x.body))) expect(Date.parse(m.dateCreated)).toBeGreaterThanOrEqual(morning - 1_000);
    // Every text went inside 08:00–21:00 in its patient's zone (on the job's clock).
    for (const [tag, zone] of [
      ['outage-ny', 'America/New_York'],
      ['outage-la', 'America/Los_Angeles'],
    ] as const) {
      for (const r of await rows(tag)) {
        expect(r.sent_at, `${r.dedupe_key} sent at ${DateTime.fromJSDate(r.sent_at!, { zone }).toISO()}`).not.toBeNull();
        expect(isInsideWindow(r.sent_at!, zone), `${r.dedupe_key} sent at ${DateTime.fromJSDate(r.sent_at!, { zone }).toISO()}`).toBe(true);
      }
    }
  }, 240_000);
});
