// The manager's reports over HTTP on a real database: the fixture week of the unit specs
// (src/reports/reports.fixtures.util.ts, America/New_York Thu 2026-10-29 … Wed 2026-11-04, across the end
// of daylight saving; IANA tz database through luxon, references.md "Calendars") is written into a
// location of its own, and every route must answer the hand-computed figures. 403 for the roles outside
// ACCESS.reports, 400 naming the field for bad input.
import { DateTime } from 'luxon';
import { QueryTypes } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { FIXTURE_BOOKINGS, fixtureAttendance, NY } from '../src/reports/reports.fixtures.util.js';
import { createTestApp, type TestApp } from './helpers/test-app.js';

type Agent = Awaited<ReturnType<TestApp['as']>>;
const sqlTime = (t: number | null) => (t === null ? null : new Date(t).toISOString().slice(0, 23).replace('T', ' '));
const fieldsOf = (body: { errors?: { field: string }[] }) => [...new Set((body.errors ?? []).map((e) => e.field))];
const RANGE = 'from=2026-10-29&to=2026-11-04';

describe('reports API on the fixture week', () => {
  let t: TestApp;
  let manager: Agent;
  let db: Sequelize;
  let locationId: number;
  let chairs: number[];
  let ops: number[];
  let otherChair: number;
  const q = (extra = '') => `${RANGE}&locationId=${locationId}${extra}`;

  beforeAll(async () => {
    t = await createTestApp();
    db = t.app.get(Sequelize);
    manager = await t.as('manager');
    const admin = await t.as('admin');
    const desk = await t.as('frontdesk');
    const weekdays = [1, 2, 3, 4, 5].map((weekday) => ({ weekday, open: '08:00', close: '17:00' }));
    const loc = await admin.post('/api/locations').send({ name: 'Fernhollow', timeZone: NY, openingHours: [...weekdays, { weekday: 6, open: '09:00', close: '13:00' }] });
    expect(loc.status).toBe(201);
    locationId = loc.body.id;
    expect((await admin.post(`/api/locations/${locationId}/closures`).send({ date: '2026-11-03', reason: 'Staff training' })).status).toBe(201);
    chairs = [];
    for (const name of ['Fernhollow 1', 'Fernhollow 2']) chairs.push((await admin.post(`/api/locations/${locationId}/chairs`).send({ name })).body.id);
    ops = [];
    for (const [i, rule] of [
      { rrule: 'FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR', start: '08:00', end: '12:00', breaks: [{ start: '10:00', end: '10:15' }] },
      { rrule: 'FREQ=WEEKLY;BYDAY=TH,FR', start: '12:00', end: '17:00' },
    ].entries()) {
      const u = await admin.post('/api/users').send({ email: `fernhollow-op${i + 1}@example.test`, name: `Dr. Fernhollow ${i === 0 ? 'One' : 'Two'}`, role: 'endodontist', password: 'fixture-pass-2026' });
      expect(u.status).toBe(201);
      expect((await admin.post(`/api/operators/${u.body.id}/working-rules`).send({ locationId, ...rule })).status).toBe(201);
      ops.push(u.body.id);
    }
    const off = await admin.post(`/api/operators/${ops[0]}/time-off`).send({ start: DateTime.fromISO('2026-10-30T08:00', { zone: NY }).toUTC().toISO(), end: DateTime.fromISO('2026-10-30T10:00', { zone: NY }).toUTC().toISO() });
    expect(off.status).toBe(201);
    const other = (await admin.get('/api/locations')).body.find((l: { name: string }) => l.name === 'Riverside');
    otherChair = other.chairs[0].id;

    // Referral A (five teeth, received 10-15) carries the week's visits; B (two teeth, 10-30) waits
    // untriaged; C (one tooth, 11-02) is triaged at low level. All from one invented referring dentist.
    const refer = async (receivedOn: string, teeth: string[], lastName: string, dentistId?: number) => {
      const res = await desk.post('/api/referrals').send({
        patient: { firstName: 'Odalys', lastName, dateOfBirth: '1979-04-12', phone: '(202) 555-0188' },
        ...(dentistId ? { referringDentistId: dentistId } : { referringDentist: { name: 'Dr. Quenby Larchfield', email: 'larchfield@example.com' } }),
        locationId,
        urgency: 'routine',
        procedure: 'initial',
        notation: 'fdi',
        receivedOn,
        teeth: teeth.map((tooth) => ({ tooth })),
      });
      expect(res.status).toBe(201);
      return res.body as { id: number; referringDentistDetail?: { id: number }; referringDentist: { id: number }; cases: { id: number }[] };
    };
    const a = await refer('2026-10-15', ['36', '37', '46', '47', '26'], 'Fernhollow-Ashgrove');
    const dentistId = a.referringDentist.id;
    const b = await refer('2026-10-30', ['16', '17'], 'Fernhollow-Birchmoor', dentistId);
    const c = await refer('2026-11-02', ['11'], 'Fernhollow-Cindervale', dentistId);
    const run = (sql: string, replacements: unknown[]) => db.query(sql, { replacements });
    await run("UPDATE cases SET level = 'low', status = 'completed' WHERE referral_id = ?", [a.id]);
    await run("UPDATE referrals SET status = 'completed' WHERE id = ?", [a.id]);
    await run("UPDATE cases SET level = 'low', status = 'triaged' WHERE referral_id = ?", [c.id]);
    await run("UPDATE referrals SET status = 'triaged' WHERE id = ?", [c.id]);
    void b;

    // The week's appointments (every booking of the unit fixture and the attendance extras), on A's cases.
    const [{ practice_id: practiceId }] = await db.query<{ practice_id: number }>('SELECT practice_id FROM locations WHERE id = ?', { replacements: [locationId], type: QueryTypes.SELECT });
    const chairOf = (fixtureChair: number) => chairs[fixtureChair - 11]!;
    const opOf = (fixtureOp: number | undefined) => ops[(fixtureOp ?? 22) - 21]!;
    const facts = new Map(fixtureAttendance().map((v) => [`b${v.id}`, v]));
    const ids = new Map<string, number>();
    let i = 0;
    for (const [key, v] of facts) {
      const f = FIXTURE_BOOKINGS.find((x) => x.key === key);
      const res = (await db.query(
        `INSERT INTO appointments (practice_id, series_id, visit_index, case_id, referral_id, location_id, chair_id, operator_id, start, end, turnover_minutes, state, version,
            confirmed_at, confirmed_via, cancelled_at, cancel_notice_hours, cancel_reason, seated_at, dismissed_at, created_at, updated_at)
         VALUES (?, UUID(), 0, ?, ?, ?, ?, ?, ?, ?, 10, ?, 1, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
        {
          type: QueryTypes.INSERT,
          replacements: [
            practiceId, a.cases[i++ % 5]!.id, a.id, locationId, chairOf(v.chairId), opOf(f?.operatorId), sqlTime(v.start), sqlTime(v.end), v.state,
            sqlTime(v.confirmedAt), v.confirmedVia, sqlTime(v.cancelledAt), v.cancelNoticeHours, v.state === 'cancelled' ? 'Fixture' : null,
            sqlTime(f?.seatedAt ?? null), sqlTime(f?.dismissedAt ?? null), sqlTime(v.createdAt), sqlTime(v.createdAt),
          ],
        },
      )) as unknown as [number];
      ids.set(key, Number(res[0]));
    }
    // Reminders: as many sent before each confirmation as the fixture says, plus two that must not count
    // (one sent after b1's confirmation, one failed for b2).
    const confirmedAt = Date.parse('2026-10-27T13:00:00Z');
    const reminder = (key: string, sentAt: number, status = 'sent') =>
      run(
        `INSERT INTO outbox_messages (practice_id, channel, purpose, appointment_id, status, due_at, planned_at, sent_at, attempts, created_at, updated_at)
         VALUES (?, 'sms', 'reminder', ?, ?, ?, ?, ?, 1, ?, ?)`,
        [practiceId, ids.get(key), status, sqlTime(sentAt), sqlTime(sentAt), status === 'sent' ? sqlTime(sentAt) : null, sqlTime(sentAt), sqlTime(sentAt)],
      );
    for (const v of facts.values()) {
      for (let n = 0; n < v.remindersBeforeConfirmation; n++) await reminder(`b${v.id}`, confirmedAt - (n + 1) * 3_600_000);
    }
    await reminder('b1', confirmedAt + 3_600_000);
    await reminder('b2', confirmedAt - 7_200_000, 'failed');

    // Visit history: two visits of one cell, 60 estimated, 72 and 66 actual (worked in estimate-accuracy.util.spec.ts).
    for (const [key, actual, date] of [['b1', 72, '2026-10-29'], ['b8', 66, '2026-10-29']] as const) {
      await run(
        `INSERT INTO visit_history (practice_id, visit_date, tooth_fdi, \`procedure\`, tooth_group, canals, level, operator_id, estimated_minutes, actual_minutes, table_version, source, appointment_id, created_at, updated_at)
         VALUES (?, ?, '36', 'initial', 'molar', 3, 'high', NULL, 60, ?, 1, 'visit', ?, NOW(3), NOW(3))`,
        [practiceId, date, actual, ids.get(key)],
      );
    }
  });
  afterAll(async () => t?.close());

  it('chair use: open, booked and actual minutes by chair, day and week; the heat map', async () => {
    const res = await manager.get(`/api/reports/chair-use?${q()}`);
    expect(res.status).toBe(200);
    const r = res.body;
    expect(r.range).toEqual({ from: '2026-10-29', to: '2026-11-04', locationId, chairId: null, operatorId: null });
    // As the unit fixture, plus the attendance extras: b12 (Wed 14:00–14:45 + 10) books 55 more on chair 2,
    // and keeps chair 2's Wednesday from being done; the cancelled ones and b16 (23:30) add nothing.
    expect(r.byChair.map((c: { chairId: number; openMinutes: number; bookedMinutes: number; actualOpenMinutes: number; actualMinutes: number }) => [c.chairId, c.openMinutes, c.bookedMinutes, c.actualOpenMinutes, c.actualMinutes])).toEqual([
      [chairs[0], 2400, 320, 1860, 185],
      [chairs[1], 2400, 235, 1320, 100],
    ]);
    expect(r.totals).toMatchObject({ openMinutes: 4800, bookedMinutes: 555, actualOpenMinutes: 3180, actualMinutes: 285 });
    expect(r.totals.share).toBeCloseTo(555 / 4800, 12);
    expect(r.byDay.map((d: { date: string; bookedMinutes: number }) => [d.date, d.bookedMinutes])).toEqual([
      ['2026-10-29', 230],
      ['2026-10-30', 30],
      ['2026-10-31', 40],
      ['2026-11-01', 0],
      ['2026-11-02', 70],
      ['2026-11-03', 0],
      ['2026-11-04', 185],
    ]);
    expect(r.byWeek.map((w: { weekStart: string; openMinutes: number }) => [w.weekStart, w.openMinutes])).toEqual([
      ['2026-10-26', 2640],
      ['2026-11-02', 2160],
    ]);
    expect(r.heatmap.find((c: { weekday: number; hour: number }) => c.weekday === 4 && c.hour === 8)).toEqual({ weekday: 4, hour: 8, openMinutes: 120, bookedMinutes: 60, share: 0.5 });
    // One chair: the same figures as that chair's row.
    const one = await manager.get(`/api/reports/chair-use?${q(`&chairId=${chairs[0]}`)}`);
    expect(one.body.totals).toEqual(Object.fromEntries(Object.entries(r.byChair[0]).filter(([k]) => !['chairId', 'chairName', 'locationId', 'locationName'].includes(k))));
  });

  it('operator use: working minutes less breaks, time off and the closure; clinical minutes inside them', async () => {
    const res = await manager.get(`/api/reports/operator-use?${q()}`);
    expect(res.status).toBe(200);
    const mine = res.body.byOperator.filter((o: { operatorId: number }) => ops.includes(o.operatorId));
    expect(mine.map((o: { operatorId: number; workingMinutes: number; clinicalMinutes: number }) => [o.operatorId, o.workingMinutes, o.clinicalMinutes])).toEqual([
      [ops[0], 780, 255],
      [ops[1], 600, 140],
    ]);
    const one = await manager.get(`/api/reports/operator-use?${q(`&operatorId=${ops[0]}`)}`);
    expect(one.body.totals).toEqual({ workingMinutes: 780, clinicalMinutes: 255, share: 255 / 780 });
    expect(one.body.byWeek.map((w: { weekStart: string; workingMinutes: number; clinicalMinutes: number }) => [w.weekStart, w.workingMinutes, w.clinicalMinutes])).toEqual([
      ['2026-10-26', 330, 90],
      ['2026-11-02', 450, 165],
    ]);
  });

  it('attendance: outcomes, same-day fill, confirmations by channel and by reminders; the notice setting', async () => {
    const res = await manager.get(`/api/reports/attendance?${q()}`);
    expect(res.status).toBe(200);
    expect(res.body.lateCancelNoticeHours).toBe(48);
    expect(res.body.totals).toMatchObject({ visits: 8, attended: 5, noShows: 1, lateCancellations: 2, earlyCancellations: 2, sameDayFills: 1, open: 5 });
    expect(res.body.confirmationByChannel.map((c: { channel: string; visits: number }) => [c.channel, c.visits])).toEqual([
      ['sms', 3],
      ['email', 0],
      ['link', 1],
      ['desk', 1],
      ['unconfirmed', 1],
    ]);
    expect(res.body.confirmationRate).toBe(5 / 6);
    // The reminder after b1's confirmation and b2's failed one do not count.
    expect(res.body.confirmationByReminders.map((c: { visits: number }) => c.visits)).toEqual([1, 2, 1, 1]);

    // A manager moves the notice to 72 h: b13 (48 real hours, across the DST change) becomes late; b5 (72 h) stays early.
    expect((await manager.get('/api/settings/reports')).body).toEqual({ lateCancelNoticeHours: 48 });
    const put = await manager.put('/api/settings/reports').send({ lateCancelNoticeHours: 72 });
    expect(put.status).toBe(200);
    expect(put.body).toEqual({ lateCancelNoticeHours: 72 });
    expect((await manager.get('/api/practice')).body.settings.lateCancellationHours).toBe(72);
    const later = await manager.get(`/api/reports/attendance?${q()}`);
    expect(later.body.totals).toMatchObject({ lateCancellations: 3, earlyCancellations: 1, visits: 9 });
    await manager.put('/api/settings/reports').send({ lateCancelNoticeHours: 48 });
  });

  it('referrals: by dentist and month, cases by level, lead time, the waiting list', async () => {
    const res = await manager.get(`/api/reports/referrals?from=2026-10-01&to=2026-11-04&locationId=${locationId}`);
    expect(res.status).toBe(200);
    const r = res.body;
    expect(r.months).toEqual(['2026-10', '2026-11']);
    expect(r.byDentist.map((d: { name: string; counts: number[]; total: number }) => [d.name, d.counts, d.total])).toEqual([['Dr. Quenby Larchfield', [2, 1], 3]]);
    // A's five low cases, B's two untriaged, C's one low.
    expect(r.byLevel.map((l: { level: string; count: number }) => [l.level, l.count])).toEqual([
      ['low', 6],
      ['moderate', 0],
      ['high', 0],
      ['untriaged', 2],
    ]);
    // A: received 10-15, first visit b1 on 10-29 (the earlier b15 on 10-28 23:30 was dismissed too: 13 days).
    expect(r.leadTime).toEqual({ referrals: 1, medianDays: 13, p90Days: 13 });
    const today = DateTime.now().setZone(NY).startOf('day');
    const waited = (d: string) => Math.round(today.diff(DateTime.fromISO(d, { zone: NY }), 'days').days);
    expect(r.waiting).toEqual({
      count: 2,
      medianDays: waited('2026-11-02'),
      oldestDays: waited('2026-10-30'),
      byStatus: [
        { status: 'received', count: 1 },
        { status: 'triaged', count: 1 },
        { status: 'planned', count: 0 },
      ],
    });
  });

  it('estimate accuracy: before and after calibration (leave one out), overrun days', async () => {
    const res = await manager.get(`/api/reports/estimate-accuracy?${q()}`);
    expect(res.status).toBe(200);
    const r = res.body;
    // Worked in estimate-accuracy.util.spec.ts: before (12 + 6) / 2 = 9, after (11.039 + 4.149) / 2 = 7.59.
    expect(r.totals).toEqual({ visits: 2, beforeMae: 9, afterMae: 7.59 });
    expect(r.byLevel.find((l: { level: string }) => l.level === 'high')).toEqual({ level: 'high', visits: 2, beforeMae: 9, afterMae: 7.59 });
    expect(r.byMonth).toEqual([{ month: '2026-10', visits: 2, beforeMae: 9, afterMae: 7.59 }]);
    expect(r.overrunDays).toEqual([
      { date: '2026-10-29', chairId: chairs[0], chairName: 'Fernhollow 1', closesAt: '2026-10-29T21:00:00.000Z', lastEndAt: '2026-10-29T21:25:00.000Z', overrunMinutes: 25 },
      { date: '2026-10-30', chairId: chairs[0], chairName: 'Fernhollow 1', closesAt: '2026-10-30T21:00:00.000Z', lastEndAt: '2026-10-30T21:10:00.000Z', overrunMinutes: 10 },
    ]);
  });

  it('backlog: waiting cases priced by level over the capacity of the next 12 weeks; the what-if', async () => {
    const res = await manager.get(`/api/reports/backlog?${q()}`);
    expect(res.status).toBe(200);
    const r = res.body;
    // Averages from the week's booked cases: A's five low cases hold b1 b2 b3 b6 b7 b8 b9 b10 b12 b16:
    // 90 + 50 + 30 + 60 + 120 + 60 + 60 + 120 + 45 + 25 = 660 minutes + 10 × 10 turnover = 760 → 152 a case.
    expect(r.averageMinutesByLevel.find((a: { level: string }) => a.level === 'low')).toEqual({ level: 'low', minutes: 152, basis: 'visits' });
    // Capacity a week: chairs free 2 × 540 on weekdays, 2 × 240 on Saturday; endodontists Mon–Wed 225,
    // Thu–Fri 225 + 300; Saturday nobody → 3 × 225 + 2 × 525 = 1725.
    expect(r.capacityMinutesPerWeek).toBe(1725);
    expect(r.freeChairMinutesPerWeek).toBe(5 * 1080 + 480);
    expect(r.limitedBy).toBe('operators');
    // Waiting: C's low case and B's two untriaged ones (priced at all booked cases: 152) → 456 minutes.
    expect(r.rows.map((x: { level: string; cases: number; minutes: number }) => [x.level, x.cases, x.minutes])).toEqual([
      ['low', 1, 152],
      ['untriaged', 2, 304],
    ]);
    expect(r.totals.weeksOfBacklog).toBeCloseTo(456 / 1725, 9);
    expect(r.noOpenTime).toBe(false);
    expect(r.horizon.weeks).toBe(12);

    const chairDay = await manager.post('/api/reports/backlog/what-if').send({ locationId, from: '2026-10-29', to: '2026-11-04', chairDaysPerWeek: 1, operatorDaysPerWeek: 0 });
    expect(chairDay.status).toBe(200);
    // A chair day = the horizon's average open chair-day: (5 × 540 + 240) / 6 = 490 minutes.
    expect(chairDay.body.assumptions).toMatchObject({ chairDayMinutes: 490, horizonWeeks: 12 });
    expect(chairDay.body.after.capacityMinutesPerWeek).toBeCloseTo(1725 + 490, 6);
    expect(chairDay.body.change.weeksOfBacklog).toBeCloseTo(456 / 2215 - 456 / 1725, 9);
    expect(chairDay.body.before.totals.weeksOfBacklog).toBeCloseTo(r.totals.weeksOfBacklog, 12);
    // An operator day = 1725 / 7 working minutes, spread over the 6 open days of the week.
    const opDay = await manager.post('/api/reports/backlog/what-if').send({ locationId, from: '2026-10-29', to: '2026-11-04', chairDaysPerWeek: 0, operatorDaysPerWeek: 1 });
    expect(opDay.body.after.capacityMinutesPerWeek).toBeCloseTo(1725 + 1725 / 7, 1); // sent rounded to 2 decimals
    // Removing more than there is: no open time, no division by zero.
    const none = await manager.post('/api/reports/backlog/what-if').send({ locationId, chairDaysPerWeek: -50, operatorDaysPerWeek: -50 });
    expect(none.body.after).toMatchObject({ noOpenTime: true, leadTimeWeeks: null, totals: { weeksOfBacklog: null } });
    expect(none.body.change).toEqual({ weeksOfBacklog: null, leadTimeWeeks: null });
  });

  it('only managers and administrators: 403 for the front desk, endodontists and assistants', async () => {
    const urls = ['chair-use', 'operator-use', 'attendance', 'referrals', 'estimate-accuracy', 'backlog'].map((n) => `/api/reports/${n}?${RANGE}`);
    const admin = await t.as('admin');
    for (const url of urls) expect((await admin.get(url)).status, url).toBe(200);
    for (const role of ['frontdesk', 'endodontist', 'assistant'] as const) {
      const agent = await t.as(role);
      for (const url of [...urls, '/api/settings/reports']) {
        const res = await agent.get(url);
        expect(res.status, `${role} ${url}`).toBe(403);
        expect(res.body).toEqual({ statusCode: 403, message: `The ${role} role cannot do this` });
      }
      expect((await agent.post('/api/reports/backlog/what-if').send({ chairDaysPerWeek: 1, operatorDaysPerWeek: 0 })).status).toBe(403);
      expect((await agent.put('/api/settings/reports').send({ lateCancelNoticeHours: 1 })).status).toBe(403);
    }
  });

  it('bad input is a 400 that names the field', async () => {
    const cases: [string, string][] = [
      ['/api/reports/chair-use?to=2026-11-04', 'from'],
      ['/api/reports/chair-use?from=2026-10-29', 'to'],
      ['/api/reports/attendance?from=29.10.2026&to=2026-11-04', 'from'],
      ['/api/reports/referrals?from=2026-02-30&to=2026-03-04', 'from'],
      ['/api/reports/chair-use?from=2026-11-04&to=2026-10-29', 'from'],
      ['/api/reports/operator-use?from=2025-01-01&to=2026-02-05', 'to'],
      [`/api/reports/chair-use?${RANGE}&locationId=abc`, 'locationId'],
      [`/api/reports/chair-use?${RANGE}&locationId=999999`, 'locationId'],
      [`/api/reports/chair-use?${RANGE}&locationId=${locationId}&chairId=${otherChair}`, 'chairId'],
      [`/api/reports/chair-use?${RANGE}&chairId=999999`, 'chairId'],
      [`/api/reports/attendance?${RANGE}&operatorId=999999`, 'operatorId'],
      [`/api/reports/estimate-accuracy?${RANGE}&operatorId=0`, 'operatorId'],
      [`/api/reports/chair-use?${RANGE}&colour=teal`, 'colour'],
      ['/api/reports/backlog?from=2026-13-01', 'from'],
    ];
    for (const [url, field] of cases) {
      const res = await manager.get(url);
      expect(res.status, url).toBe(400);
      expect(fieldsOf(res.body), url).toEqual([field]);
      expect(res.body.statusCode).toBe(400);
    }
    // Exactly 400 days is allowed.
    expect((await manager.get('/api/reports/chair-use?from=2025-10-01&to=2026-11-04')).status).toBe(200);
    const whatIf = await manager.post('/api/reports/backlog/what-if').send({ operatorDaysPerWeek: 1 });
    expect(whatIf.status).toBe(400);
    expect(fieldsOf(whatIf.body)).toEqual(['chairDaysPerWeek']);
    const huge = await manager.post('/api/reports/backlog/what-if').send({ chairDaysPerWeek: 1, operatorDaysPerWeek: 500 });
    expect(fieldsOf(huge.body)).toEqual(['operatorDaysPerWeek']);
    const notice = await manager.put('/api/settings/reports').send({ lateCancelNoticeHours: 500 });
    expect(notice.status).toBe(400);
    expect(fieldsOf(notice.body)).toEqual(['lateCancelNoticeHours']);
  });

  it('the routes are in the OpenAPI document', async () => {
    const doc = await t.http().get('/api/docs/json');
    for (const p of ['/api/reports/chair-use', '/api/reports/operator-use', '/api/reports/attendance', '/api/reports/referrals', '/api/reports/estimate-accuracy', '/api/reports/backlog', '/api/settings/reports']) {
      expect(doc.body.paths[p]?.get, p).toBeDefined();
    }
    expect(doc.body.paths['/api/reports/backlog/what-if'].post).toBeDefined();
    expect(doc.body.paths['/api/reports/chair-use'].get.parameters.map((x: { name: string }) => x.name).sort()).toEqual(['chairId', 'from', 'locationId', 'operatorId', 'to']);
  });
});
