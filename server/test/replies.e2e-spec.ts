import type { SmsFake } from '@ostium/sms-fake';
import type { Connection } from 'mariadb';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { MessagingClock } from '../src/messaging/messaging-clock.service.js';
import { OutboxService } from '../src/messaging/outbox.service.js';
import { ReminderPlannerService } from '../src/reminders/reminder-planner.service.js';
import { connect, startFake } from './helpers/outbox-fixture.js';
import { freePort } from './helpers/private-mariadb.js';
import { drain, inbound, INBOUND_PATH, newSid, repliesWorld, setClock, textingNow, type PatientCase, type RepliesWorld } from './helpers/replies-fixture.js';
import { plusDays } from './helpers/scheduling-fixture.js';
import { createTestApp, testConfig, type TestApp } from './helpers/test-app.js';

const TWIML = '<?xml version="1.0" encoding="UTF-8"?><Response/>';
const PRACTICE = 'Quillfern Endodontics';

describe('inbound texts: keywords and their effects', () => {
  let t: TestApp;
  let w: RepliesWorld;
  let db: Connection;
  let fake: SmsFake;
  let port: number;
  let slotNo = 0;

  /** A fresh visit slot on chair 2 / operator 1: half-hour steps through the fixture's weekday mornings. */
  const nextSlot = () => {
    const i = slotNo++;
    const dayIndex = Math.floor(i / 5);
    const day = plusDays(w.f.monday, Math.floor(dayIndex / 5) * 7 + (dayIndex % 5));
    // 45-minute steps: a 30-minute visit and the chair’s turnover.
    const startMin = 8 * 60 + (i % 5) * 45;
    const hhmm = (m: number) => `${String(Math.floor(m / 60)).padStart(2, '0')}:${String(m % 60).padStart(2, '0')}`;
    return { day, from: hhmm(startMin), to: hhmm(startMin + 30) };
  };
  const withVisit = async (opts: { consent?: boolean } = {}) => {
    const p = await w.patient(opts);
    const s = nextSlot();
    const appt = await w.book(p.caseId, s.day, s.from, s.to);
    return { p, appt };
  };
  const q = async <T>(sql: string, args: unknown[] = []) => (await db.query(sql, args)) as T[];
  const patientRow = async (id: number) =>
    (await q<{ sms_consent: number; sms_consent_at: Date | null; sms_consent_source: string | null }>('SELECT sms_consent, sms_consent_at, sms_consent_source FROM patients WHERE id = ?', [id]))[0]!;
  const appointment = async (id: number) =>
    (await q<{ state: string; version: number; confirmed_via: string | null; confirmed_at: Date | null }>('SELECT state, version, confirmed_via, confirmed_at FROM appointments WHERE id = ?', [id]))[0]!;
  const inboundRows = async (phone: string) =>
    q<{ id: number; kind: string; effect: string | null; patient_id: number | null; appointment_id: number | null; read_at: Date | null }>(
      'SELECT id, kind, effect, patient_id, appointment_id, read_at FROM inbound_messages WHERE from_address = ? ORDER BY id',
      [phone],
    );
  const outTo = async (phone: string) =>
    q<{ id: number; purpose: string; body: string; status: string; dedupe_key: string | null; defer_reason: string | null }>(
      // What replies queue; reminders (queued by the reminder planner on booking) are looked at on their own.
      "SELECT id, purpose, body, status, dedupe_key, defer_reason FROM outbox_messages WHERE to_address = ? AND purpose IN ('keyword_reply', 'desk_reply', 'waitlist_offer') ORDER BY id",
      [phone],
    );
  const remindersOf = async (appointmentId: number) =>
    q<{ id: number; channel: string; status: string; defer_reason: string | null }>("SELECT id, channel, status, defer_reason FROM outbox_messages WHERE appointment_id = ? AND purpose = 'reminder' ORDER BY id", [appointmentId]);
  const tasksOf = async (patientId: number) => q<{ kind: string; detail: string; appointment_id: number | null; status: string }>('SELECT kind, detail, appointment_id, status FROM desk_tasks WHERE patient_id = ? ORDER BY id', [patientId]);
  const say = async (p: Pick<PatientCase, 'phone'>, body: string) => {
    const res = await inbound(t, { from: p.phone, body });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    return res;
  };

  beforeAll(async () => {
    fake = await startFake(testConfig());
    port = await freePort();
    // A public URL of our own (as behind a proxy); the signature is checked against it, not the request's host.
    t = await createTestApp({ publicUrl: `http://127.0.0.1:${port}`, sms: { apiBase: fake.url } });
    await t.app.listen(port, '127.0.0.1');
    setClock(t, textingNow());
    w = await repliesWorld(t, 'Keyworth', '212');
    db = await connect(t.config);
    // Whatever the demo data queued stays out of these drains.
    await db.query("UPDATE outbox_messages SET status = 'cancelled' WHERE status = 'pending'");
  });
  afterAll(async () => {
    await db?.end();
    await t?.close();
    await fake?.close();
  });

  describe('confirm words', () => {
    // design/messaging.md "Replies: C / YES / CONFIRM → confirmed"; lower case and trailing punctuation count (keywords.util.ts).
    it.each(['C', 'YES', 'CONFIRM', 'c', 'yes!', 'Confirm.', ' Yes '])('%j confirms the next visit (state, confirmed_via sms, version + 1), answers empty TwiML, sends nothing', async (word) => {
      const { p, appt } = await withVisit();
      const res = await say(p, word);
      expect(res.headers['content-type']).toMatch(/^text\/xml/);
      expect(res.text).toBe(TWIML);
      const a = await appointment(appt.id);
      expect(a).toMatchObject({ state: 'confirmed', version: appt.version + 1, confirmed_via: 'sms' });
      expect(a.confirmed_at).not.toBeNull();
      const [m] = await inboundRows(p.phone);
      expect(m).toMatchObject({ kind: 'confirm', patient_id: p.patientId, appointment_id: appt.id });
      expect(m!.effect).toMatch(/^Confirmed the visit on \w{3} \d{1,2} \w{3} \d{1,2}:\d{2} [AP]M at Keyworth$/);
      expect(m!.read_at).not.toBeNull();
      // Default settings: no thank-you text (texts are kept few).
      expect(await outTo(p.phone)).toEqual([]);
      // What the Chair board reads.
      const board = await (await t.as('frontdesk')).get(`/api/appointments/${appt.id}`);
      expect(board.body).toMatchObject({ state: 'confirmed', confirmedVia: 'sms' });
    });

    it('a second C leaves the confirmed visit alone (version unchanged)', async () => {
      const { p, appt } = await withVisit();
      await say(p, 'C');
      await say(p, 'C');
      expect((await appointment(appt.id)).version).toBe(appt.version + 1);
      const rows = await inboundRows(p.phone);
      expect(rows[1]!.effect).toMatch(/already confirmed; nothing changed/);
    });

    it('C without an upcoming visit stays unread in the inbox', async () => {
      const p = await w.patient();
      await say(p, 'C');
      const [m] = await inboundRows(p.phone);
      expect(m).toMatchObject({ kind: 'confirm', appointment_id: null, read_at: null });
      expect(m!.effect).toBe('No upcoming visit to confirm; left in the inbox for the front desk');
    });

    it('matches the next visit, not a later one', async () => {
      const p = await w.patient();
      const later = await w.book(p.caseId, plusDays(w.f.monday, 30), '09:00', '09:30');
      const sooner = await w.book(p.caseId, plusDays(w.f.monday, 29), '10:00', '10:30');
      await say(p, 'yes');
      expect((await appointment(sooner.id)).state).toBe('confirmed');
      expect((await appointment(later.id)).state).toBe('booked');
    });

    it('sends the practice’s own thank-you when its reminder settings carry a confirm-thanks template', async () => {
      const { p, appt } = await withVisit();
      const practiceId = (await q<{ id: number }>('SELECT MIN(id) AS id FROM practices'))[0]!.id;
      const settings = { templates: [{ id: 'confirm-thanks', label: 'Thanks', channel: 'sms', subject: null, body: '{practice}: thank you, see you {date} at {time}. {optOut}' }] };
      await db.query('INSERT INTO reminder_settings (practice_id, settings, version, created_at, updated_at) VALUES (?, ?, 1, NOW(3), NOW(3)) ON DUPLICATE KEY UPDATE settings = VALUES(settings)', [practiceId, JSON.stringify(settings)]);
      try {
        await say(p, 'C');
      } finally {
        await db.query('DELETE FROM reminder_settings WHERE practice_id = ?', [practiceId]);
      }
      expect((await appointment(appt.id)).state).toBe('confirmed');
      const [out] = await outTo(p.phone);
      expect(out).toMatchObject({ purpose: 'keyword_reply' });
      expect(out!.body).toMatch(/^Quillfern Endodontics: thank you, see you \w{3} \d{1,2} \w{3} at \d{1,2}:\d{2} [AP]M\. Reply STOP to opt out$/);
    });
  });

  describe('reschedule words', () => {
    // design/messaging.md "R / RESCHEDULE → a task for the front desk".
    it.each(['R', 'RESCHEDULE', 'r', 'Reschedule.'])('%j makes one reschedule task and one short text; the visit stays', async (word) => {
      const { p, appt } = await withVisit();
      await say(p, word);
      const tasks = await tasksOf(p.patientId);
      expect(tasks).toHaveLength(1);
      expect(tasks[0]).toMatchObject({ kind: 'reschedule_request', appointment_id: appt.id, status: 'open' });
      expect(tasks[0]!.detail).toMatch(/^Asks to reschedule the visit on \w{3} \d{1,2} \w{3} \d{1,2}:\d{2} [AP]M at Keyworth/);
      expect((await appointment(appt.id)).state).toBe('booked');
      const outs = await outTo(p.phone);
      expect(outs).toHaveLength(1);
      expect(outs[0]).toMatchObject({ purpose: 'keyword_reply', body: `Thanks. ${PRACTICE} will call you to find a new time. Reply STOP to opt out.` });
    });

    it('a second R adds no second task and no second text', async () => {
      const { p } = await withVisit();
      await say(p, 'R');
      await say(p, 'r');
      expect(await tasksOf(p.patientId)).toHaveLength(1);
      expect(await outTo(p.phone)).toHaveLength(1);
    });
  });

  describe('opt-out words', () => {
    // references.md "Messages": STOP, END, CANCEL, UNSUBSCRIBE, QUIT (industry handbook), REVOKE, OPT OUT (since 2025); STOPALL (keywords.util.ts).
    it.each(['STOP', 'END', 'CANCEL', 'UNSUBSCRIBE', 'QUIT', 'REVOKE', 'OPT OUT', 'STOPALL', 'stop', 'Stop!', 'opt out.', 'unsubscribe '])(
      '%j withdraws consent at once and queues exactly one acknowledgement',
      async (word) => {
        const { p, appt } = await withVisit();
        await say(p, word);
        const row = await patientRow(p.patientId);
        expect(row.sms_consent).toBe(0);
        expect(row.sms_consent_at).not.toBeNull();
        expect(row.sms_consent_source).toMatch(new RegExp(`^replied ${word.trim().replace(/[.!]$/, '').toUpperCase()} on \\d{4}-\\d{2}-\\d{2}$`));
        const outs = await outTo(p.phone);
        expect(outs).toHaveLength(1);
        expect(outs[0]).toMatchObject({ purpose: 'keyword_reply', body: `You will get no more texts from ${PRACTICE}. Reply START to resume.` });
        // The visit itself is not cancelled: CANCEL means the texts (an opt-out word), not the appointment.
        expect((await appointment(appt.id)).state).toBe('booked');
        const [m] = await inboundRows(p.phone);
        expect(m).toMatchObject({ kind: 'opt_out' });
        expect(m!.effect).toMatch(/^Texts stopped \(replied [A-Z ]+\)(; \d+ pending texts? cancelled)?; acknowledged once$/);
      },
    );

    it('STOP twice sends one acknowledgement; the fake receives exactly one text', async () => {
      const { p } = await withVisit();
      await say(p, 'STOP');
      await say(p, 'STOP');
      const outs = await outTo(p.phone);
      expect(outs).toHaveLength(1);
      const rows = await inboundRows(p.phone);
      expect(rows[1]!.effect).toMatch(/texts were already off; no second acknowledgement$/);
      await drain(t);
      const got = fake.messages({ to: p.phone, direction: 'outbound-api' });
      expect(got.map((m) => m.body)).toEqual([`You will get no more texts from ${PRACTICE}. Reply START to resume.`]);
    });

    it('two STOPs at the same moment still send one acknowledgement', async () => {
      const { p } = await withVisit();
      const [a, b] = await Promise.all([inbound(t, { from: p.phone, body: 'STOP' }), inbound(t, { from: p.phone, body: 'QUIT' })]);
      expect([a.status, b.status]).toEqual([200, 200]);
      expect(await outTo(p.phone)).toHaveLength(1);
    });

    it('after STOP no reminder is sent: the queued reminder texts are cancelled, a later one is skipped; the acknowledgement still goes', async () => {
      const { p, appt } = await withVisit();
      await t.app.get(ReminderPlannerService).idle();
      const queued = (await remindersOf(appt.id)).filter((r) => r.channel === 'sms');
      // The default rules queue a text 48 h and one 24 h before (default-reminder-settings.ts).
      expect(queued.length).toBeGreaterThan(0);
      expect(queued.every((r) => r.status === 'pending')).toBe(true);
      await say(p, 'STOP');
      for (const r of (await remindersOf(appt.id)).filter((x) => x.channel === 'sms')) expect(r).toMatchObject({ status: 'cancelled', defer_reason: 'consent withdrawn' });
      const [m] = await inboundRows(p.phone);
      expect(m!.effect).toBe(`Texts stopped (replied STOP); ${queued.length} pending text${queued.length === 1 ? '' : 's'} cancelled; acknowledged once`);
      // A reminder queued after the STOP (say by a rule added later) is skipped at send time.
      const practiceId = (await q<{ practice_id: number }>('SELECT practice_id FROM patients WHERE id = ?', [p.patientId]))[0]!.practice_id;
      const late = await t.app.get(OutboxService).enqueue({
        practiceId,
        channel: 'sms',
        purpose: 'reminder',
        ruleId: 'text-48h',
        dedupeKey: `appt:${appt.id}:sms:text-48h-late`,
        appointmentId: appt.id,
        patientId: p.patientId,
        to: p.phone,
        // Due at the (frozen) messaging clock's now, so the first drain takes it.
        dueAt: t.app.get(MessagingClock).now(),
      });
      await drain(t);
      // The reminder composer first moves it to its rule's time (48 h before); there it finds no consent.
      const [moved] = await q<{ status: string; due_at: Date }>('SELECT status, due_at FROM outbox_messages WHERE id = ?', [late.row.id]);
      // Other tests' reminders also fall due by then; a frozen clock would claim them (and their deferrals) first.
      await db.query("UPDATE outbox_messages SET status = 'cancelled' WHERE status = 'pending' AND id <> ?", [late.row.id]);
      expect(moved!.status).toBe('pending');
      expect(new Date(moved!.due_at).getTime()).toBeGreaterThan(t.app.get(MessagingClock).now().getTime());
      await drain(t, new Date(moved!.due_at));
      const [after] = await q<{ status: string; defer_reason: string }>('SELECT status, defer_reason FROM outbox_messages WHERE id = ?', [late.row.id]);
      expect(after).toEqual({ status: 'skipped', defer_reason: 'no text consent' });
      expect(fake.messages({ to: p.phone, direction: 'outbound-api' }).map((x) => x.body)).toEqual([`You will get no more texts from ${PRACTICE}. Reply START to resume.`]);
    });
  });

  describe('START, HELP and anything else', () => {
    it.each(['START', 'start', 'Start.'])('%j restores consent with a one-line acknowledgement', async (word) => {
      const { p } = await withVisit();
      await say(p, 'STOP');
      await say(p, word);
      const row = await patientRow(p.patientId);
      expect(row.sms_consent).toBe(1);
      expect(row.sms_consent_source).toMatch(/^replied START on \d{4}-\d{2}-\d{2}$/);
      const outs = await outTo(p.phone);
      expect(outs.map((o) => o.body)).toEqual([`You will get no more texts from ${PRACTICE}. Reply START to resume.`, `Texts from ${PRACTICE} are on again. Reply STOP to opt out.`]);
      expect(outs[1]!.body).not.toContain('\n');
      // A STOP after START is acknowledged again: it is a new opt-out.
      await say(p, 'STOP');
      expect(await outTo(p.phone)).toHaveLength(3);
    });

    it('START from a patient whose texts are on sends nothing', async () => {
      const { p } = await withVisit();
      await say(p, 'START');
      expect(await outTo(p.phone)).toEqual([]);
      expect((await inboundRows(p.phone))[0]!.effect).toMatch(/texts were already on; no reply sent$/);
    });

    it.each(['HELP', 'INFO', 'help', 'Info?'])('%j answers with the practice’s name and phone and how to opt out, in one segment', async (word) => {
      const { p } = await withVisit();
      await say(p, word);
      const [out] = await outTo(p.phone);
      // references.md "Messages": HELP / INFO answered with the practice's name, contact and how to opt out.
      expect(out!.body).toBe(`${PRACTICE}: questions about your visit? Call (202) 555-0100. Reply STOP to opt out.`);
      expect(out!.body.length).toBeLessThanOrEqual(160);
      expect((await patientRow(p.patientId)).sms_consent).toBe(1);
    });

    it.each(['Can I come at 3 instead?', 'stop by at 3', 'C R', 'yes please'])('%j goes to the inbox, unread, and changes nothing', async (body) => {
      const { p, appt } = await withVisit();
      await say(p, body);
      const [m] = await inboundRows(p.phone);
      expect(m).toMatchObject({ kind: 'other', patient_id: p.patientId, appointment_id: appt.id, read_at: null });
      expect(m!.effect).toBe('Left in the inbox for the front desk; nothing changed');
      expect(await appointment(appt.id)).toMatchObject({ state: 'booked', version: appt.version });
      expect((await patientRow(p.patientId)).sms_consent).toBe(1);
      expect(await outTo(p.phone)).toEqual([]);
      expect(await tasksOf(p.patientId)).toEqual([]);
    });

    it('a number two patients gave (a family): C confirms the one with the visit; STOP stops texts for both', async () => {
      const parent = await w.patient();
      const child = await w.patient({ phone: parent.phone });
      const s = nextSlot();
      const appt = await w.book(child.caseId, s.day, s.from, s.to);
      await say(parent, 'C');
      expect((await appointment(appt.id)).state).toBe('confirmed');
      expect((await inboundRows(parent.phone))[0]).toMatchObject({ patient_id: child.patientId, appointment_id: appt.id });
      await say(parent, 'STOP');
      expect((await patientRow(parent.patientId)).sms_consent).toBe(0);
      expect((await patientRow(child.patientId)).sms_consent).toBe(0);
      expect(await outTo(parent.phone)).toHaveLength(1);
      // The thread says that the one STOP changed both patients.
      expect((await inboundRows(parent.phone))[1]!.effect).toMatch(/^Texts stopped \(replied STOP\) for all 2 patients who gave this number(; \d+ pending texts? cancelled)?; acknowledged once$/);
    });

    it('matches the sender in any form the provider writes the number', async () => {
      const { p, appt } = await withVisit();
      const national = `(${p.phone.slice(2, 5)}) ${p.phone.slice(5, 8)}-${p.phone.slice(8)}`;
      await inbound(t, { from: national, body: 'C' });
      expect((await appointment(appt.id)).state).toBe('confirmed');
    });
  });

  describe('unknown senders', () => {
    it('an unknown number is stored unmatched with one open task; nothing else changes', async () => {
      const stranger = '+14155550123';
      const counts = async () => (await q<{ a: number; o: number; p: number }>('SELECT (SELECT COUNT(*) FROM appointments WHERE state = "confirmed") AS a, (SELECT COUNT(*) FROM outbox_messages) AS o, (SELECT COUNT(*) FROM patients WHERE sms_consent = 0) AS p'))[0]!;
      // Reminders still being planned for earlier bookings would move the counts.
      await t.app.get(ReminderPlannerService).idle();
      const before = await counts();
      await inbound(t, { from: stranger, body: 'C' }).expect(200);
      await inbound(t, { from: stranger, body: 'STOP' }).expect(200);
      await t.app.get(ReminderPlannerService).idle();
      const rows = await inboundRows(stranger);
      expect(rows).toHaveLength(2);
      for (const r of rows) expect(r).toMatchObject({ patient_id: null, appointment_id: null, read_at: null });
      expect(rows[0]!.effect).toBe('No patient gave this number; left in the inbox with a task for the front desk');
      const tasks = await q<{ kind: string; detail: string }>("SELECT t.kind, t.detail FROM desk_tasks t JOIN inbound_messages m ON m.id = t.inbound_message_id WHERE m.from_address = ?", [stranger]);
      expect(tasks).toEqual([{ kind: 'unmatched_reply', detail: 'A text from (415) 555-0123 matches no patient: "C"' }]);
      expect(await counts()).toEqual(before);
      expect(await q("SELECT id FROM outbox_messages WHERE to_address = ?", [stranger])).toEqual([]);
    });
  });

  describe('the webhook itself', () => {
    it('stores a message once: a retried webhook (same MessageSid) is handled once, also when both arrive together', async () => {
      const { p, appt } = await withVisit();
      const sid = newSid();
      const [a, b] = await Promise.all([inbound(t, { from: p.phone, body: 'R', sid }), inbound(t, { from: p.phone, body: 'R', sid })]);
      expect([a.status, b.status]).toEqual([200, 200]);
      expect((await inbound(t, { from: p.phone, body: 'R', sid })).status).toBe(200);
      expect(await inboundRows(p.phone)).toHaveLength(1);
      expect(await tasksOf(p.patientId)).toHaveLength(1);
      expect(await outTo(p.phone)).toHaveLength(1);
      expect((await appointment(appt.id)).state).toBe('booked');
    });

    const refused = async (o: Parameters<typeof inbound>[1], why: RegExp) => {
      const total = async () => (await q<{ n: number }>('SELECT COUNT(*) AS n FROM inbound_messages'))[0]!.n;
      const before = await total();
      const res = await inbound(t, o);
      expect(res.status).toBe(403);
      expect(res.body.message).toMatch(why);
      expect(await total()).toBe(before);
    };

    it('refuses a tampered body with 403 and stores nothing', async () => {
      const { p, appt } = await withVisit();
      await refused({ from: p.phone, body: 'R', tamperBody: 'STOP' }, /does not match/);
      expect((await patientRow(p.patientId)).sms_consent).toBe(1);
      expect((await appointment(appt.id)).state).toBe('booked');
    });

    it('refuses a missing signature, a wrong token, another account and a signature over another URL', async () => {
      const { p } = await withVisit();
      await refused({ from: p.phone, body: 'C', noSignature: true }, /missing/);
      await refused({ from: p.phone, body: 'C', signWith: 'someone-elses-token' }, /does not match/);
      // Signed correctly with our token, but for another provider account: not ours.
      await refused({ from: p.phone, body: 'C', accountSid: 'AC11111111111111111111111111111111' }, /another provider account/);
      // The configured public URL is what counts, not where the request happened to arrive.
      await refused({ from: p.phone, body: 'C', signUrl: `http://localhost:${port}${INBOUND_PATH}` }, /does not match/);
      expect(await inboundRows(p.phone)).toEqual([]);
    });

    it('names a missing field of a signed form with 400', async () => {
      const res = await inbound(t, { from: '', body: 'C' });
      expect(res.status).toBe(400);
      expect(res.body).toEqual({ statusCode: 400, message: 'From must be given', errors: [{ field: 'From', message: 'must be given' }] });
    });

    it('handles a reply the SMS fake posts, signed as the provider signs it', async () => {
      const { p, appt } = await withVisit();
      const r = await fake.reply({ from: p.phone, body: 'Yes', url: `${t.config.publicUrl}${INBOUND_PATH}` });
      expect(r.status).toBe(200);
      expect(r.body).toBe(TWIML);
      expect((await appointment(appt.id)).state).toBe('confirmed');
      const [m] = await q<{ provider_id: string }>('SELECT provider_id FROM inbound_messages WHERE from_address = ?', [p.phone]);
      expect(m!.provider_id).toBe(r.sid);
      // A TwiML answer with <Message> would make the fake send a reply; ours has none.
      expect(fake.messages({ to: p.phone })).toHaveLength(0);
    });
  });
});
