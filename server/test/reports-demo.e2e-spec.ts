// The demo as a manager sees it after `npm run seed`: months of past visits (seeds/demo-history), chair
// use by chair and week, the estimate error falling after calibration, and the backlog changing when a
// chair day is added. Also: the history keeps the booking guard's promise (no two visits share a chair,
// an endodontist or a microscope), its people are fictional, and a second load adds nothing.
import { QueryTypes } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import { DateTime } from 'luxon';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SeedsService } from '../src/seeds/seeds.service.js';
import { createTestApp, type TestApp } from './helpers/test-app.js';

const NY = 'America/New_York';

describe('demo history for the reports', () => {
  let t: TestApp;
  let db: Sequelize;
  let summary = '';
  let seconds = 0;
  const count = async (sql: string) => Number(((await db.query(sql, { type: QueryTypes.SELECT })) as { n: unknown }[])[0]!.n);

  beforeAll(async () => {
    t = await createTestApp();
    db = t.app.get(Sequelize);
    const started = performance.now();
    summary = await t.app.get(SeedsService).loadDemo({ dir: t.config.seedsDir ?? undefined, history: true });
    seconds = (performance.now() - started) / 1000;
  });
  afterAll(async () => t?.close());

  it('writes months of past visits next to the upcoming demo bookings', async () => {
    console.log(`demo history: ${summary.replace(/^.*?(, \d+ past visits)/, '$1')} in ${seconds.toFixed(1)} s`);
    expect(summary).toMatch(/\d+ past visits over 17 weeks \(\d+ no-shows\)/);
    const past = await count("SELECT COUNT(*) AS n FROM appointments WHERE notes = 'Demo history'");
    expect(past).toBeGreaterThan(600);
    // The upcoming demo bookings are still there and untouched.
    expect(await count("SELECT COUNT(*) AS n FROM appointments WHERE notes = 'Demo booking'")).toBeGreaterThan(0);
    expect(await count("SELECT COUNT(*) AS n FROM appointments WHERE notes = 'Demo history' AND start >= UTC_TIMESTAMP()")).toBe(0);
    const noShows = await count("SELECT COUNT(*) AS n FROM appointments WHERE notes = 'Demo history' AND state = 'no_show'");
    expect(noShows / past).toBeGreaterThan(0.03);
    expect(noShows / past).toBeLessThan(0.08);
    for (const state of ['dismissed', 'cancelled']) expect(await count(`SELECT COUNT(*) AS n FROM appointments WHERE notes = 'Demo history' AND state = '${state}'`)).toBeGreaterThan(0);
    expect(await count("SELECT COUNT(*) AS n FROM appointments WHERE notes = 'Demo history' AND state = 'dismissed' AND (seated_at IS NULL OR dismissed_at <= seated_at)")).toBe(0);
    expect(await count("SELECT COUNT(*) AS n FROM outbox_messages WHERE purpose = 'reminder' AND status = 'sent'")).toBeGreaterThan(0);
    for (const via of ['sms', 'link', 'desk']) expect(await count(`SELECT COUNT(*) AS n FROM appointments WHERE confirmed_via = '${via}' AND notes = 'Demo history'`)).toBeGreaterThan(0);
  });

  it('no two holding visits overlap on a chair (with turnover), an endodontist or a microscope', async () => {
    const overlaps = await db.query(
      `SELECT a.id AS a_id, b.id AS b_id FROM appointments a JOIN appointments b ON b.id > a.id AND b.practice_id = a.practice_id
        WHERE a.state NOT IN ('cancelled', 'no_show') AND b.state NOT IN ('cancelled', 'no_show')
          AND ((a.chair_id = b.chair_id AND a.start < b.end + INTERVAL b.turnover_minutes MINUTE AND b.start < a.end + INTERVAL a.turnover_minutes MINUTE)
            OR (a.operator_id = b.operator_id AND a.start < b.end AND b.start < a.end)
            OR (a.microscope_id = b.microscope_id AND a.start < b.end AND b.start < a.end))
        LIMIT 5`,
      { type: QueryTypes.SELECT },
    );
    expect(overlaps).toEqual([]);
    // Every holding visit owns its cells in the occupancy table, as a booking through the guard would.
    expect(await count("SELECT COUNT(*) AS n FROM appointments a WHERE a.notes = 'Demo history' AND a.state = 'dismissed' AND NOT EXISTS (SELECT 1 FROM appointment_cells c WHERE c.appointment_id = a.id AND c.resource_kind = 'chair')")).toBe(0);
  });

  it('its people are fictional: 555-0100…0199 numbers and example.com addresses', async () => {
    expect(await count("SELECT COUNT(*) AS n FROM patients WHERE phone IS NOT NULL AND phone NOT REGEXP '^\\\\+1[2-9][0-9][0-9]555(01[0-9][0-9])$'")).toBe(0);
    expect(await count("SELECT COUNT(*) AS n FROM patients WHERE email IS NOT NULL AND email NOT LIKE '%@example.com' AND email NOT LIKE '%.test'")).toBe(0);
  });

  it('a manager sees chair use by chair and week, the error falling after calibration, overrun days', async () => {
    const manager = await t.as('manager');
    const today = DateTime.now().setZone(NY).startOf('day');
    const q = `from=${today.minus({ weeks: 8 }).startOf('week').toISODate()}&to=${today.minus({ days: 1 }).toISODate()}`;
    const use = (await manager.get(`/api/reports/chair-use?${q}`)).body;
    expect(use.byChair).toHaveLength(6);
    expect(use.byWeek.length).toBeGreaterThanOrEqual(8);
    for (const c of use.byChair) expect(c.share).toBeGreaterThan(0);
    expect(use.totals.actualShare).toBeGreaterThan(0);
    const acc = (await manager.get(`/api/reports/estimate-accuracy?from=${today.minus({ weeks: 17 }).toISODate()}&to=${today.minus({ days: 1 }).toISODate()}`)).body;
    expect(acc.totals.visits).toBeGreaterThan(300);
    expect(acc.totals.afterMae).toBeLessThan(acc.totals.beforeMae);
    // The slow endodontist's visits gain most from calibration.
    for (const o of acc.byOperator) expect(o.afterMae, o.operatorName).toBeLessThan(o.beforeMae);
    expect(acc.overrunDays.length).toBeGreaterThan(0);
    const att = (await manager.get(`/api/reports/attendance?${q}`)).body;
    expect(att.totals.noShows).toBeGreaterThan(0);
    expect(att.totals.lateCancellations + att.totals.earlyCancellations).toBeGreaterThan(0);
    expect(att.confirmationRate).toBeGreaterThan(0.5);
    const refs = (await manager.get(`/api/reports/referrals?${q}`)).body;
    expect(refs.byDentist.length).toBe(7);
    expect(refs.leadTime.medianDays).toBeGreaterThan(0);
    expect(refs.byLevel.filter((l: { count: number }) => l.count > 0).length).toBe(4);
  });

  it('adding one chair day shortens the backlog', async () => {
    const manager = await t.as('manager');
    const base = (await manager.get('/api/reports/backlog')).body;
    expect(base.totals.cases).toBeGreaterThan(20);
    expect(base.noOpenTime).toBe(false);
    const res = await manager.post('/api/reports/backlog/what-if').send({ chairDaysPerWeek: 1, operatorDaysPerWeek: 0 });
    expect(res.status).toBe(200);
    expect(res.body.before.totals.weeksOfBacklog).toBeCloseTo(base.totals.weeksOfBacklog, 9);
    expect(res.body.change.weeksOfBacklog).toBeLessThan(0);
    expect(res.body.change.leadTimeWeeks).toBeLessThan(0);
    expect(res.body.before.averageMinutesByLevel.every((a: { basis: string }) => a.basis === 'visits')).toBe(true);
  });

  it('a second load adds nothing', async () => {
    const before = await count('SELECT COUNT(*) AS n FROM appointments');
    const again = await t.app.get(SeedsService).loadDemo({ dir: t.config.seedsDir ?? undefined, history: true });
    expect(again).toContain('past visits already there (none added)');
    expect(again).toMatch(/0 new referrals$/);
    expect(await count('SELECT COUNT(*) AS n FROM appointments')).toBe(before);
  });
});
