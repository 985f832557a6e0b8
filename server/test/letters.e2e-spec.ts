import type { CaseCompletionView, LetterSummary, Referral } from '@ostium/shared';
import { DateTime } from 'luxon';
import { simpleParser, type ParsedMail } from 'mailparser';
import mariadb, { type Connection } from 'mariadb';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { OutboxDispatcherService } from '../src/messaging/outbox-dispatcher.service.js';
import { LetterJobsService } from '../src/referrals/letter-jobs.service.js';
import { INBOX_URL, SMTP_PORT, waitForMail, type InboxMail } from './helpers/mail-inbox.js';
import { readPdf } from './helpers/pdf-text.js';
import { at, schedulingFixture, ZONE, type SchedulingFixture } from './helpers/scheduling-fixture.js';
import { createTestApp, testConfig, type TestApp } from './helpers/test-app.js';

type Agent = Awaited<ReturnType<TestApp['as']>>;

const inbox = { ...testConfig().mail, host: '127.0.0.1', port: SMTP_PORT };

/** The message as the mail server stored it (maildev's raw source), parsed with mailparser. */
async function rawMail(m: InboxMail): Promise<ParsedMail> {
  const res = await fetch(`${INBOX_URL}/api/email/${m.id}/source`);
  expect(res.ok, `maildev source of ${m.id}`).toBe(true);
  return simpleParser(Buffer.from(await res.arrayBuffer()));
}

/** Polls until `done` holds (listeners of domain events run after the response). */
async function eventually<T>(read: () => Promise<T>, done: (v: T) => boolean, timeoutMs = 5_000): Promise<T> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const v = await read();
    if (done(v) || Date.now() > until) return v;
    await new Promise((r) => setTimeout(r, 50));
  }
}

// The shared inbox keeps mail from earlier runs: a name of this run's own finds only this run's letters.
const NAME = `Quill${Array.from({ length: 6 }, () => 'abcdefghijklmnopqrstuvwxyz'[Math.floor(Math.random() * 26)]).join('')}`;

const longDay = (date: string) => DateTime.fromISO(date, { zone: 'utc' }).setLocale('en-US').toFormat('cccc d LLLL yyyy');

describe('letters to referring dentists', () => {
  let t: TestApp;
  let f: SchedulingFixture;
  let desk: Agent, endo: Agent, admin: Agent, manager: Agent, assistant: Agent;
  let db: Connection;
  let op: number;
  let dentistEmail: string;

  /** The outbox job and the letters' settle pass, as the intervals would run them (both are off in tests). */
  const deliver = async () => {
    await t.app.get(OutboxDispatcherService).drainOnce();
    return t.app.get(LetterJobsService).settleOnce();
  };
  const referral = async (id: number): Promise<Referral> => (await desk.get(`/api/referrals/${id}`)).body;
  const lettersOf = async (id: number, kind?: LetterSummary['kind']) => (await referral(id)).letters.filter((l) => !kind || l.kind === kind);
  const patientOf = async (referralId: number) => (await referral(referralId)).patient.name;

  /** Books one visit per given day (09:00–10:00 local) for the case, as one series. */
  const book = async (caseId: number, days: string[], from = '09:00', to = '10:00') => {
    const res = await desk.post('/api/appointments').send({ caseId, visits: days.map((d) => ({ start: at(d, from), end: at(d, to), chairId: f.chair2, operatorId: op })) });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    return res.body.appointments as { id: number; version: number }[];
  };
  /** arrived → seated → dismissed through the API (the chairside path). */
  const dismiss = async (appointmentId: number) => {
    let version = (await desk.get(`/api/appointments/${appointmentId}`)).body.version;
    for (const state of ['arrived', 'seated', 'dismissed']) {
      const res = await desk.patch(`/api/appointments/${appointmentId}`).send({ version, state });
      expect(res.status, JSON.stringify(res.body)).toBe(200);
      version = res.body.version;
    }
  };
  const complete = (caseId: number, body: Record<string, unknown>, as: Agent = endo) => as.post(`/api/cases/${caseId}/completion`).send(body);

  beforeAll(async () => {
    t = await createTestApp({ mail: inbox });
    f = await schedulingFixture(t, NAME, 1);
    op = f.operators[0]!;
    dentistEmail = `${NAME.toLowerCase()}@example.com`;
    [desk, endo, admin, manager, assistant] = await Promise.all([t.as('frontdesk'), t.as('endodontist'), t.as('admin'), t.as('manager'), t.as('assistant')]);
    db = await mariadb.createConnection({ host: t.config.db.host, port: t.config.db.port, user: t.config.db.user, password: t.config.db.password, database: t.config.db.name });
  });
  afterAll(async () => {
    await db?.end();
    await t?.close();
  });

  it('queues the acknowledgement in the outbox with the referral and marks it sent when the mail server took it', async () => {
    const { referralId } = await f.newCase();
    const [ack] = await lettersOf(referralId);
    expect(ack).toMatchObject({ kind: 'acknowledgement', to: dentistEmail, status: 'queued', detail: null, sentAt: null });
    const rows = (await db.query('SELECT purpose, channel, dedupe_key, letter_id, status FROM outbox_messages WHERE referral_id = ?', [referralId])) as Record<string, unknown>[];
    expect(rows).toEqual([{ purpose: 'letter', channel: 'email', dedupe_key: `letter:${ack!.id}`, letter_id: ack!.id, status: 'pending' }]);

    expect(await deliver()).toBeGreaterThanOrEqual(1);
    const [sent] = await lettersOf(referralId);
    expect(sent).toMatchObject({ status: 'sent', detail: null, sentAt: expect.any(String) });
    const name = await patientOf(referralId);
    const mail = await waitForMail((m) => m.subject === 'Referral received – Quillfern Endodontics' && !!m.text?.includes(name));
    expect(mail, 'the acknowledgement reached the inbox').not.toBeNull();
    expect(mail!.to.map((a) => a.address)).toEqual([dentistEmail]);
    // Settled once: a second pass finds nothing more to record for it.
    const [again] = (await db.query('SELECT status, message_id FROM letters WHERE id = ?', [ack!.id])) as { status: string; message_id: string }[];
    expect(again).toEqual({ status: 'sent', message_id: expect.stringMatching(/^<outbox-\d+@/) });
  });

  it('sends one booking notice per referral, on the first booking, with the tooth, procedure, first visit and endodontist', async () => {
    const { caseId, referralId } = await f.newCase({ tooth: '36' });
    const day = f.monday;
    await book(caseId, [day]);
    // The notice is queued by a listener after the booking has committed.
    const [notice] = await eventually(() => lettersOf(referralId, 'booking_notice'), (l) => l.length > 0);
    expect(notice).toMatchObject({ kind: 'booking_notice', status: 'queued', to: dentistEmail, subject: 'Treatment booked for your referral – Quillfern Endodontics' });

    // A second series for the same referral is not a first booking; the event again is no second letter either.
    await book(caseId, [DateTime.fromISO(day).plus({ days: 7 }).toISODate()!]);
    const practiceId = (await desk.get('/api/practice')).body.id as number;
    expect(await t.app.get(LetterJobsService).queueBookingNotice(practiceId, referralId, caseId, null)).toBe(false);
    await deliver();
    const notices = await lettersOf(referralId, 'booking_notice');
    expect(notices).toHaveLength(1);
    expect(notices[0]!.status).toBe('sent');

    const name = await patientOf(referralId);
    const first = await waitForMail((m) => m.subject.startsWith('Treatment booked') && !!m.text?.includes(name));
    expect(first, 'the booking notice reached the inbox').not.toBeNull();
    const text = first!.text!;
    // Universal 19 is FDI 36 (ISO 3950 / HL7 crosswalk, references.md).
    expect(text).toContain('Tooth: #19 (FDI 36), mandibular left first molar');
    expect(text).toContain('Procedure: Root canal treatment');
    expect(text).toContain(`First visit: ${longDay(day)}, 09:00–10:00 (${DateTime.fromISO(`${day}T09:00`, { zone: ZONE }).setLocale('en-US').toFormat('ZZZZ')})`);
    expect(text).toContain(`Endodontist: Dr. ${NAME} Operator 1`);
    expect(text).toContain('We will send you a report when treatment ends. The treatment is planned in 2 visits.');
    const parsed = await rawMail(first!);
    expect(parsed.text).toContain('We will send you a report when treatment ends.');
    // Exactly one booking notice for this patient reached the mail server.
    const res = await fetch(`${INBOX_URL}/api/email`);
    const all = (await res.json()) as InboxMail[];
    expect(all.filter((m) => m.subject.startsWith('Treatment booked') && m.text?.includes(name))).toHaveLength(1);
  });

  it('refuses completion while a visit is still booked, naming it, and before any visit is dismissed', async () => {
    const { caseId, referralId } = await f.newCase({ tooth: '46' });
    const d1 = DateTime.fromISO(f.monday).plus({ days: 1 }).toISODate()!;
    const d2 = DateTime.fromISO(f.monday).plus({ days: 8 }).toISODate()!;
    const none = await complete(caseId, { findings: 'Canals located and shaped.' });
    expect(none.status).toBe(409);
    expect(none.body).toEqual({
      statusCode: 409,
      message: 'No visit of this case has been dismissed yet; complete the case after its last visit',
      errors: [{ field: 'visits', message: 'No visit of this case has been dismissed yet; complete the case after its last visit' }],
    });

    const [v1, v2] = await book(caseId, [d1, d2]);

    await dismiss(v1!.id);
    const open = await complete(caseId, { findings: 'Canals located and shaped.' });
    const when = DateTime.fromISO(`${d2}T09:00`, { zone: ZONE }).setLocale('en-US').toFormat("ccc d LLL yyyy 'at' HH:mm");
    expect(open.status).toBe(409);
    expect(open.body).toEqual({
      statusCode: 409,
      message: `The case still has an open visit: the visit on ${when} is still booked`,
      errors: [{ field: 'visits', message: `the visit on ${when} is still booked` }],
    });
    const view: CaseCompletionView = (await desk.get(`/api/cases/${caseId}/completion`)).body;
    expect(view).toMatchObject({ canComplete: false, openVisits: [{ appointmentId: v2!.id, state: 'booked' }], completion: null, defaultRecallPlan: [6, 12] });
    expect(view.visits.map((v) => v.appointmentId)).toEqual([v1!.id]);
    expect((await referral(referralId)).status).toBe('booked');
    expect((await lettersOf(referralId, 'completion_report'))).toEqual([]);
  });

  it('completes the case, queues the report, and moves the referral to report_sent only once the report is sent', async () => {
    const { caseId, referralId } = await f.newCase({ tooth: '36' });
    const d1 = DateTime.fromISO(f.monday).plus({ days: 2 }).toISODate()!;
    const d2 = DateTime.fromISO(f.monday).plus({ days: 9 }).toISODate()!;
    const [v1, v2] = await book(caseId, [d1, d2], '10:00', '11:30');
    await dismiss(v1!.id);
    await dismiss(v2!.id);
    await deliver(); // acknowledgement and booking notice out of the way

    const findings = 'Three canals located (MB, ML, D), working lengths confirmed.\nObturated with warm vertical compaction; please restore within four weeks.';
    const res = await complete(caseId, { findings });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const view: CaseCompletionView = res.body;
    expect(view.caseStatus).toBe('completed');
    expect(view.completion).toMatchObject({
      findings,
      sendReport: true,
      treatmentEndedOn: d2,
      completedBy: expect.stringMatching(/\S/),
      // Default from the estimate table: reviews 6 and 12 months after treatment (design/estimator.md; ESE 2006 asks for at least one year, references.md).
      recallPlan: [
        { months: 6, dueOn: DateTime.fromISO(d2).plus({ months: 6 }).toISODate() },
        { months: 12, dueOn: DateTime.fromISO(d2).plus({ months: 12 }).toISODate() },
      ],
      report: { kind: 'completion_report', status: 'queued', to: dentistEmail },
    });
    const r1 = await referral(referralId);
    expect(r1.status).toBe('completed');
    expect(r1.history.map((h) => h.status).slice(-2)).toEqual(['in_treatment', 'completed']);

    // Settling before anything was sent changes nothing.
    await t.app.get(LetterJobsService).settleOnce();
    expect((await referral(referralId)).status).toBe('completed');

    await deliver();
    const r2 = await referral(referralId);
    expect(r2.status).toBe('report_sent');
    expect(r2.history.at(-1)).toMatchObject({ status: 'report_sent', reason: 'Completion report e-mailed to the referring dentist', byUserId: null, byName: 'Letters (report e-mailed)' });
    expect(r2.cases[0]!.status).toBe('report_sent');
    const audit = (await admin.get(`/api/audit?entity=referrals&entityId=${referralId}`)).body.items as { after: Record<string, unknown> | null; userId: number | null }[];
    expect(audit.some((e) => e.after?.status === 'report_sent' && e.userId === null)).toBe(true);

    const saved: CaseCompletionView = (await desk.get(`/api/cases/${caseId}/completion`)).body;
    expect(saved.completion!.report).toMatchObject({ status: 'sent', sentAt: expect.any(String) });

    // The e-mail with its PDF reached the mail server; the PDF holds the tooth, the visits and the recall dates.
    const name = await patientOf(referralId);
    const mail = await waitForMail((m) => m.subject === 'Completion report – Quillfern Endodontics' && !!m.text?.includes(name));
    expect(mail, 'the completion report reached the inbox').not.toBeNull();
    const parsed = await rawMail(mail!);
    expect(parsed.to && !Array.isArray(parsed.to) ? parsed.to.value.map((a) => a.address) : []).toEqual([dentistEmail]);
    expect(parsed.attachments.map((a) => [a.filename, a.contentType])).toEqual([[`completion-report-fdi-36-${d2}.pdf`, 'application/pdf']]);
    const pdf = parsed.attachments[0]!.content;
    // Read back with test/helpers/pdf-text.ts (no PDF parser is installed: xref check, zlib inflate, ToUnicode CMaps).
    const doc = readPdf(pdf);
    expect(doc.problems).toEqual([]);
    const text = doc.pages.join('\n');
    for (const line of [
      '#19 (FDI 36), mandibular left first molar',
      name,
      'Root canal treatment',
      `${longDay(d1)}, 10:00–11:30`,
      `${longDay(d2)}, 10:00–11:30`,
      `Dr. ${NAME} Operator 1`,
      'Three canals located (MB, ML, D), working lengths confirmed.',
      `Recall review due ${longDay(DateTime.fromISO(d2).plus({ months: 6 }).toISODate()!)}`,
      `Recall review due ${longDay(DateTime.fromISO(d2).plus({ months: 12 }).toISODate()!)}`,
    ]) {
      expect(text, line).toContain(line);
    }
    expect(doc.info.Author).toBe('Quillfern Endodontics');

    // The PDF for a look is the one that was sent, byte for byte (rendered again from the letter's facts).
    const look = await desk.get(`/api/letters/${saved.completion!.report!.id}/pdf`).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(look.status).toBe(200);
    expect(look.headers['content-type']).toBe('application/pdf');
    expect((look.body as Buffer).equals(pdf)).toBe(true);

    // Once sent, the completion can no longer change.
    const again = await complete(caseId, { findings: 'Changed my mind.' });
    expect(again.status).toBe(409);
    expect(again.body.message).toBe('The completion report was already sent; the completion can no longer change');
  });

  it('completes without a report when asked, and queues it later on request', async () => {
    const { caseId, referralId } = await f.newCase({ tooth: '11' });
    const [v] = await book(caseId, [DateTime.fromISO(f.monday).plus({ days: 3 }).toISODate()!]);
    await dismiss(v!.id);
    const res = await complete(caseId, { findings: 'Single canal, obturated.', recallPlan: [12, 3], sendReport: false });
    expect(res.status).toBe(201);
    expect(res.body.completion).toMatchObject({ sendReport: false, report: null, recallPlan: [{ months: 3 }, { months: 12 }] });
    await deliver();
    expect((await referral(referralId)).status).toBe('completed');
    expect(await lettersOf(referralId, 'completion_report')).toEqual([]);

    const later = await complete(caseId, { findings: 'Single canal, obturated. No symptoms at dismissal.' });
    expect(later.status).toBe(201);
    expect(later.body.completion).toMatchObject({ sendReport: true, findings: 'Single canal, obturated. No symptoms at dismissal.', report: { status: 'queued' } });
    await deliver();
    expect((await referral(referralId)).status).toBe('report_sent');
  });

  it('moves a referral of two teeth to completed after the last tooth, and to report_sent after the last report', async () => {
    const res = await desk.post('/api/referrals').send({
      patient: { firstName: 'Bram', lastName: `${NAME}-Ashdown`, dateOfBirth: '1971-02-11', phone: '(202) 555-0178' },
      referringDentist: { name: `Dr. ${NAME} Second`, email: `${NAME.toLowerCase()}.second@example.com` },
      locationId: f.locationId,
      urgency: 'routine',
      procedure: 'initial',
      notation: 'fdi',
      teeth: [{ tooth: '16' }, { tooth: '26' }],
    });
    expect(res.status).toBe(201);
    const [a, b] = res.body.cases as { id: number }[];
    const referralId = res.body.id as number;
    const [va] = await book(a!.id, [DateTime.fromISO(f.monday).plus({ days: 4 }).toISODate()!], '08:00', '09:00');
    const [vb] = await book(b!.id, [DateTime.fromISO(f.monday).plus({ days: 4 }).toISODate()!], '10:00', '11:00');
    await dismiss(va!.id);
    await dismiss(vb!.id);

    expect((await complete(a!.id, { findings: 'Four canals, MB2 found.' })).status).toBe(201);
    expect((await referral(referralId)).status).toBe('booked');
    await deliver();
    // The first report went, but the referral is not completed yet: it waits for the other tooth.
    const mid = await referral(referralId);
    expect(mid.status).toBe('booked');
    expect(mid.cases.map((c) => c.status)).toEqual(['report_sent', 'booked']);

    expect((await complete(b!.id, { findings: 'Three canals.' })).status).toBe(201);
    expect((await referral(referralId)).status).toBe('completed');
    await deliver();
    expect((await referral(referralId)).status).toBe('report_sent');
    expect((await lettersOf(referralId, 'completion_report')).map((l) => l.status)).toEqual(['sent', 'sent']);
  });

  it('lets only the endodontist complete; others read; bad input gets 400 naming the field', async () => {
    const { caseId } = await f.newCase({ tooth: '21' });
    for (const [role, agent] of [['frontdesk', desk], ['manager', manager], ['admin', admin], ['assistant', assistant]] as const) {
      const res = await complete(caseId, { findings: 'x' }, agent);
      expect(res.status, role).toBe(403);
      expect(res.body).toEqual({ statusCode: 403, message: `The ${role} role cannot do this` });
    }
    expect((await desk.get(`/api/cases/${caseId}/completion`)).status).toBe(200);
    expect((await assistant.get(`/api/cases/${caseId}/completion`)).status).toBe(403);

    const fields = async (body: Record<string, unknown>) => {
      const res = await complete(caseId, body);
      expect(res.status, JSON.stringify(res.body)).toBe(400);
      return (res.body.errors as { field: string; message: string }[]).map((e) => `${e.field}: ${e.message}`);
    };
    expect(await fields({})).toContain('findings: findings is required: write what the referring dentist should know');
    expect(await fields({ findings: '   ' })).toEqual(['findings: findings is required: write what the referring dentist should know']);
    expect(await fields({ findings: 'x'.repeat(4001) })).toEqual(['findings: findings must be at most 4000 characters']);
    expect(await fields({ findings: 'ok', recallPlan: [0] })).toEqual(['recallPlan: recallPlan: each review at least 1 month after treatment']);
    expect(await fields({ findings: 'ok', recallPlan: [6, 6] })).toEqual(['recallPlan: recallPlan lists a month twice']);
    expect(await fields({ findings: 'ok', sendReport: 'yes' })).toEqual(['sendReport: sendReport must be true or false']);
    expect((await complete(999999, { findings: 'ok' })).status).toBe(404);

    // The PDF route: letters that are not a report have none; a missing letter is 404.
    const ack = (await desk.get(`/api/referrals/${(await desk.get(`/api/cases/${caseId}`)).body.referralId}`)).body.letters[0];
    const noPdf = await desk.get(`/api/letters/${ack.id}/pdf`);
    expect(noPdf.status).toBe(404);
    expect(noPdf.body.message).toBe(`Letter ${ack.id} is acknowledgement; only a completion report has a PDF`);
    expect((await assistant.get(`/api/letters/${ack.id}/pdf`)).status).toBe(403);
  });
});

describe('letters when the mail server is down', () => {
  let t: TestApp;
  let f: SchedulingFixture;
  let desk: Agent, endo: Agent;
  let db: Connection;

  beforeAll(async () => {
    const { closedPort } = await import('./helpers/mail-inbox.js');
    const port = await closedPort();
    // One attempt, so the first refused connection ends the message failed.
    t = await createTestApp({ mail: { ...inbox, port }, messaging: { maxAttempts: 1 } });
    f = await schedulingFixture(t, 'Quilldown', 1);
    [desk, endo] = await Promise.all([t.as('frontdesk'), t.as('endodontist')]);
    db = await mariadb.createConnection({ host: t.config.db.host, port: t.config.db.port, user: t.config.db.user, password: t.config.db.password, database: t.config.db.name });
  });
  afterAll(async () => {
    await db?.end();
    await t?.close();
  });

  it('shows the report failed with the reason (through OUTBOX_FAILED) and leaves the referral completed', async () => {
    const { caseId, referralId } = await f.newCase({ tooth: '36' });
    const appt = await desk.post('/api/appointments').send({ caseId, visits: [{ start: at(f.monday, '09:00'), end: at(f.monday, '10:00'), chairId: f.chair2, operatorId: f.operators[0] }] });
    expect(appt.status).toBe(201);
    const id = appt.body.appointments[0].id;
    let version = appt.body.appointments[0].version;
    for (const state of ['arrived', 'seated', 'dismissed']) version = (await desk.patch(`/api/appointments/${id}`).send({ version, state })).body.version;
    const done = await endo.post(`/api/cases/${caseId}/completion`).send({ findings: 'Two canals, obturated.' });
    expect(done.status).toBe(201);
    const letterId = done.body.completion.report.id as number;

    await t.app.get(OutboxDispatcherService).drainOnce();
    // No settle pass here: the OUTBOX_FAILED listener records the failure on the letter by itself.
    let row: { status: string; detail: string | null } | undefined;
    for (let i = 0; i < 50; i++) {
      [row] = (await db.query('SELECT status, detail FROM letters WHERE id = ?', [letterId])) as { status: string; detail: string | null }[];
      if (row?.status !== 'queued') break;
      await new Promise((r) => setTimeout(r, 100));
    }
    const port = t.config.mail.port;
    expect(row).toEqual({ status: 'failed', detail: `the mail server at 127.0.0.1:${port} refused the connection (gave up after 1 attempts)` });
    const view: CaseCompletionView = (await desk.get(`/api/cases/${caseId}/completion`)).body;
    expect(view.completion!.report).toMatchObject({ status: 'failed', detail: expect.stringContaining('refused the connection') });
    const r: Referral = (await desk.get(`/api/referrals/${referralId}`)).body;
    expect(r.status).toBe('completed');
    expect(r.letters.find((l) => l.kind === 'completion_report')).toMatchObject({ status: 'failed' });
    // The settle pass agrees and moves nothing further.
    await t.app.get(LetterJobsService).settleOnce();
    expect(((await desk.get(`/api/referrals/${referralId}`)).body as Referral).status).toBe('completed');

    // A failed report may be queued again (the completion is then saved again with it).
    const retry = await endo.post(`/api/cases/${caseId}/completion`).send({ findings: 'Two canals, obturated.' });
    expect(retry.status).toBe(201);
    expect(retry.body.completion.report).toMatchObject({ status: 'queued' });
    expect(retry.body.completion.report.id).not.toBe(letterId);
  });
});
