import { EventEmitter2 } from '@nestjs/event-emitter';
import type { DeskTask, ReplyThread, ReplyThreadSummary } from '@ostium/shared';
import type { SmsFake } from '@ostium/sms-fake';
import type { Connection } from 'mariadb';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { OUTBOX_FAILED, type OutboxFailedEvent } from '../src/messaging/messaging-events.js';
import { connect, startFake, waitFor } from './helpers/outbox-fixture.js';
import { freePort } from './helpers/private-mariadb.js';
import { drain, inbound, repliesWorld, setClock, textingNow, type RepliesWorld } from './helpers/replies-fixture.js';
import { plusDays } from './helpers/scheduling-fixture.js';
import { createTestApp, testConfig, type TestApp } from './helpers/test-app.js';

describe('Replies: threads, tasks and desk replies', () => {
  let t: TestApp;
  let w: RepliesWorld;
  let db: Connection;
  let fake: SmsFake;
  let desk: Awaited<ReturnType<TestApp['as']>>;
  let now: Date;
  let day = 0;

  const visit = async (opts: { consent?: boolean; email?: string | null } = {}) => {
    const p = await w.patient(opts);
    const appt = await w.book(p.caseId, plusDays(w.f.monday, day++), '09:00', '09:30');
    return { p, appt };
  };
  const threads = async (filter?: string) => {
    const res = await desk.get(`/api/replies/threads${filter ? `?filter=${filter}` : ''}`);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    return res.body as ReplyThreadSummary[];
  };
  const thread = async (key: number | string) => {
    const res = await desk.get(`/api/replies/threads/${key}`);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    return res.body as ReplyThread;
  };
  /** Texts arriving a minute apart on the fixed clock, so "latest" is unambiguous. */
  const say = async (from: string, body: string) => {
    now = new Date(now.getTime() + 60_000);
    setClock(t, now);
    const res = await inbound(t, { from, body });
    expect(res.status).toBe(200);
  };

  beforeAll(async () => {
    fake = await startFake(testConfig(), { statusDelayMs: 20 });
    const port = await freePort();
    t = await createTestApp({ publicUrl: `http://127.0.0.1:${port}`, sms: { apiBase: fake.url } });
    // Listening for real so the fake's status callbacks (delivery failures) reach the app.
    await t.app.listen(port, '127.0.0.1');
    now = textingNow();
    setClock(t, now);
    w = await repliesWorld(t, 'Threadmere', '312');
    db = await connect(t.config);
    desk = await t.as('frontdesk');
  });
  afterAll(async () => {
    await db?.end();
    await t?.close();
    await fake?.close();
  });

  it('lists unread threads first, then the latest, with unread and task counts', async () => {
    const a = await visit();
    const b = await visit();
    const c = await visit();
    await say(a.p.phone, 'Is parking free?');
    await say(a.p.phone, 'And can my son come along?');
    await say(b.p.phone, 'C');
    await say(c.p.phone, 'Running ten minutes late');
    await say(b.p.phone, 'R');
    const mine = (await threads()).filter((x) => [a.p.patientId, b.p.patientId, c.p.patientId].includes(x.patientId!));
    // c and a are unread (c the later); b has only handled keywords (read), though its last text is the newest.
    expect(mine.map((x) => x.patientId)).toEqual([c.p.patientId, a.p.patientId, b.p.patientId]);
    expect(mine.map((x) => x.unread)).toEqual([1, 2, 0]);
    expect(mine[2]).toMatchObject({ openTasks: 1, failed: 0, smsConsent: true, patientName: b.p.name, address: null });
    expect(mine[0]!.lastPreview).toBe('Running ten minutes late');
    expect(mine[1]!.lastPreview).toBe('And can my son come along?');
    // b's latest item is the automatic reply to its R, queued right after the R.
    expect(mine[2]!.lastPreview).toMatch(/will call you to find a new time/);
    const all = await threads();
    for (let i = 1; i < all.length; i++) {
      const [x, y] = [all[i - 1]!, all[i]!];
      expect(Number(x.unread > 0) > Number(y.unread > 0) || (Number(x.unread > 0) === Number(y.unread > 0) && x.lastAt >= y.lastAt)).toBe(true);
    }
    expect((await threads('unread')).every((x) => x.unread > 0)).toBe(true);
    expect((await threads('unread')).map((x) => x.patientId)).toEqual(expect.arrayContaining([a.p.patientId, c.p.patientId]));
    expect((await threads('tasks')).map((x) => x.patientId)).toContain(b.p.patientId);
    expect((await threads('tasks')).map((x) => x.patientId)).not.toContain(a.p.patientId);

    // Reading a thread clears its unread count (and only its own).
    expect((await desk.post(`/api/replies/threads/${a.p.patientId}/read`)).status).toBe(204);
    const after = (await threads()).filter((x) => [a.p.patientId, c.p.patientId].includes(x.patientId!));
    expect(after.find((x) => x.patientId === a.p.patientId)!.unread).toBe(0);
    expect(after.find((x) => x.patientId === c.p.patientId)!.unread).toBe(1);
    expect((await threads('unread')).map((x) => x.patientId)).not.toContain(a.p.patientId);
    const [row] = (await db.query('SELECT read_by FROM inbound_messages WHERE patient_id = ? LIMIT 1', [a.p.patientId])) as { read_by: number }[];
    expect(row!.read_by).toBeGreaterThan(0);
  });

  it('shows a thread in time order: what went out (with its state) and what came in, the tasks and the next visit', async () => {
    const { p, appt } = await visit();
    await say(p.phone, 'HELP');
    await say(p.phone, 'See you then');
    const th = await thread(p.patientId);
    expect(th).toMatchObject({ patientId: p.patientId, patientName: p.name, phone: p.phone, smsConsent: true });
    expect(th.nextAppointment).toMatchObject({ id: appt.id, start: appt.start, state: 'booked', locationName: 'Threadmere' });
    const shape = th.items.map((i) => (i.direction === 'in' ? `in:${i.kind}` : `out:${i.purpose}`));
    // The booking e-mail and the reminders were queued on booking; reminders fall due later, so they come last.
    expect(shape).toEqual(expect.arrayContaining(['in:help', 'out:keyword_reply', 'in:other']));
    expect(shape.indexOf('in:help')).toBeLessThan(shape.indexOf('out:keyword_reply'));
    expect(shape.indexOf('out:keyword_reply')).toBeLessThan(shape.indexOf('in:other'));
    const at = (i: ReplyThread['items'][number]) => (i.direction === 'in' ? i.receivedAt : (i.sentAt ?? i.failedAt ?? i.dueAt));
    for (let i = 1; i < th.items.length; i++) expect(at(th.items[i - 1]!) <= at(th.items[i]!)).toBe(true);
    const reply = th.items.find((i) => i.direction === 'out' && i.purpose === 'keyword_reply')!;
    expect(reply).toMatchObject({ status: 'pending', to: p.phone });
    await drain(t);
    await fake.settled();
    const later = await thread(p.patientId);
    const sent = later.items.find((i) => i.id === reply.id && i.direction === 'out')!;
    expect(['sent', 'delivered']).toContain(sent.direction === 'out' && sent.status);
    const help = later.items.find((i) => i.direction === 'in' && i.kind === 'help')!;
    expect(help).toMatchObject({ channel: 'sms', from: p.phone, body: 'HELP', effect: "Sent the practice's name, number and how to opt out" });
    expect(later.tasks).toEqual([]);
  });

  it('keeps an unknown sender in a thread of its own (unmatched:<number>)', async () => {
    const stranger = '+13125550199';
    await say(stranger, 'Who is this?');
    const list = (await threads('unread')).filter((x) => x.address === stranger);
    expect(list).toEqual([{ patientId: null, patientName: null, address: stranger, unread: 1, openTasks: 1, failed: 0, lastAt: expect.any(String), lastPreview: 'Who is this?', smsConsent: null }]);
    const th = await thread(`unmatched:${stranger}`);
    expect(th).toMatchObject({ patientId: null, phone: stranger, smsConsent: null, nextAppointment: null });
    expect(th.items).toHaveLength(1);
    expect(th.tasks.map((x) => x.kind)).toEqual(['unmatched_reply']);
    expect((await desk.post(`/api/replies/threads/unmatched:${stranger}/read`)).status).toBe(204);
    expect((await threads('unread')).some((x) => x.address === stranger)).toBe(false);
    const reply = await desk.post(`/api/replies/threads/unmatched:${stranger}/messages`).send({ channel: 'sms', body: 'Hello' });
    expect(reply.status).toBe(409);
    expect(reply.body.message).toBe(`${stranger} belongs to no patient, so there is no consent to text it; add the number to a patient first`);
    expect((await desk.get('/api/replies/threads/unmatched:+19995550100')).status).toBe(404);
    expect((await desk.get('/api/replies/threads/999999')).status).toBe(404);
    const bad = await desk.get('/api/replies/threads/someone');
    expect(bad.status).toBe(400);
    expect(bad.body.errors).toEqual([{ field: 'patientId', message: 'a patient id or unmatched:<address>' }]);
  });

  describe('desk replies', () => {
    it('queues a text with the opt-out hint added, through the outbox', async () => {
      const { p, appt } = await visit();
      const res = await desk.post(`/api/replies/threads/${p.patientId}/messages`).send({ channel: 'sms', body: '  Parking is free behind the building.  ' });
      expect(res.status, JSON.stringify(res.body)).toBe(201);
      expect(res.body).toMatchObject({ channel: 'sms', purpose: 'desk_reply', status: 'pending', to: p.phone, patientId: p.patientId, appointmentId: appt.id, body: 'Parking is free behind the building. Reply STOP to opt out.' });
      // A text that already says how to opt out gets no second hint.
      const own = await desk.post(`/api/replies/threads/${p.patientId}/messages`).send({ channel: 'sms', body: 'See you soon. Text STOP to opt out' });
      expect(own.body.body).toBe('See you soon. Text STOP to opt out');
      await drain(t);
      // The job sends several rows at once, so the fake may record them in either order.
      expect(fake.messages({ to: p.phone, direction: 'outbound-api' }).map((m) => m.body).sort()).toEqual(['Parking is free behind the building. Reply STOP to opt out.', 'See you soon. Text STOP to opt out']);
      const [{ created_by }] = (await db.query('SELECT created_by FROM outbox_messages WHERE id = ?', [res.body.id])) as { created_by: number }[];
      expect(created_by).toBeGreaterThan(0);
    });

    it('refuses a text without consent (409 with the reason) and after STOP', async () => {
      const { p } = await visit({ consent: false });
      const res = await desk.post(`/api/replies/threads/${p.patientId}/messages`).send({ channel: 'sms', body: 'Hello' });
      expect(res.status).toBe(409);
      expect(res.body).toEqual({ statusCode: 409, message: `${p.name} has not agreed to texts; call or e-mail instead` });
      const q = await visit();
      await say(q.p.phone, 'STOP');
      const after = await desk.post(`/api/replies/threads/${q.p.patientId}/messages`).send({ channel: 'sms', body: 'Hello' });
      expect(after.status).toBe(409);
      expect(after.body.message).toMatch(new RegExp(`^${q.p.name} has not agreed to texts \\(replied STOP on \\d{4}-\\d{2}-\\d{2}\\); call or e-mail instead$`));
      const [{ n }] = (await db.query("SELECT COUNT(*) AS n FROM outbox_messages WHERE patient_id IN (?, ?) AND purpose = 'desk_reply'", [p.patientId, q.p.patientId])) as { n: number }[];
      expect(Number(n)).toBe(0);
    });

    it('keeps a text to one segment with the hint: 160 GSM-7 or 70 UCS-2 characters', async () => {
      const { p } = await visit();
      const hint = ' Reply STOP to opt out.';
      // design/messaging.md: ≤ 160 characters GSM-7, 70 when the text needs UCS-2 — counted by encoding.
      const fits = 'a'.repeat(160 - hint.length);
      expect((await desk.post(`/api/replies/threads/${p.patientId}/messages`).send({ channel: 'sms', body: fits })).status).toBe(201);
      const over = await desk.post(`/api/replies/threads/${p.patientId}/messages`).send({ channel: 'sms', body: `${fits}a` });
      expect(over.status).toBe(400);
      expect(over.body.errors).toEqual([{ field: 'body', message: 'body: with the opt-out hint the text is 161 of 160 GSM-7 characters; shorten it to one segment' }]);
      // "€" is GSM-7 but from the extension table: two septets (3GPP TS 23.038).
      const euro = await desk.post(`/api/replies/threads/${p.patientId}/messages`).send({ channel: 'sms', body: `${'a'.repeat(160 - hint.length - 1)}€` });
      expect(euro.status).toBe(400);
      expect(euro.body.message).toMatch(/161 of 160 GSM-7/);
      // An emoji makes the whole text UCS-2: 70 code units, the emoji counting two.
      const ucs = 'ß'.repeat(70 - hint.length - 2) + '🙂';
      expect((await desk.post(`/api/replies/threads/${p.patientId}/messages`).send({ channel: 'sms', body: ucs })).status).toBe(201);
      const ucsOver = await desk.post(`/api/replies/threads/${p.patientId}/messages`).send({ channel: 'sms', body: `ł${ucs}` });
      expect(ucsOver.status).toBe(400);
      expect(ucsOver.body.message).toMatch(/71 of 70 UCS-2/);
    });

    it('sends an e-mail only to an address on file, with a default subject', async () => {
      const { p } = await visit();
      const res = await desk.post(`/api/replies/threads/${p.patientId}/messages`).send({ channel: 'email', body: 'Your forms are attached to the portal.' });
      expect(res.status).toBe(201);
      expect(res.body).toMatchObject({ channel: 'email', purpose: 'desk_reply', subject: 'A message from Quillfern Endodontics', body: 'Your forms are attached to the portal.' });
      const none = await visit({ email: null });
      const refused = await desk.post(`/api/replies/threads/${none.p.patientId}/messages`).send({ channel: 'email', subject: 'Forms', body: 'Hello' });
      expect(refused.status).toBe(409);
      expect(refused.body.message).toBe(`${none.p.name} has no e-mail address on file`);
    });

    it('names the bad field', async () => {
      const { p } = await visit();
      const url = `/api/replies/threads/${p.patientId}/messages`;
      expect((await desk.post(url).send({ channel: 'sms', body: '   ' })).body.errors).toEqual([{ field: 'body', message: 'body must not be empty' }]);
      expect((await desk.post(url).send({ channel: 'fax', body: 'x' })).body.errors).toEqual([{ field: 'channel', message: 'channel must be one of sms, email' }]);
      expect((await desk.post(url).send({ channel: 'sms', body: 'x', to: '+12025550100' })).body.errors).toEqual([{ field: 'to', message: 'to is not a known field' }]);
      expect((await desk.post('/api/replies/threads/999999/messages').send({ channel: 'sms', body: 'x' })).status).toBe(404);
    });
  });

  describe('tasks', () => {
    it('lists open tasks and marks one done (who and when)', async () => {
      const { p } = await visit();
      await say(p.phone, 'R');
      const open = await desk.get('/api/replies/tasks?status=open');
      expect(open.status).toBe(200);
      const task = (open.body as DeskTask[]).find((x) => x.patientId === p.patientId)!;
      expect(task).toMatchObject({ kind: 'reschedule_request', status: 'open', patientName: p.name, doneAt: null, doneBy: null });
      const done = await desk.patch(`/api/replies/tasks/${task.id}`).send({ status: 'done' });
      expect(done.status).toBe(200);
      expect(done.body).toMatchObject({ id: task.id, status: 'done', doneBy: expect.any(String) });
      expect(done.body.doneAt).not.toBeNull();
      expect(((await desk.get('/api/replies/tasks?status=open')).body as DeskTask[]).some((x) => x.id === task.id)).toBe(false);
      expect(((await desk.get('/api/replies/tasks?status=done')).body as DeskTask[]).some((x) => x.id === task.id)).toBe(true);
      expect((await threads()).find((x) => x.patientId === p.patientId)!.openTasks).toBe(0);
      expect((await desk.patch(`/api/replies/tasks/${task.id}`).send({ status: 'closed' })).body.errors).toEqual([{ field: 'status', message: 'status must be one of open, done' }]);
      expect((await desk.get('/api/replies/tasks?status=later')).status).toBe(400);
      expect((await desk.patch('/api/replies/tasks/999999').send({ status: 'done' })).status).toBe(404);
    });

    it('turns a text that ends failed into one delivery_failed task with the reason, and shows it under "failed"', async () => {
      const { p } = await visit();
      fake.setFailingNumbers([p.phone]);
      const sent = await desk.post(`/api/replies/threads/${p.patientId}/messages`).send({ channel: 'sms', body: 'Please call us.' });
      expect(sent.status).toBe(201);
      await drain(t);
      await fake.settled();
      const task = await waitFor(
        'the delivery_failed task',
        async () => ((await db.query("SELECT id, detail, outbox_message_id FROM desk_tasks WHERE kind = 'delivery_failed' AND patient_id = ?", [p.patientId])) as { id: number; detail: string; outbox_message_id: number }[])[0],
        10_000,
      );
      expect(task.outbox_message_id).toBe(sent.body.id);
      expect(task.detail).toMatch(/^The text \(desk reply\) could not be delivered: the carrier could not deliver the text.*\(error 30003\)$/);
      const summary = (await threads('failed')).find((x) => x.patientId === p.patientId)!;
      expect(summary).toMatchObject({ failed: 1, openTasks: 1 });
      // The same event again (another instance, a repeat) adds nothing.
      const [row] = (await db.query('SELECT practice_id FROM outbox_messages WHERE id = ?', [sent.body.id])) as { practice_id: number }[];
      const again: OutboxFailedEvent = { practiceId: row!.practice_id, outboxId: sent.body.id, channel: 'sms', purpose: 'desk_reply', patientId: p.patientId, appointmentId: null, reason: 'again', at: new Date() };
      await t.app.get(EventEmitter2).emitAsync(OUTBOX_FAILED, again);
      const [{ n }] = (await db.query("SELECT COUNT(*) AS n FROM desk_tasks WHERE kind = 'delivery_failed' AND outbox_message_id = ?", [sent.body.id])) as { n: number }[];
      expect(Number(n)).toBe(1);
      fake.setFailingNumbers([]);
    });
  });

  it('lets the front desk and the administrator in, and no one else (ACCESS.replies)', async () => {
    const { p } = await visit();
    const task = ((await desk.get('/api/replies/tasks')).body as DeskTask[])[0]!;
    const calls = (agent: Awaited<ReturnType<TestApp['as']>>) => [
      agent.get('/api/replies/threads'),
      agent.get(`/api/replies/threads/${p.patientId}`),
      agent.post(`/api/replies/threads/${p.patientId}/read`),
      agent.post(`/api/replies/threads/${p.patientId}/messages`).send({ channel: 'email', body: 'Role check' }),
      agent.get('/api/replies/tasks?status=open'),
      agent.patch(`/api/replies/tasks/${task.id}`).send({ status: 'open' }),
    ];
    for (const role of ['endodontist', 'assistant', 'manager'] as const) {
      for (const [i, res] of (await Promise.all(calls(await t.as(role)))).entries()) {
        expect(res.status, `${role}, call ${i}`).toBe(403);
        expect(res.body).toEqual({ statusCode: 403, message: `The ${role} role cannot do this` });
      }
    }
    for (const role of ['frontdesk', 'admin'] as const) {
      const codes = (await Promise.all(calls(await t.as(role)))).map((r) => r.status);
      expect(codes, role).toEqual([200, 200, 204, 201, 200, 200]);
    }
    const [{ n }] = (await db.query("SELECT COUNT(*) AS n FROM outbox_messages WHERE patient_id = ? AND purpose = 'desk_reply'", [p.patientId])) as { n: number }[];
    expect(Number(n)).toBe(2);
    expect((await t.http().get('/api/replies/threads')).status).toBe(401);
  });
});
