import mariadb, { type Connection } from 'mariadb';
import { spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { at, plusDays, schedulingFixture, type SchedulingFixture } from './helpers/scheduling-fixture.js';
import { createTestApp, type TestApp } from './helpers/test-app.js';

describe('booking', () => {
  let t: TestApp;
  let f: SchedulingFixture;
  let db: Connection;
  let opA: number, opB: number;

  beforeAll(async () => {
    t = await createTestApp();
    f = await schedulingFixture(t, 'Bookbay', 2);
    [opA, opB] = f.operators as [number, number];
    db = await mariadb.createConnection({ host: t.config.db.host, port: t.config.db.port, user: t.config.db.user, password: t.config.db.password, database: t.config.db.name });
  });
  afterAll(async () => {
    await db?.end();
    await t?.close();
  });

  const slot = (day: string, from: string, to: string, chairId: number, operatorId: number, microscopeId?: number) => ({
    start: at(day, from),
    end: at(day, to),
    chairId,
    operatorId,
    ...(microscopeId ? { microscopeId } : {}),
  });

  /** Pairs of live appointments that overlap on a chair (with turnover), an operator or a microscope. */
  const overlaps = async () =>
    (await db.query(
      `SELECT a.id, b.id AS other FROM appointments a JOIN appointments b ON a.id < b.id
        WHERE a.state NOT IN ('cancelled','no_show') AND b.state NOT IN ('cancelled','no_show')
          AND ((a.chair_id = b.chair_id AND a.start < b.end + INTERVAL b.turnover_minutes MINUTE AND b.start < a.end + INTERVAL a.turnover_minutes MINUTE)
            OR (a.operator_id = b.operator_id AND a.start < b.end AND b.start < a.end)
            OR (a.microscope_id = b.microscope_id AND a.start < b.end AND b.start < a.end))`,
    )) as unknown[];

  it('lets exactly one of 50 parallel requests for the same slot win', async () => {
    const day = f.monday;
    const token = await t.token('frontdesk');
    const cases = await Promise.all(Array.from({ length: 50 }, () => f.newCase()));
    const server = t.app.getHttpServer();
    const results = await Promise.all(
      cases.map(({ caseId }) =>
        request(server)
          .post('/api/appointments')
          .set('Authorization', `Bearer ${token}`)
          .send({ caseId, visits: [slot(day, '08:00', '09:00', f.chair1, opA)] }),
      ),
    );
    const codes = results.map((r) => r.status);
    expect(codes.filter((c) => c === 201)).toHaveLength(1);
    expect(codes.filter((c) => c === 409)).toHaveLength(49);
    const winner = results.find((r) => r.status === 201)!.body.appointments[0];
    for (const loser of results.filter((r) => r.status === 409)) {
      expect(loser.body.statusCode).toBe(409);
      expect(loser.body.conflicts.length).toBeGreaterThan(0);
      expect(loser.body.conflicts.every((c: { appointmentId: number }) => c.appointmentId === winner.id)).toBe(true);
    }
    expect(await overlaps()).toEqual([]);
    const [{ n }] = (await db.query("SELECT COUNT(*) AS n FROM appointments WHERE start = ? AND state = 'booked'", [new Date(at(day, '08:00'))])) as { n: bigint }[];
    expect(Number(n)).toBe(1);
  });

  it('holds across two server processes on one database', async () => {
    // A second, separate Node process (the built server) on the same database: no shared memory at all.
    const main = join(dirname(fileURLToPath(import.meta.url)), '..', 'dist', 'main.js');
    expect(existsSync(main), 'build the server first (npm test does; or npx tsc -p tsconfig.build.json)').toBe(true);
    const port = 20000 + Math.floor(Math.random() * 20000);
    const child = spawn(process.execPath, [main], {
      env: {
        ...process.env,
        NODE_ENV: 'test',
        PORT: String(port),
        DB_HOST: t.config.db.host,
        DB_PORT: String(t.config.db.port),
        DB_NAME: t.config.db.name,
        DB_USER: t.config.db.user,
        DB_PASSWORD: t.config.db.password,
        JWT_SECRET: t.config.jwt.secret,
        LOG_LEVEL: 'silent',
        CLIENT_DIST: '',
        // `npm test` exports TWILIO_API_BASE (the shared fake); this process must send nothing anywhere.
        TWILIO_API_BASE: '',
        MESSAGING_JOB: 'off',
      },
      stdio: 'ignore',
    });
    try {
      const other = `http://127.0.0.1:${port}`;
      for (let i = 0; ; i++) {
        const up = await request(other).get('/api/health').catch(() => null);
        if (up?.status === 200) break;
        if (i > 150) throw new Error('the second server did not start');
        await new Promise((r) => setTimeout(r, 100));
      }
      const day = plusDays(f.monday, 1);
      const token = await t.token('frontdesk');
      const cases = await Promise.all(Array.from({ length: 50 }, () => f.newCase()));
      const targets = [t.app.getHttpServer(), other];
      const results = await Promise.all(
        cases.map(({ caseId }, i) =>
          request(targets[i % 2]!)
            .post('/api/appointments')
            .set('Authorization', `Bearer ${token}`)
            // Same operator, different chairs: the operator's cells are what collides.
            .send({ caseId, visits: [slot(day, '09:00', '10:30', i % 2 ? f.chair1 : f.chair2, opB)] }),
        ),
      );
      const codes = results.map((r) => r.status);
      expect(codes.filter((c) => c === 201)).toHaveLength(1);
      expect(codes.filter((c) => c === 409)).toHaveLength(49);
      // Both processes answered some of the losers.
      expect(results.filter((r, i) => i % 2 === 1 && r.status === 409).length).toBeGreaterThan(0);
      expect(await overlaps()).toEqual([]);
    } finally {
      child.kill('SIGTERM');
    }
  });

  it('books a whole series or nothing, and lists every conflicting visit', async () => {
    const desk = await t.as('frontdesk');
    const day = plusDays(f.monday, 2);
    const blocker = await f.newCase();
    const b = await desk.post('/api/appointments').send({ caseId: blocker.caseId, visits: [slot(plusDays(day, 7), '10:00', '11:00', f.chair2, opA)] });
    expect(b.status).toBe(201);
    const { caseId } = await f.newCase();
    const res = await desk.post('/api/appointments').send({ caseId, visits: [slot(day, '08:00', '09:00', f.chair2, opA), slot(plusDays(day, 7), '10:30', '11:30', f.chair2, opA)] });
    expect(res.status).toBe(409);
    expect(res.body.conflicts.map((c: { visitIndex: number; resource: string; appointmentId: number }) => [c.visitIndex, c.resource, c.appointmentId]).sort()).toEqual([
      [1, 'chair', b.body.appointments[0].id],
      [1, 'operator', b.body.appointments[0].id],
    ]);
    const [{ n }] = (await db.query('SELECT COUNT(*) AS n FROM appointments WHERE case_id = ?', [caseId])) as { n: bigint }[];
    expect(Number(n)).toBe(0);
    const [{ cells }] = (await db.query('SELECT COUNT(*) AS cells FROM appointment_cells c JOIN appointments a ON a.id = c.appointment_id WHERE a.case_id = ?', [caseId])) as { cells: bigint }[];
    expect(Number(cells)).toBe(0);
    // Both visits colliding: both are named.
    const both = await desk.post('/api/appointments').send({ caseId, visits: [slot(plusDays(day, 7), '10:00', '10:30', f.chair2, opB), slot(plusDays(day, 7), '10:45', '11:15', f.chair2, opB)] });
    expect(both.status).toBe(409);
    expect([...new Set(both.body.conflicts.map((c: { visitIndex: number }) => c.visitIndex))]).toEqual([0, 1]);
    // A free series books both visits and moves the case and its referral to booked.
    const ok = await desk.post('/api/appointments').send({ caseId, visits: [slot(day, '08:00', '09:00', f.chair2, opA), slot(plusDays(day, 8), '08:00', '09:00', f.chair2, opA)] });
    expect(ok.status).toBe(201);
    expect(ok.body.appointments.map((a: { visitIndex: number; state: string; seriesId: string }) => [a.visitIndex, a.state])).toEqual([
      [0, 'booked'],
      [1, 'booked'],
    ]);
    expect(ok.body.appointments[0].seriesId).toBe(ok.body.appointments[1].seriesId);
    const ref = await desk.get(`/api/referrals/${(await db.query('SELECT referral_id FROM cases WHERE id = ?', [caseId]))[0].referral_id}`);
    expect(ref.body.status).toBe('booked');
    expect(ref.body.cases[0].status).toBe('booked');
  });

  it('returns the first booking when a request is retried with the same Idempotency-Key', async () => {
    const desk = await t.as('frontdesk');
    const { caseId } = await f.newCase();
    const body = { caseId, visits: [slot(plusDays(f.monday, 3), '08:00', '08:45', f.chair1, opA)] };
    const first = await desk.post('/api/appointments').set('Idempotency-Key', 'retry-key-0001').send(body);
    expect(first.status).toBe(201);
    const again = await desk.post('/api/appointments').set('Idempotency-Key', 'retry-key-0001').send(body);
    expect(again.status).toBe(201);
    expect(again.headers['idempotent-replayed']).toBe('true');
    expect(again.body).toEqual(first.body);
    // Parallel retries of a new key make one booking, not a twin and not a 409.
    const { caseId: c2 } = await f.newCase();
    const twice = await Promise.all([1, 2, 3].map(() => desk.post('/api/appointments').set('Idempotency-Key', 'retry-key-0002').send({ caseId: c2, visits: [slot(plusDays(f.monday, 3), '09:00', '09:45', f.chair1, opA)] })));
    expect(twice.map((r) => r.status)).toEqual([201, 201, 201]);
    expect(new Set(twice.map((r) => r.body.appointments[0].id)).size).toBe(1);
    const [{ n }] = (await db.query('SELECT COUNT(*) AS n FROM appointments WHERE case_id = ?', [c2])) as { n: bigint }[];
    expect(Number(n)).toBe(1);
  });

  it('refuses a stale update and a move onto a busy chair, leaving the appointment unchanged', async () => {
    const desk = await t.as('frontdesk');
    const day = plusDays(f.monday, 4);
    const p = await desk.post('/api/appointments').send({ caseId: (await f.newCase()).caseId, visits: [slot(day, '08:00', '09:00', f.chair1, opA)] });
    const q = await desk.post('/api/appointments').send({ caseId: (await f.newCase()).caseId, visits: [slot(day, '08:00', '09:00', f.chair2, opB)] });
    const P = p.body.appointments[0];
    const Q = q.body.appointments[0];
    const confirmed = await desk.patch(`/api/appointments/${Q.id}`).send({ version: Q.version, state: 'confirmed' });
    expect(confirmed.status).toBe(200);
    expect(confirmed.body).toMatchObject({ state: 'confirmed', version: Q.version + 1 });
    const stale = await desk.patch(`/api/appointments/${Q.id}`).send({ version: Q.version, start: at(day, '10:00'), end: at(day, '11:00') });
    expect(stale.status).toBe(409);
    expect(stale.body.conflicts).toEqual([]);
    const move = await desk.patch(`/api/appointments/${Q.id}`).send({ version: confirmed.body.version, chairId: f.chair1 });
    expect(move.status).toBe(409);
    expect(move.body.conflicts).toEqual([expect.objectContaining({ resource: 'chair', resourceId: f.chair1, appointmentId: P.id })]);
    const after = await desk.get(`/api/appointments/${Q.id}`);
    expect(after.body).toMatchObject({ chairId: f.chair2, version: confirmed.body.version, start: Q.start });
    // The guard still holds Q's own cells: a third booking on chair 2 at that time is refused.
    const third = await desk.post('/api/appointments').send({ caseId: (await f.newCase()).caseId, visits: [slot(day, '08:30', '09:00', f.chair2, opA)] });
    expect(third.status).toBe(409);
    // A move into free time succeeds and frees the old cells.
    const moved = await desk.patch(`/api/appointments/${Q.id}`).send({ version: confirmed.body.version, start: at(day, '10:00'), end: at(day, '11:30') });
    expect(moved.status, JSON.stringify(moved.body)).toBe(200);
    expect(moved.body).toMatchObject({ start: at(day, '10:00').replace(/\.\d+Z$/, '.000Z'), version: confirmed.body.version + 1 });
    const refill = await desk.post('/api/appointments').send({ caseId: (await f.newCase()).caseId, visits: [slot(day, '08:00', '09:00', f.chair2, opB)] });
    expect(refill.status).toBe(201);
  });

  it('frees the slot on cancellation, with who, why and how late', async () => {
    const desk = await t.as('frontdesk');
    const day = plusDays(f.monday, 7);
    const a = (await desk.post('/api/appointments').send({ caseId: (await f.newCase()).caseId, visits: [slot(day, '08:00', '10:00', f.chair1, opA, f.microscopeId)] })).body.appointments[0];
    const noReason = await desk.patch(`/api/appointments/${a.id}`).send({ version: a.version, state: 'cancelled' });
    expect(noReason.status).toBe(400);
    const cancelled = await desk.patch(`/api/appointments/${a.id}`).send({ version: a.version, state: 'cancelled', reason: 'patient travelling' });
    expect(cancelled.status).toBe(200);
    expect(cancelled.body.cancellation).toMatchObject({ byName: 'Mirela Okonkwo-Hale', reason: 'patient travelling' });
    expect(cancelled.body.cancellation.noticeHours).toBeGreaterThan(24);
    const [{ cells }] = (await db.query('SELECT COUNT(*) AS cells FROM appointment_cells WHERE appointment_id = ?', [a.id])) as { cells: bigint }[];
    expect(Number(cells)).toBe(0);
    const again = await desk.post('/api/appointments').send({ caseId: (await f.newCase()).caseId, visits: [slot(day, '08:00', '10:00', f.chair1, opA, f.microscopeId)] });
    expect(again.status).toBe(201);
    const back = await desk.patch(`/api/appointments/${a.id}`).send({ version: cancelled.body.version, state: 'booked' });
    expect(back.status).toBe(409);
  });

  it('a booked referral whose visits are all cancelled or missed goes back to planned (with the reason), and books again', async () => {
    const desk = await t.as('frontdesk');
    const day = plusDays(f.monday, 9);
    const { caseId } = await f.newCase();
    const booked = await desk.post('/api/appointments').send({ caseId, visits: [slot(day, '13:00', '14:00', f.chair2, opA), slot(plusDays(day, 7), '13:00', '14:00', f.chair2, opA)] });
    expect(booked.status).toBe(201);
    const [v1, v2] = booked.body.appointments;
    const sheet = async () => (await desk.get(`/api/cases/${caseId}`)).body as { status: string; referralId: number };
    const referral = async (id: number) => (await desk.get(`/api/referrals/${id}`)).body as { status: string; statusReason: string | null; history: { status: string; reason: string | null }[] };
    const { referralId } = await sheet();
    expect((await referral(referralId)).status).toBe('booked');
    // One visit cancelled, one left: still booked.
    expect((await desk.patch(`/api/appointments/${v1.id}`).send({ version: v1.version, state: 'cancelled', reason: 'patient travelling' })).status).toBe(200);
    expect((await referral(referralId)).status).toBe('booked');
    // The last one cancelled too: nothing is left, so it waits to be booked again (and the queue and backlog count it).
    expect((await desk.patch(`/api/appointments/${v2.id}`).send({ version: v2.version, state: 'cancelled', reason: 'patient unwell' })).status).toBe(200);
    const r = await referral(referralId);
    expect(r).toMatchObject({ status: 'planned', statusReason: 'Its visit was cancelled and none is left; to be booked again' });
    expect(r.history.at(-1)).toMatchObject({ status: 'planned', reason: 'Its visit was cancelled and none is left; to be booked again' });
    expect((await sheet()).status).toBe('planned');
    const again = await desk.post('/api/appointments').send({ caseId, visits: [slot(plusDays(day, 14), '13:00', '14:00', f.chair2, opA)] });
    expect(again.status).toBe(201);
    expect((await referral(referralId)).status).toBe('booked');
    expect((await sheet()).status).toBe('booked');
  });

  it('records the measured visit in the visit history on dismissal', async () => {
    const desk = await t.as('frontdesk');
    const { caseId } = await f.newCase({ tooth: '26' });
    const sheet = await (await t.as('endodontist')).patch(`/api/cases/${caseId}`).send({ assessment: { canalVisibility: 'moderate' } });
    expect(sheet.status).toBe(200);
    const day = plusDays(f.monday, 9);
    let a = (await desk.post('/api/appointments').send({ caseId, visits: [slot(day, '08:00', '09:30', f.chair2, opB)] })).body.appointments[0];
    for (const state of ['arrived', 'seated']) {
      const r = await desk.patch(`/api/appointments/${a.id}`).send({ version: a.version, state });
      expect(r.status, JSON.stringify(r.body)).toBe(200);
      a = r.body;
    }
    expect(a.seatedAt).not.toBeNull();
    // Seated 47 minutes ago, as if the visit had run.
    await db.query('UPDATE appointments SET seated_at = NOW(3) - INTERVAL 47 MINUTE WHERE id = ?', [a.id]);
    const d = await desk.patch(`/api/appointments/${a.id}`).send({ version: a.version, state: 'dismissed' });
    expect(d.status, JSON.stringify(d.body)).toBe(200);
    expect(d.body.dismissedAt).not.toBeNull();
    const rows = (await db.query("SELECT source, appointment_id, actual_minutes, tooth_fdi, level, operator_id FROM visit_history WHERE appointment_id = ?", [a.id])) as Record<string, unknown>[];
    expect(rows).toEqual([{ source: 'visit', appointment_id: a.id, actual_minutes: 47, tooth_fdi: '26', level: sheet.body.estimate.level, operator_id: opB }]);
    // Skipping a step is refused.
    const second = await desk.post('/api/appointments').send({ caseId, visits: [slot(plusDays(day, 2), '08:00', '09:00', f.chair2, opB)] });
    expect(second.status, JSON.stringify(second.body)).toBe(201);
    const b = second.body.appointments[0];
    expect((await desk.patch(`/api/appointments/${b.id}`).send({ version: b.version, state: 'dismissed' })).status).toBe(409);
  });

  it('lists the board in one call, and the chairside day with the tray', async () => {
    const desk = await t.as('frontdesk');
    const { caseId } = await f.newCase({ tooth: '37' });
    const sheet = await (await t.as('endodontist')).patch(`/api/cases/${caseId}`).send({ assessment: { canalVisibility: 'high' } });
    const day = plusDays(f.monday, 18);
    const booked = await desk.post('/api/appointments').send({ caseId, visits: [slot(day, '08:00', '09:00', f.chair1, opA, f.microscopeId)] });
    expect(booked.status, JSON.stringify(booked.body)).toBe(201);
    const board = await desk.get(`/api/appointments?from=${encodeURIComponent(at(day, '00:00'))}&to=${encodeURIComponent(at(plusDays(day, 1), '00:00'))}&locationId=${f.locationId}`);
    expect(board.status).toBe(200);
    expect(board.body).toEqual([expect.objectContaining({ id: booked.body.appointments[0].id, toothFdi: '37', level: sheet.body.estimate.level, microscopeId: f.microscopeId, patient: expect.objectContaining({ name: expect.stringContaining('Orla') }) })]);
    const assistant = await t.as('assistant');
    const cs = await assistant.get(`/api/chairside?date=${day}&locationId=${f.locationId}`);
    expect(cs.status).toBe(200);
    const chair = cs.body.chairs.find((c: { chairId: number }) => c.chairId === f.chair1);
    expect(chair.visits).toHaveLength(1);
    expect(chair.visits[0]).toMatchObject({ minutes: 60, trayList: sheet.body.estimate.trayList });
    expect(chair.visits[0].trayList.length).toBeGreaterThan(0);
    expect(cs.body.chairs.find((c: { chairId: number }) => c.chairId === f.chair2).visits).toEqual([]);
  });

  it('lets the assistant read the chairside list but not book', async () => {
    const assistant = await t.as('assistant');
    const { caseId } = await f.newCase();
    const res = await assistant.post('/api/appointments').send({ caseId, visits: [slot(plusDays(f.monday, 14), '08:00', '09:00', f.chair1, opA)] });
    expect(res.status).toBe(403);
    expect((await assistant.get(`/api/appointments?from=${encodeURIComponent(at(f.monday, '00:00'))}&to=${encodeURIComponent(at(f.monday, '23:00'))}`)).status).toBe(403);
    expect((await (await t.as('manager')).get(`/api/chairside?date=${f.monday}&locationId=${f.locationId}`)).status).toBe(403);
  });

  it('refuses slots off the grid, unknown resources and a microscope from elsewhere', async () => {
    const desk = await t.as('frontdesk');
    const { caseId } = await f.newCase();
    const day = plusDays(f.monday, 15);
    const offGrid = await desk.post('/api/appointments').send({ caseId, visits: [{ ...slot(day, '08:00', '09:00', f.chair1, opA), start: at(day, '08:03') }] });
    expect(offGrid.status).toBe(400);
    expect((await desk.post('/api/appointments').send({ caseId, visits: [slot(day, '08:00', '09:00', 999999, opA)] })).status).toBe(400);
    const assistantId = (await (await t.as('admin')).get('/api/users')).body.find((u: { role: string }) => u.role === 'assistant').id;
    expect((await desk.post('/api/appointments').send({ caseId, visits: [slot(day, '08:00', '09:00', f.chair1, assistantId)] })).status).toBe(400);
    expect((await desk.post('/api/appointments').send({ caseId, visits: [slot(day, '08:00', '09:00', f.chair2, opA, f.microscopeId)] })).status).toBe(400);
  });

  it('offers a freed time to waitlisted cases whose first visit fits', async () => {
    const desk = await t.as('frontdesk');
    const endo = await t.as('endodontist');
    const day = plusDays(f.monday, 16);
    const freed = (await desk.post('/api/appointments').send({ caseId: (await f.newCase()).caseId, visits: [slot(day, '08:00', '11:00', f.chair2, opA)] })).body.appointments[0];
    // Keep chair 1 and operator B busy so only the freed chair-2 time is left that morning for operator A.
    await desk.post('/api/appointments').send({ caseId: (await f.newCase()).caseId, visits: [slot(day, '08:00', '12:00', f.chair1, opB)] });
    const waiting = await f.newCase({ tooth: '14' });
    await endo.patch(`/api/cases/${waiting.caseId}`).send({ assessment: {} });
    const tooLong = await f.newCase({ tooth: '47' });
    await endo.patch(`/api/cases/${tooLong.caseId}`).send({ assessment: {} });
    await endo.patch(`/api/cases/${tooLong.caseId}`).send({ override: { minutesPerVisit: [240, 60], reason: 'extensive' } });
    const w1 = await desk.post('/api/waitlist').send({ caseId: waiting.caseId, notes: 'mornings' });
    expect(w1.status, JSON.stringify(w1.body)).toBe(201);
    expect((await desk.post('/api/waitlist').send({ caseId: waiting.caseId })).status).toBe(409);
    await desk.post('/api/waitlist').send({ caseId: tooLong.caseId });
    expect((await desk.get(`/api/waitlist/fits?appointmentId=${freed.id}`)).status).toBe(409);
    await desk.patch(`/api/appointments/${freed.id}`).send({ version: freed.version, state: 'cancelled', reason: 'patient unwell' });
    const fits = await desk.get(`/api/waitlist/fits?appointmentId=${freed.id}`);
    expect(fits.status).toBe(200);
    const ids = fits.body.map((e: { caseId: number }) => e.caseId);
    expect(ids).toContain(waiting.caseId);
    expect(ids).not.toContain(tooLong.caseId);
    const fit = fits.body.find((e: { caseId: number }) => e.caseId === waiting.caseId).fit;
    expect(Date.parse(fit.start)).toBeGreaterThanOrEqual(Date.parse(freed.start));
    expect(Date.parse(fit.end)).toBeLessThanOrEqual(Date.parse(freed.end) + 10 * 60_000);
    const list = await desk.get('/api/waitlist');
    expect(list.body.find((e: { caseId: number }) => e.caseId === tooLong.caseId).minutesPerVisit).toEqual([240, 60]);
    expect((await desk.delete(`/api/waitlist/${w1.body.id}`)).status).toBe(204);
  });

  it('seeds the demo endodontists’ weeks and bookings idempotently', async () => {
    const desk = await t.as('frontdesk');
    const ops = (await desk.get('/api/operators')).body as { name: string; workingRules: unknown[]; holds: unknown[] }[];
    const demo = ops.filter((o) => !o.name.includes('Bookbay'));
    expect(demo).toHaveLength(3);
    for (const o of demo) {
      expect(o.workingRules.length).toBeGreaterThan(0);
      expect(o.holds).toHaveLength(1);
    }
    const [{ n }] = (await db.query("SELECT COUNT(*) AS n FROM appointments WHERE notes = 'Demo booking'")) as { n: bigint }[];
    expect(Number(n)).toBeGreaterThan(0);
    const { SeedsService } = await import('../src/seeds/seeds.service.js');
    await t.app.get(SeedsService).loadDemo({ dir: t.config.seedsDir ?? undefined });
    const [{ m }] = (await db.query("SELECT COUNT(*) AS m FROM appointments WHERE notes = 'Demo booking'")) as { m: bigint }[];
    expect(Number(m)).toBe(Number(n));
    expect(await overlaps()).toEqual([]);
  });
});
