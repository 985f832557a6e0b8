import type { INestApplication } from '@nestjs/common';
import { EventEmitter2 } from '@nestjs/event-emitter';
import { signTwilioRequest, type SmsFake } from '@ostium/sms-fake';
import type { Connection } from 'mariadb';
import type { Transaction } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { createApp } from '../src/app.factory.js';
import type { EnqueueInput } from '../src/messaging/composer.types.js';
import { outboxMessageId } from '../src/messaging/email-sender.service.js';
import { OUTBOX_FAILED, type OutboxFailedEvent } from '../src/messaging/messaging-events.js';
import { CLAIM_SQL, OutboxDispatcherService } from '../src/messaging/outbox-dispatcher.service.js';
import { OutboxService } from '../src/messaging/outbox.service.js';
import { createTwilioClient } from '../src/messaging/twilio-client.util.js';
import { waitForMail } from './helpers/mail-inbox.js';
import { connect, countsByBody, fakeNumber, insertPatients, insertTexts, startFake, statusCounts, waitFor, type FixturePatient } from './helpers/outbox-fixture.js';
import { freePort } from './helpers/private-mariadb.js';
import { createTestApp, DEMO_EMAIL, testConfig, type TestApp } from './helpers/test-app.js';

interface OutboxDbRow {
  id: number;
  status: string;
  due_at: Date;
  defer_reason: string | null;
  attempts: number;
  last_error: string | null;
  provider_id: string | null;
  provider_status: string | null;
  sent_at: Date | null;
  delivered_at: Date | null;
  claimed_by: string | null;
  claimed_until: Date | null;
}

describe('outbox', () => {
  let t: TestApp;
  let fake: SmsFake;
  let db: Connection;
  let outbox: OutboxService;
  let job: OutboxDispatcherService;
  let practiceId: number;
  let failedEvents: OutboxFailedEvent[];
  let nextPatient = 0;
  let statusUrl: string;

  const patients = async (n: number, opts: { consent?: boolean; timeZone?: string | null } = {}) => {
    const out = await insertPatients(db, practiceId, n, { ...opts, first: nextPatient });
    nextPatient += n;
    return out;
  };
  const row = async (id: number): Promise<OutboxDbRow> => ((await db.query('SELECT * FROM outbox_messages WHERE id = ?', [id])) as OutboxDbRow[])[0]!;
  const text = (p: FixturePatient, body: string, dueAt: Date, extra: Partial<EnqueueInput> = {}, transaction?: Transaction) =>
    outbox.enqueue({ practiceId, channel: 'sms', purpose: 'desk_reply', patientId: p.id, to: p.phone, body, dueAt, ...extra }, transaction);
  const sentTo = (phone: string) => fake.messages({ to: phone, direction: 'outbound-api' });

  beforeAll(async () => {
    fake = await startFake(testConfig());
    const port = await freePort();
    t = await createTestApp({
      publicUrl: `http://127.0.0.1:${port}`,
      sms: { apiBase: fake.url },
      messaging: { maxAttempts: 3, backoffBaseMs: 1_000, backoffMaxMs: 4_000, sendTimeoutMs: 1_500, claimSeconds: 5 },
    });
    // Listening for real so the fake's status callbacks reach this app.
    await t.app.listen(port, '127.0.0.1');
    statusUrl = `${t.config.publicUrl}/api/sms/status`;
    db = await connect(t.config);
    // The demo practice, whose front desk signs in below (its first location is in New York).
    practiceId = Number(((await db.query('SELECT practice_id FROM users WHERE email = ?', [DEMO_EMAIL.frontdesk])) as { practice_id: number }[])[0]!.practice_id);
    // Whatever the demo data queued stays out of these drains.
    await db.query("UPDATE outbox_messages SET status = 'cancelled' WHERE status = 'pending'");
    outbox = t.app.get(OutboxService);
    job = t.app.get(OutboxDispatcherService);
    failedEvents = [];
    t.app.get(EventEmitter2).on(OUTBOX_FAILED, (e: OutboxFailedEvent) => failedEvents.push(e));
  });
  afterAll(async () => {
    await db?.end();
    await t?.close();
    await fake?.close();
  });
  beforeEach(() => fake.clearFault());

  describe('enqueue', () => {
    it('returns the existing row for a dedupe key, also when 20 callers race', async () => {
      const [p] = await patients(1);
      const due = new Date('2030-01-01T15:00:00Z');
      const first = await text(p!, 'dedupe once', due, { dedupeKey: 'appt:1:sms:race-a' });
      const again = await text(p!, 'dedupe once', due, { dedupeKey: 'appt:1:sms:race-a' });
      expect(first.created).toBe(true);
      expect(again).toMatchObject({ created: false, row: { id: first.row.id } });

      const results = await Promise.all(Array.from({ length: 20 }, () => text(p!, 'dedupe race', due, { dedupeKey: 'appt:1:sms:race-b' })));
      expect(results.filter((r) => r.created)).toHaveLength(1);
      expect(new Set(results.map((r) => r.row.id)).size).toBe(1);
      const [{ n }] = (await db.query("SELECT COUNT(*) AS n FROM outbox_messages WHERE dedupe_key = 'appt:1:sms:race-b'")) as { n: number }[];
      expect(Number(n)).toBe(1);
    });

    it("commits and rolls back with the caller's transaction", async () => {
      const [p] = await patients(1);
      const sequelize = t.app.get(Sequelize);
      const due = new Date('2030-01-01T15:00:00Z');
      await sequelize
        .transaction(async (tx) => {
          const r = await text(p!, 'rolled back', due, { dedupeKey: 'tx:rollback' }, tx);
          expect(r.created).toBe(true);
          throw new Error('caller fails');
        })
        .catch((e: Error) => expect(e.message).toBe('caller fails'));
      expect((await db.query("SELECT id FROM outbox_messages WHERE dedupe_key = 'tx:rollback'")) as unknown[]).toHaveLength(0);
      const kept = await sequelize.transaction((tx) => text(p!, 'committed', due, { dedupeKey: 'tx:commit' }, tx));
      expect((await row(kept.row.id)).status).toBe('pending');
    });
  });

  describe('sending', () => {
    it('sends a due text once, records the provider id, and the signed status callback marks it delivered', async () => {
      const [p] = await patients(1);
      const { row: r } = await text(p!, 'hello once: your visit is Tue 9:00. STOP to opt out', new Date(Date.now() - 1000));
      const drained = await job.drainOnce();
      expect(drained.sent).toBeGreaterThanOrEqual(1);
      const at = sentTo(p!.phone);
      expect(at).toHaveLength(1);
      expect(at[0]).toMatchObject({ body: 'hello once: your visit is Tue 9:00. STOP to opt out', from: t.config.sms.fromNumber, statusCallback: statusUrl });
      const sent = await row(r.id);
      expect(sent).toMatchObject({ status: 'sent', provider_id: at[0]!.sid, provider_status: 'queued', attempts: 1 });
      // The fake walks queued → sent → delivered and calls back, signed, for each step.
      const delivered = await waitFor('the delivered callback', async () => ((await row(r.id)).status === 'delivered' ? row(r.id) : null), 10_000);
      expect(delivered.provider_status).toBe('delivered');
      expect(delivered.delivered_at).not.toBeNull();
      await fake.settled();
      expect(fake.messages({ to: p!.phone })[0]!.callbacks.every((c) => c.httpStatus === 204)).toBe(true);
      // A second pass has nothing left to send.
      await job.drainOnce();
      expect(sentTo(p!.phone)).toHaveLength(1);
    });

    it('skips a text to a patient without consent, with the reason, and nothing reaches the provider', async () => {
      const [p] = await patients(1, { consent: false });
      const { row: r } = await text(p!, 'no consent text', new Date(Date.now() - 1000));
      await job.drainOnce();
      expect(await row(r.id)).toMatchObject({ status: 'skipped', defer_reason: 'no text consent', attempts: 0 });
      expect(sentTo(p!.phone)).toHaveLength(0);
      expect((await t.as('frontdesk').then((d) => d.get(`/api/outbox?status=skipped&patientId=${p!.id}`))).body).toMatchObject([{ id: r.id, deferReason: 'no text consent' }]);
    });

    it('fails at once on a permanent provider error, with the reason, and emits outbox.failed', async () => {
      const [p] = await patients(1);
      // No leading +: the provider refuses it as an invalid number (error 21211, from memory).
      const { row: r } = await text(p!, 'to a bad number', new Date(Date.now() - 1000), { to: p!.phone.slice(1) });
      await job.drainOnce();
      const failed = await row(r.id);
      expect(failed).toMatchObject({ status: 'failed', attempts: 1, last_error: 'the number is not a valid phone number (error 21211)' });
      expect(failedEvents.filter((e) => e.outboxId === r.id)).toEqual([
        expect.objectContaining({ practiceId, outboxId: r.id, channel: 'sms', purpose: 'desk_reply', patientId: p!.id, reason: 'the number is not a valid phone number (error 21211)' }),
      ]);
    });

    it('retries an HTTP 500 with backoff and sends once when the provider is back', async () => {
      const [p] = await patients(1);
      const { row: r } = await text(p!, 'after one 500', new Date(Date.now() - 1000));
      fake.setFault({ mode: 'http500', count: 1 });
      const now = new Date();
      await job.drainOnce(now);
      const pending = await row(r.id);
      expect(pending).toMatchObject({ status: 'pending', attempts: 1, last_error: 'the text provider had a problem (HTTP 500); will try again', claimed_until: null });
      // backoffBaseMs 1000 ± 25 % jitter.
      const wait = pending.due_at.getTime() - now.getTime();
      expect(wait).toBeGreaterThanOrEqual(750);
      expect(wait).toBeLessThanOrEqual(1250);
      await job.drainOnce(new Date(now.getTime() + 500));
      expect((await row(r.id)).status).toBe('pending');
      await job.drainOnce(new Date(now.getTime() + 1300));
      expect(await row(r.id)).toMatchObject({ status: 'sent', attempts: 2, last_error: null });
      expect(sentTo(p!.phone)).toHaveLength(1);
    });

    it('gives up after maxAttempts retryable failures, with the reason, and emits outbox.failed', async () => {
      const [p] = await patients(1);
      const { row: r } = await text(p!, 'provider down for good', new Date(Date.now() - 1000));
      fake.setFault({ mode: 'http500', count: 10 });
      let now = new Date();
      for (let i = 0; i < 3; i++) {
        await job.drainOnce(now);
        now = new Date(now.getTime() + 10_000);
      }
      expect(await row(r.id)).toMatchObject({ status: 'failed', attempts: 3, last_error: 'the text provider had a problem (HTTP 500) (gave up after 3 attempts)' });
      expect(failedEvents.some((e) => e.outboxId === r.id)).toBe(true);
      expect(sentTo(p!.phone)).toHaveLength(0);
    });

    it('waits out a slow answer past the timeout and records the text the provider has, without sending it again', async () => {
      const [p] = await patients(1);
      const { row: r } = await text(p!, 'slow answer text', new Date(Date.now() - 1000));
      // Accepted at once, answered after 3 s; the client gives up after 1.5 s.
      fake.setFault({ mode: 'slow', delayMs: 3_000, count: 1 });
      const now = new Date();
      const first = await job.drainOnce(now);
      expect(first.unknown).toBe(1);
      const waiting = await row(r.id);
      expect(waiting).toMatchObject({ status: 'sending', attempts: 1, last_error: 'the text provider did not answer within 1.5 s; checking whether it went before trying again' });
      expect(sentTo(p!.phone)).toHaveLength(1);
      // Before the lease ends nobody touches it.
      await job.drainOnce(new Date(waiting.claimed_until!.getTime() - 100));
      expect((await row(r.id)).status).toBe('sending');
      const second = await job.drainOnce(new Date(waiting.claimed_until!.getTime() + 100));
      expect(second.reconciled.found).toBe(1);
      expect(await row(r.id)).toMatchObject({ status: 'sent', provider_id: sentTo(p!.phone)[0]!.sid });
      expect(sentTo(p!.phone)).toHaveLength(1);
    });

    it('sends again after a timeout the provider never saw, exactly once', async () => {
      const [p] = await patients(1);
      const { row: r } = await text(p!, 'timed out text', new Date(Date.now() - 1000));
      fake.setFault({ mode: 'timeout', count: 1 });
      const now = new Date();
      await job.drainOnce(now);
      const waiting = await row(r.id);
      expect(waiting.status).toBe('sending');
      expect(sentTo(p!.phone)).toHaveLength(0);
      // One pass: the provider has no such text → pending, due now → claimed and sent.
      const pass = await job.drainOnce(new Date(waiting.claimed_until!.getTime() + 100));
      expect(pass.reconciled.requeued).toBe(1);
      expect(await row(r.id)).toMatchObject({ status: 'sent', attempts: 2 });
      expect(sentTo(p!.phone)).toHaveLength(1);
    });

    it('reconciles rows a dead worker left sending: found at the provider → recorded, not found → sent once', async () => {
      const [a, b] = await patients(2);
      const client = createTwilioClient(t.config).client!;
      const due = new Date(Date.now() - 60_000);
      const made = await insertTexts(db, practiceId, [a!, b!], 2, 'crashed', due);
      // The dead worker's send of the first text reached the provider; the second never left.
      const already = await client.messages.create({ to: a!.phone, from: t.config.sms.fromNumber, body: made[0]! });
      await db.query("UPDATE outbox_messages SET status = 'sending', claimed_by = 'dead-worker', claimed_until = ?, attempts = 1 WHERE dedupe_key LIKE 'crashed:%'", [new Date(Date.now() - 1000)]);
      const pass = await job.drainOnce();
      expect(pass.reconciled).toMatchObject({ found: 1, requeued: 1 });
      const rows = (await db.query("SELECT * FROM outbox_messages WHERE dedupe_key LIKE 'crashed:%' ORDER BY dedupe_key")) as OutboxDbRow[];
      expect(rows.map((x) => x.status)).toEqual(['sent', 'sent']);
      expect(rows[0]!.provider_id).toBe(already.sid);
      const counts = countsByBody(fake);
      expect(made.map((m) => counts.get(m))).toEqual([1, 1]);
    });

    it('sends e-mail with its attachment and a Message-ID fixed by the row', async () => {
      const to = `outbox-${Date.now()}@example.com`;
      const { row: r } = await outbox.enqueue({ practiceId, channel: 'email', purpose: 'letter', to, subject: 'Visit summary', body: 'Please find the summary attached.', dueAt: new Date(Date.now() - 1000) });
      const lettersComposer = outbox.composerFor('letter');
      outbox.registerComposer('letter', {
        compose: async (x) => ({ action: 'send', to: x.toAddress!, subject: x.subject, body: x.body!, html: '<p>Please find the summary attached.</p>', attachments: [{ filename: 'summary.txt', contentType: 'text/plain', content: 'tooth 36' }] }),
      });
      try {
        await job.drainOnce();
      } finally {
        outbox.registerComposer('letter', lettersComposer);
      }
      const sent = await row(r.id);
      expect(sent.status).toBe('sent');
      const mail = (await waitForMail((m) => m.to.some((x) => x.address === to))) as unknown as { headers: Record<string, string>; subject: string; html?: string; attachments?: { filename: string }[] } | null;
      expect(mail).not.toBeNull();
      expect(mail!.subject).toBe('Visit summary');
      expect(mail!.html).toContain('<p>Please find the summary attached.</p>');
      const id = outboxMessageId(r.id, t.config.mail.from);
      expect(id).toMatch(new RegExp(`^<outbox-${r.id}@[a-z.-]+>$`));
      expect(sent.provider_id).toBe(id);
      expect(mail!.headers['message-id']).toBe(id);
      expect(mail!.attachments?.map((a) => a.filename)).toEqual(['summary.txt']);
    });
  });

  describe('quiet hours (fixed clocks)', () => {
    // references.md: 47 CFR 64.1200(c)(1) 08:00–21:00 local; America/New_York moves 2026-03-08 02:00 → 03:00,
    // America/Los_Angeles the same local hour (IANA tz database through luxon).
    it('defers a text at night to 08:00 local in New York and Los Angeles, across the 2026-03-08 change', async () => {
      const [ny] = await patients(1, { timeZone: 'America/New_York' });
      const [la] = await patients(1, { timeZone: 'America/Los_Angeles' });
      const [noZone] = await patients(1, { timeZone: null }); // falls back to the practice's New York location
      const night = new Date('2026-03-08T06:30:00Z'); // 01:30 EST in New York, 22:30 PST (7 March) in Los Angeles
      const due = new Date(night.getTime() - 60_000);
      const rows = await Promise.all([text(ny!, 'dst ny', due), text(la!, 'dst la', due), text(noZone!, 'dst nozone', due)]);
      await job.drainOnce(night);
      const [a, b, c] = await Promise.all(rows.map((r) => row(r.row.id)));
      // 08:00 EDT (UTC−4, after the change) = 12:00Z; 08:00 PDT = 15:00Z.
      expect(a).toMatchObject({ status: 'pending', due_at: new Date('2026-03-08T12:00:00Z'), defer_reason: 'quiet hours in America/New_York until 08:00', attempts: 0 });
      expect(b).toMatchObject({ status: 'pending', due_at: new Date('2026-03-08T15:00:00Z'), defer_reason: 'quiet hours in America/Los_Angeles until 08:00' });
      expect(c).toMatchObject({ status: 'pending', due_at: new Date('2026-03-08T12:00:00Z'), defer_reason: 'quiet hours in America/New_York until 08:00' });
      expect([ny, la, noZone].flatMap((p) => sentTo(p!.phone))).toHaveLength(0);

      await job.drainOnce(new Date('2026-03-08T11:59:59Z'));
      expect((await row(a.id)).status).toBe('pending');
      await job.drainOnce(new Date('2026-03-08T12:00:00Z'));
      expect(await row(a.id)).toMatchObject({ status: 'sent', sent_at: new Date('2026-03-08T12:00:00Z') });
      expect((await row(c.id)).status).toBe('sent');
      expect((await row(b.id)).status).toBe('pending');
      await job.drainOnce(new Date('2026-03-08T15:00:00Z'));
      expect(await row(b.id)).toMatchObject({ status: 'sent', sent_at: new Date('2026-03-08T15:00:00Z') });
      expect([ny, la, noZone].map((p) => sentTo(p!.phone).length)).toEqual([1, 1, 1]);
    });

    it('the day before the change 08:00 in New York is 13:00Z; 20:59 sends and 21:00 waits for the morning', async () => {
      const [ny] = await patients(1, { timeZone: 'America/New_York' });
      const early = await text(ny!, 'before dst early', new Date('2026-03-07T12:00:00Z'));
      await job.drainOnce(new Date('2026-03-07T12:30:00Z')); // 07:30 EST
      expect(await row(early.row.id)).toMatchObject({ status: 'pending', due_at: new Date('2026-03-07T13:00:00Z') });
      await job.drainOnce(new Date('2026-03-07T13:00:00Z'));
      expect((await row(early.row.id)).status).toBe('sent');

      const [ny2, ny3] = await patients(2, { timeZone: 'America/New_York' });
      const late = await text(ny2!, 'at 20:59', new Date('2026-03-10T00:00:00Z'));
      await job.drainOnce(new Date('2026-03-10T00:59:00Z')); // 20:59 EDT on 9 March
      expect((await row(late.row.id)).status).toBe('sent');
      const tooLate = await text(ny3!, 'at 21:00', new Date('2026-03-10T00:00:00Z'));
      await job.drainOnce(new Date('2026-03-10T01:00:00Z')); // 21:00 EDT: quiet from here (half-open window)
      expect(await row(tooLate.row.id)).toMatchObject({ status: 'pending', due_at: new Date('2026-03-10T12:00:00Z') });
    });

    it('answers a keyword at night (the patient just wrote) and uses the practice quiet hours when set', async () => {
      const [p] = await patients(1, { timeZone: 'America/New_York' });
      const night = new Date('2026-03-11T06:00:00Z'); // 02:00 EDT
      const reply = await text(p!, 'You will get no more texts from us. Reply START to opt back in.', night, { purpose: 'keyword_reply' });
      await job.drainOnce(night);
      expect((await row(reply.row.id)).status).toBe('sent');

      await db.query(
        `INSERT INTO reminder_settings (practice_id, settings, version, created_at, updated_at) VALUES (?, ?, 1, NOW(3), NOW(3))
         ON DUPLICATE KEY UPDATE settings = VALUES(settings)`,
        [practiceId, JSON.stringify({ quietHours: { start: '09:30', end: '18:00' } })],
      );
      try {
        const [q] = await patients(1, { timeZone: 'America/New_York' });
        const r = await text(q!, 'with practice hours', night);
        await job.drainOnce(new Date('2026-03-11T13:00:00Z')); // 09:00 EDT: inside 08–21, outside 09:30–18
        expect(await row(r.row.id)).toMatchObject({ status: 'pending', due_at: new Date('2026-03-11T13:30:00Z'), defer_reason: 'quiet hours in America/New_York until 09:30' });
      } finally {
        await db.query('DELETE FROM reminder_settings WHERE practice_id = ?', [practiceId]);
      }
    });
  });

  describe('status callback POST /api/sms/status', () => {
    const post = (params: Record<string, string>, signature?: string) =>
      t
        .http()
        .post('/api/sms/status')
        .type('form')
        .set('X-Twilio-Signature', signature ?? signTwilioRequest(t.config.sms.authToken, statusUrl, params))
        .send(params);

    const sentRow = async (sid: string) => {
      const [p] = await patients(1);
      const { row: r } = await text(p!, `callback row ${sid}`, new Date(Date.now() - 1000));
      await db.query("UPDATE outbox_messages SET status = 'sent', provider_id = ?, provider_status = 'queued', sent_at = NOW(3) WHERE id = ?", [sid, r.id]);
      return r.id;
    };
    const callback = (sid: string, status: string, extra: Record<string, string> = {}) => ({ MessageSid: sid, MessageStatus: status, AccountSid: t.config.sms.accountSid, ...extra });

    it('marks a sent text delivered on a signed callback and never moves it back', async () => {
      const id = await sentRow('SM00000000000000000000000000000001');
      expect((await post(callback('SM00000000000000000000000000000001', 'delivered'))).status).toBe(204);
      expect(await row(id)).toMatchObject({ status: 'delivered', provider_status: 'delivered' });
      // Late, out-of-order callbacks change nothing.
      for (const late of ['sent', 'queued', 'undelivered']) expect((await post(callback('SM00000000000000000000000000000001', late, { ErrorCode: '30003' }))).status).toBe(204);
      expect(await row(id)).toMatchObject({ status: 'delivered', provider_status: 'delivered', last_error: null });
    });

    it('ends an undelivered text failed with the error in words and emits outbox.failed', async () => {
      const id = await sentRow('SM00000000000000000000000000000002');
      expect((await post(callback('SM00000000000000000000000000000002', 'sent'))).status).toBe(204);
      expect((await row(id)).provider_status).toBe('sent');
      expect((await post(callback('SM00000000000000000000000000000002', 'undelivered', { ErrorCode: '30003' }))).status).toBe(204);
      const reason = 'the carrier could not deliver the text: the phone was unreachable (off or out of coverage) (error 30003)';
      expect(await row(id)).toMatchObject({ status: 'failed', provider_status: 'undelivered', last_error: reason });
      expect(failedEvents.filter((e) => e.outboxId === id).map((e) => e.reason)).toEqual([reason]);
    });

    it('refuses a bad signature and a foreign AccountSid with 403 and changes nothing', async () => {
      const id = await sentRow('SM00000000000000000000000000000003');
      const params = callback('SM00000000000000000000000000000003', 'delivered');
      const bad = await post(params, signTwilioRequest('another-token', statusUrl, params));
      expect(bad.status).toBe(403);
      expect(bad.body.message).toBe('Refused: the X-Twilio-Signature does not match this request');
      const missing = await t.http().post('/api/sms/status').type('form').send(params);
      expect(missing.status).toBe(403);
      expect(missing.body.message).toBe('Refused: the X-Twilio-Signature header is missing');
      // Signed with our token but for another account.
      const foreign = await post({ ...params, AccountSid: 'AC11111111111111111111111111111111' });
      expect(foreign.status).toBe(403);
      expect(foreign.body.message).toBe('Refused: the request is for another provider account');
      // Signed over another host's URL (a proxy's own host): not what we published.
      const otherHost = await post(params, signTwilioRequest(t.config.sms.authToken, 'http://10.0.0.9:8080/api/sms/status', params));
      expect(otherHost.status).toBe(403);
      expect(await row(id)).toMatchObject({ status: 'sent', provider_status: 'queued', delivered_at: null });
    });

    it('answers 400 naming the field when a signed callback lacks MessageStatus', async () => {
      const res = await post({ MessageSid: 'SM00000000000000000000000000000004', AccountSid: t.config.sms.accountSid });
      expect(res.status).toBe(400);
      expect(res.body).toEqual({ statusCode: 400, message: 'MessageStatus is required', errors: [{ field: 'MessageStatus', message: 'is required' }] });
    });
  });

  describe('front-desk API', () => {
    it('lists by patient and status, refuses bad filters, and sends a failed message again', async () => {
      const desk = await t.as('frontdesk');
      const [p] = await patients(1);
      const { row: r } = await text(p!, 'api retry', new Date(Date.now() - 1000), { to: p!.phone.slice(1) });
      await job.drainOnce();
      const list = await desk.get(`/api/outbox?patientId=${p!.id}`);
      expect(list.status).toBe(200);
      expect(list.body).toEqual([expect.objectContaining({ id: r.id, status: 'failed', lastError: 'the number is not a valid phone number (error 21211)', to: p!.phone.slice(1) })]);

      const bad = await desk.get('/api/outbox?status=lost&patientId=x');
      expect(bad.status).toBe(400);
      expect([...new Set(bad.body.errors.map((e: { field: string }) => e.field))].sort()).toEqual(['patientId', 'status']);
      expect((await (await t.as('endodontist')).get('/api/outbox')).status).toBe(403);

      // Corrected number, then sent again.
      await db.query('UPDATE outbox_messages SET to_address = ? WHERE id = ?', [p!.phone, r.id]);
      const retry = await desk.post(`/api/outbox/${r.id}/retry`);
      expect(retry.status).toBe(200);
      expect(retry.body).toMatchObject({ id: r.id, status: 'pending', attempts: 0, lastError: null, failedAt: null });
      await job.drainOnce();
      expect((await row(r.id)).status).toBe('sent');
      expect(sentTo(p!.phone)).toHaveLength(1);

      const again = await desk.post(`/api/outbox/${r.id}/retry`);
      expect(again.status).toBe(409);
      expect(again.body.message).toBe('Only a failed message can be sent again; this one is sent');
      expect((await desk.post('/api/outbox/999999/retry')).status).toBe(404);
    });
  });

  describe('claiming', () => {
    it('skips rows another transaction has locked instead of waiting for them', async () => {
      const ps = await patients(4);
      await db.query("UPDATE outbox_messages SET status = 'cancelled' WHERE status = 'pending'");
      const bodies = await insertTexts(db, practiceId, ps, 4, 'locked', new Date(Date.now() - 5_000));
      const holder = await connect(t.config);
      try {
        await holder.beginTransaction();
        // The same statement the job claims with, holding the two oldest rows.
        const held = (await holder.query(CLAIM_SQL.replace(':now', '?').replace(':limit', '2'), [new Date()])) as { id: number }[];
        expect(held).toHaveLength(2);
        const pass = await job.drainOnce();
        expect(pass.claimed).toBe(2);
        const counts = countsByBody(fake);
        expect(bodies.map((b) => counts.get(b) ?? 0)).toEqual([0, 0, 1, 1]);
        await holder.rollback();
      } finally {
        await holder.end();
      }
      await job.drainOnce();
      const counts = countsByBody(fake);
      expect(bodies.map((b) => counts.get(b) ?? 0)).toEqual([1, 1, 1, 1]);
    });

    it('two applications draining one database at once take disjoint rows and send each text once', async () => {
      await db.query("UPDATE outbox_messages SET status = 'cancelled' WHERE status = 'pending'");
      const ps = await patients(30);
      const bodies = await insertTexts(db, practiceId, ps, 90, 'two-apps', new Date(Date.now() - 5_000));
      const other: INestApplication = await createApp({ ...t.config, messaging: { ...t.config.messaging, batchSize: 50 } });
      await other.init();
      try {
        fake.setFault({ mode: 'slow', delayMs: 100, forMs: 60_000 });
        const otherJob = other.get(OutboxDispatcherService);
        expect(otherJob.workerId).not.toBe(job.workerId);
        const [x, y] = await Promise.all([job.drainOnce(), otherJob.drainOnce()]);
        expect(x.claimed + y.claimed).toBe(90);
        expect(x.claimed).toBeGreaterThan(0);
        expect(y.claimed).toBeGreaterThan(0);
        const byWorker = (await db.query("SELECT claimed_by, COUNT(*) AS n FROM outbox_messages WHERE dedupe_key LIKE 'two-apps:%' GROUP BY claimed_by")) as { claimed_by: string; n: number }[];
        expect(Object.fromEntries(byWorker.map((w) => [w.claimed_by, Number(w.n)]))).toEqual({ [job.workerId]: x.claimed, [otherJob.workerId]: y.claimed });
      } finally {
        fake.clearFault();
        await other.close();
      }
      // Sent, and by now perhaps delivered through the fake's callbacks.
      const statuses = await statusCounts(db, 'two-apps');
      expect((statuses.sent ?? 0) + (statuses.delivered ?? 0)).toBe(90);
      const counts = countsByBody(fake);
      expect(bodies.filter((b) => counts.get(b) !== 1)).toEqual([]);
    });
  });

  it('every number used here is a fictional 555-01xx number', () => {
    // references.md: NANP 555-0100 to 555-0199 are reserved for fictional use.
    for (const i of [0, 99, 100, 4321]) expect(fakeNumber(i)).toMatch(/^\+1[2-9]\d{2}55501\d{2}$/);
  });
});
