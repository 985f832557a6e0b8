// Benchmark of the manager's reports (issue "Chair use"): a fresh database with one year of a 12-chair,
// 12-endodontist practice (about 25,000 past visits, written by the demo-history generator with bulk
// inserts) plus twelve weeks of bookings ahead; every report over the whole year, 30 timed runs each
// through the real ReportsService (SQL reads + computation + JSON), p50 / p95, the figures, and the SQL
// each one ran. Exits non-zero when a report's p95 reaches 300 ms.
// Run after building, with the DB_* variables of the test server (npm run bench does this):
//   node server/dist/bench/reports.bench.js [runs]
import 'reflect-metadata';
import { DEFAULT_ESTIMATE_TABLE, type Level, type Procedure } from '@ostium/shared';
import { DateTime } from 'luxon';
import mariadb, { type Connection } from 'mariadb';
import { randomUUID } from 'node:crypto';
import { pathToFileURL } from 'node:url';
import { Sequelize } from 'sequelize-typescript';
import { createApp } from '../app.factory.js';
import { loadConfig, type AppConfig } from '../config/configuration.js';
import { createMigrator } from '../database/migrator.js';
import { estimate } from '../estimates/estimator/index.js';
import { ReportsService } from '../reports/reports.service.js';
import { generateHistory, type HistoryInput, type HistoryOperator } from '../seeds/demo-history.util.js';

const NY = 'America/New_York';
const P95_LIMIT_MS = 300;
const sqlTime = (t: number | null) => (t === null ? null : new Date(t).toISOString().slice(0, 23).replace('T', ' '));

function percentile(sorted: readonly number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))]!;
}

async function freshDatabase(config: AppConfig): Promise<void> {
  const conn = await mariadb.createConnection({ host: config.db.host, port: config.db.port, user: config.db.user, password: config.db.password });
  await conn.query(`DROP DATABASE IF EXISTS \`${config.db.name}\``);
  await conn.query(`CREATE DATABASE \`${config.db.name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  await conn.end();
  const sequelize = new Sequelize({ dialect: 'mariadb', host: config.db.host, port: config.db.port, username: config.db.user, password: config.db.password, database: config.db.name, timezone: '+00:00', logging: false });
  await createMigrator(sequelize).up();
  await sequelize.close();
}

const weekdays = (days: number[], open: string, close: string) => days.map((weekday) => ({ weekday, open, close }));

/**
 * Two locations of six chairs open 07:00–19:00 on weekdays (North also Saturday mornings); 24
 * endodontists, an early (07:00–13:00) and a late (13:00–19:00) shift per chair on weekdays (a few
 * also on Saturdays, where North opens); public-holiday closures.
 */
function benchWorld(now: number, weeks: number): HistoryInput {
  const closures = ['2025-12-25', '2026-01-01', '2026-01-19', '2026-02-16', '2026-05-25', '2026-07-03', '2026-09-07', '2026-11-26', '2026-12-25', '2027-01-01'];
  const days = ['MO,TU,WE,TH,FR', 'MO,TU,WE,TH,FR', 'MO,TU,WE,TH,FR,SA', 'MO,TU,WE,TH,FR', 'MO,TU,WE,TH,FR', 'MO,TU,WE,TH,FR,SA'];
  const operators: HistoryOperator[] = Array.from({ length: 24 }, (_, i) => {
    const late = i >= 12;
    const locationId = i % 12 < 6 ? 1 : 2;
    const rule = { locationId, rrule: `FREQ=WEEKLY;BYDAY=${days[i % 6]}`, startLocal: late ? '13:00' : '07:00', endLocal: late ? '19:00' : '13:00', breaks: [] };
    return { id: 100 + i, pace: [1, 1.2, 0.9, 1.05, 0.95, 1.1][i % 6]!, rules: [rule] };
  });
  return {
    now,
    weeks,
    seed: 424242,
    idleShare: 0.03,
    practiceName: 'Bench Endodontics',
    table: DEFAULT_ESTIMATE_TABLE,
    locations: [
      { id: 1, name: 'North', timeZone: NY, openingHours: [...weekdays([1, 2, 3, 4, 5], '07:00', '19:00'), ...weekdays([6], '08:00', '13:00')], closures },
      { id: 2, name: 'South', timeZone: NY, openingHours: weekdays([1, 2, 3, 4, 5], '07:00', '19:00'), closures },
    ],
    chairs: Array.from({ length: 12 }, (_, i) => ({ id: 11 + i, locationId: i < 6 ? 1 : 2, fixedMicroscopeId: i === 0 ? 1 : i === 6 ? 2 : null })),
    microscopes: [
      { id: 1, locationId: 1, mobile: false },
      { id: 2, locationId: 2, mobile: false },
      { id: 3, locationId: 1, mobile: true },
      { id: 4, locationId: 2, mobile: true },
    ],
    operators,
    dentistIds: Array.from({ length: 40 }, (_, i) => i + 1),
    tableMinutes: (toothFdi: string, procedure: Procedure, canals: number, level: Level) => {
      const r = estimate({ toothFdi, procedure, canals, assessment: { archPosition: 'low', diagnosis: level } }, DEFAULT_ESTIMATE_TABLE);
      return Math.round(r.totalMinutes / r.visits.length);
    },
  };
}

/** The world's rows, ids given by position (the database is fresh), in batches. */
async function seed(conn: Connection, world: HistoryInput, benchNow: number): Promise<{ visits: number; ahead: number; rows: number }> {
  // Generated up to 12 weeks past the bench's "now": the part after it becomes the bookings ahead.
  const h = generateHistory(world);
  const stamp = sqlTime(benchNow);
  let rows = 0;
  const batch = async (sql: string, values: unknown[][]) => {
    for (let i = 0; i < values.length; i += 5000) await conn.batch(sql, values.slice(i, i + 5000));
    rows += values.length;
  };
  await conn.query('INSERT INTO practices (id, name, settings, created_at, updated_at) VALUES (1, ?, ?, ?, ?)', ['Bench Endodontics', JSON.stringify({ toothNotation: 'fdi', bookingGridMinutes: 5, lateCancellationHours: 48 }), stamp, stamp]);
  await batch('INSERT INTO locations (id, practice_id, name, time_zone, opening_hours, created_at, updated_at) VALUES (?, 1, ?, ?, ?, ?, ?)', world.locations.map((l) => [l.id, l.name, l.timeZone, JSON.stringify(l.openingHours), stamp, stamp]));
  await batch('INSERT INTO location_closures (practice_id, location_id, date, reason, created_at, updated_at) VALUES (1, ?, ?, ?, ?, ?)', world.locations.flatMap((l) => l.closures.map((d) => [l.id, d, 'Public holiday', stamp, stamp])));
  await batch('INSERT INTO microscopes (id, practice_id, location_id, name, mobile, created_at, updated_at) VALUES (?, 1, ?, ?, ?, ?, ?)', world.microscopes.map((m) => [m.id, m.locationId, `Scope ${m.id}`, m.mobile, stamp, stamp]));
  await batch('INSERT INTO chairs (id, practice_id, location_id, name, fixed_microscope_id, created_at, updated_at) VALUES (?, 1, ?, ?, ?, ?, ?)', world.chairs.map((c) => [c.id, c.locationId, `Chair ${c.id}`, c.fixedMicroscopeId, stamp, stamp]));
  await batch("INSERT INTO users (id, practice_id, email, name, role, password_hash, created_at, updated_at) VALUES (?, 1, ?, ?, 'endodontist', 'bench-no-login', ?, ?)", world.operators.map((o) => [o.id, `op${o.id}@bench.test`, `Dr. Bench ${o.id}`, stamp, stamp]));
  await batch('INSERT INTO working_rules (practice_id, operator_id, location_id, rrule, start_local, end_local, breaks, created_at, updated_at) VALUES (1, ?, ?, ?, ?, ?, ?, ?, ?)', world.operators.flatMap((o) => o.rules.map((r) => [o.id, r.locationId, r.rrule, r.startLocal, r.endLocal, JSON.stringify(r.breaks.map((b) => ({ start: b.startLocal, end: b.endLocal }))), stamp, stamp])));
  // Two weeks off a year for each endodontist.
  await batch('INSERT INTO time_off (practice_id, operator_id, start, end, reason, created_at, updated_at) VALUES (1, ?, ?, ?, ?, ?, ?)', world.operators.map((o, i) => [o.id, sqlTime(benchNow - (40 + i * 20) * 86_400_000), sqlTime(benchNow - (26 + i * 20) * 86_400_000), 'Leave', stamp, stamp]));
  await batch('INSERT INTO referring_dentists (id, practice_id, name, created_at, updated_at) VALUES (?, 1, ?, ?, ?)', world.dentistIds.map((id) => [id, `Dr. Bench Referrer ${id}`, stamp, stamp]));
  await batch('INSERT INTO patients (id, practice_id, first_name, last_name, date_of_birth, phone, email, sms_consent, created_at, updated_at) VALUES (?, 1, ?, ?, ?, ?, ?, ?, ?, ?)', h.patients.map((p, i) => [i + 1, p.firstName, p.lastName, p.dateOfBirth, p.phone, p.email, p.smsConsent, stamp, stamp]));
  const ahead = (t: number) => t >= benchNow;
  // What does not exist yet at "now" is left out: referrals received later, bookings made later (ids keep gaps).
  const keptReferral = h.referrals.map((r) => !ahead(r.events[0]!.at));
  const keptCase = h.cases.map((c) => keptReferral[c.referral]!);
  const keptAppt = h.appointments.map((a) => keptCase[a.case]! && !ahead(a.createdAt));
  const kept = <T>(list: T[], keep: boolean[]) => list.map((x, i) => [x, i] as const).filter(([, i]) => keep[i]);
  // Each referral and its case as they stood at "now": one booked later is still received, triaged or planned.
  const statusNow = h.referrals.map((r) => r.events.filter((e) => !ahead(e.at)).at(-1)?.status ?? 'received');
  await batch(
    'INSERT INTO referrals (id, practice_id, patient_id, referring_dentist_id, location_id, received_on, urgency, `procedure`, status, status_changed_at, created_at, updated_at) VALUES (?, 1, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)',
    kept(h.referrals, keptReferral).map(([r, i]) => {
      const at = sqlTime(r.events.filter((e) => !ahead(e.at)).at(-1)?.at ?? benchNow);
      return [i + 1, r.patient + 1, r.dentistId, r.locationId, r.receivedOn, r.urgency, r.procedure, statusNow[i], at, at, at];
    }),
  );
  await batch(
    'INSERT INTO referral_status_events (practice_id, referral_id, status, by_name, at) VALUES (1, ?, ?, ?, ?)',
    kept(h.referrals, keptReferral).flatMap(([r, i]) => r.events.filter((e) => !ahead(e.at)).map((e) => [i + 1, e.status, 'Bench', sqlTime(e.at)])),
  );
  await batch(
    'INSERT INTO cases (id, practice_id, referral_id, tooth_fdi, `procedure`, status, estimate, level, estimated_minutes, visit_count, canals, created_at, updated_at) VALUES (?, 1, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)',
    kept(h.cases, keptCase).map(([c, i]) => [i + 1, c.referral + 1, c.toothFdi, c.procedure, statusNow[c.referral], c.estimate ? JSON.stringify(c.estimate) : null, c.estimate?.level ?? null, c.estimate?.totalMinutes ?? null, c.estimate?.visits.length ?? null, c.estimate?.canals ?? null, stamp, stamp]),
  );
  // Visits after "now" are bookings ahead: not yet confirmed, seated or dismissed.
  const appts = h.appointments.map((a) => {
    if (!ahead(a.start)) return a;
    if (a.state === 'cancelled' && a.cancelledAt! < benchNow) return a;
    return { ...a, state: 'booked' as const, seatedAt: null, dismissedAt: null, cancelledAt: null, cancelNoticeHours: null, cancelReason: null, confirmedAt: a.confirmedAt !== null && a.confirmedAt < benchNow ? a.confirmedAt : null, confirmedVia: a.confirmedAt !== null && a.confirmedAt < benchNow ? a.confirmedVia : null };
  });
  await batch(
    `INSERT INTO appointments (id, practice_id, series_id, visit_index, case_id, referral_id, location_id, chair_id, operator_id, microscope_id, start, end, turnover_minutes, state, version,
       confirmed_at, confirmed_via, cancelled_at, cancel_reason, cancel_notice_hours, seated_at, dismissed_at, created_at, updated_at)
     VALUES (?, 1, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, 1, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
    kept(appts, keptAppt).map(([a, i]) => [
      i + 1, randomUUID(), a.visitIndex, a.case + 1, h.cases[a.case]!.referral + 1, a.locationId, a.chairId, a.operatorId, a.microscopeId, sqlTime(a.start), sqlTime(a.end), a.turnoverMinutes, a.state,
      sqlTime(a.confirmedAt), a.confirmedVia, sqlTime(a.cancelledAt), a.cancelReason, a.cancelNoticeHours, sqlTime(a.seatedAt), sqlTime(a.dismissedAt), sqlTime(Math.min(a.createdAt, benchNow)), stamp,
    ]),
  );
  await batch(
    "INSERT INTO outbox_messages (practice_id, channel, purpose, dedupe_key, rule_id, appointment_id, status, due_at, planned_at, sent_at, attempts, created_at, updated_at) VALUES (1, 'sms', 'reminder', ?, ?, ?, 'sent', ?, ?, ?, 1, ?, ?)",
    h.reminders.filter((r) => !ahead(r.sentAt) && keptAppt[r.appointment]).map((r) => [`appt:${r.appointment + 1}:sms:${r.ruleId}`, r.ruleId, r.appointment + 1, sqlTime(r.sentAt), sqlTime(r.sentAt), sqlTime(r.sentAt), sqlTime(r.sentAt), sqlTime(r.sentAt)]),
  );
  await batch(
    "INSERT INTO visit_history (practice_id, visit_date, tooth_fdi, `procedure`, tooth_group, canals, level, operator_id, estimated_minutes, actual_minutes, table_version, source, appointment_id, created_at, updated_at) VALUES (1, ?, ?, ?, ?, ?, ?, ?, ?, ?, 1, 'visit', ?, ?, ?)",
    h.visits.filter((v) => !ahead(appts[v.appointment]!.start) && keptAppt[v.appointment]).map((v) => [v.visitDate, v.toothFdi, v.procedure, v.toothGroup, v.canals, v.level, v.operatorId, v.estimatedMinutes, v.actualMinutes, v.appointment + 1, stamp, stamp]),
  );
  const stored = kept(appts, keptAppt).map(([a]) => a);
  const past = stored.filter((a) => !ahead(a.start));
  return { visits: past.length, ahead: stored.length - past.length, rows };
}

export async function runReportsBench(runs = 30, log: (line: string) => void = (l) => console.log(l)): Promise<boolean> {
  const base = loadConfig({ ...process.env, LOG_LEVEL: process.env.LOG_LEVEL ?? 'error' });
  // The message jobs stay off: their sweeps would plan reminders for the bookings ahead while we time.
  const config: AppConfig = { ...base, db: { ...base.db, name: `${process.env.DB_NAME ?? 'ostium_bench'}_reports` }, clientDist: null, messaging: { ...base.messaging, jobEnabled: false } };
  // A fixed "now" (a Wednesday noon in New York) so every run measures the same year.
  const benchNow = DateTime.fromISO('2026-12-02T12:00', { zone: NY }).toMillis();
  const today = DateTime.fromMillis(benchNow, { zone: NY }).startOf('day');
  const year = { from: today.minus({ days: 365 }).toISODate()!, to: today.minus({ days: 1 }).toISODate()! };
  await freshDatabase(config);
  const conn = await mariadb.createConnection({ host: config.db.host, port: config.db.port, user: config.db.user, password: config.db.password, database: config.db.name, timezone: '+00:00' });
  const t0 = performance.now();
  const world = benchWorld(benchNow + 12 * 7 * 86_400_000, 53 + 12);
  const seeded = await seed(conn, world, benchNow);
  log(`reports bench: 12 chairs, 24 endodontists (two shifts), ${seeded.visits} visits in the past year and ${seeded.ahead} booked ahead (${seeded.rows} rows, seeded in ${((performance.now() - t0) / 1000).toFixed(1)} s, database ${config.db.name}); range ${year.from} … ${year.to}, ${runs} runs each`);
  await conn.end();

  const app = await createApp(config);
  await app.init();
  let ok = true;
  try {
    const reports = app.get(ReportsService);
    const sequelize = app.get(Sequelize);
    const q = { ...year };
    const cases: { name: string; run: () => Promise<unknown>; figures: (r: never) => string }[] = [
      { name: 'chair-use', run: () => reports.chairUse(1, q, benchNow), figures: (r: { totals: { share: number; actualShare: number }; byChair: unknown[]; heatmap: unknown[] }) => `share ${(r.totals.share * 100).toFixed(1)} %, actual ${(r.totals.actualShare * 100).toFixed(1)} %, ${r.byChair.length} chairs, ${r.heatmap.length} heat-map cells` },
      { name: 'operator-use', run: () => reports.operatorUse(1, q), figures: (r: { totals: { share: number; workingMinutes: number } }) => `share ${(r.totals.share * 100).toFixed(1)} % of ${r.totals.workingMinutes} working minutes` },
      { name: 'attendance', run: () => reports.attendance(1, q), figures: (r: { totals: { visits: number; noShowShare: number; lateCancellations: number; sameDayFills: number }; confirmationRate: number }) => `${r.totals.visits} visits, no-shows ${(r.totals.noShowShare * 100).toFixed(1)} %, ${r.totals.lateCancellations} late cancellations, ${r.totals.sameDayFills} same-day fills, confirmed ${(r.confirmationRate * 100).toFixed(1)} %` },
      { name: 'referrals', run: () => reports.referrals(1, q, benchNow), figures: (r: { byDentist: unknown[]; leadTime: { referrals: number; medianDays: number; p90Days: number }; waiting: { count: number } }) => `${r.byDentist.length} referring dentists, lead time median ${r.leadTime.medianDays} d / P90 ${r.leadTime.p90Days} d over ${r.leadTime.referrals}, ${r.waiting.count} waiting` },
      { name: 'estimate-accuracy', run: () => reports.estimateAccuracy(1, q), figures: (r: { totals: { visits: number; beforeMae: number; afterMae: number }; overrunDays: unknown[] }) => `${r.totals.visits} visits, MAE ${r.totals.beforeMae} → ${r.totals.afterMae} min after calibration, ${r.overrunDays.length} overrun days` },
      { name: 'backlog', run: () => reports.backlog(1, {}, benchNow), figures: (r: { totals: { cases: number; weeksOfBacklog: number }; limitedBy: string; capacityMinutesPerWeek: number }) => `${r.totals.cases} cases waiting, ${r.totals.weeksOfBacklog?.toFixed(2)} weeks of backlog at ${r.capacityMinutesPerWeek} min a week (limited by ${r.limitedBy})` },
      { name: 'backlog/what-if', run: () => reports.backlogWhatIf(1, { chairDaysPerWeek: 1, operatorDaysPerWeek: 0 }, benchNow), figures: (r: { change: { weeksOfBacklog: number; leadTimeWeeks: number } }) => `+1 chair day a week: backlog ${r.change.weeksOfBacklog.toFixed(3)} weeks, lead time ${r.change.leadTimeWeeks.toFixed(3)} weeks` },
    ];
    for (const c of cases) {
      for (let i = 0; i < 3; i++) JSON.stringify(await c.run()); // warm-up: JIT, pool connections, zone clocks
      const times: number[] = [];
      let last: unknown;
      for (let i = 0; i < runs; i++) {
        const s = performance.now();
        last = await c.run();
        JSON.stringify(last);
        times.push(performance.now() - s);
      }
      // The SQL of one more run: Sequelize's logging hook for what goes through Sequelize, the service's
      // trace for the large reads it sends to the driver directly.
      const sql: string[] = [];
      (sequelize.options as { logging: unknown }).logging = (line: string) => sql.push(line.replace(/^Executing \([^)]*\): /, '').replace(/\s+/g, ' '));
      reports.traceSql = (line) => sql.push(line);
      await c.run();
      (sequelize.options as { logging: unknown }).logging = false;
      reports.traceSql = null;
      const sorted = [...times].sort((a, b) => a - b);
      const p50 = percentile(sorted, 50);
      const p95 = percentile(sorted, 95);
      const pass = p95 < P95_LIMIT_MS;
      ok &&= pass;
      log(`\n${c.name}: p50 ${p50.toFixed(1)} ms, p95 ${p95.toFixed(1)} ms, max ${sorted[sorted.length - 1]!.toFixed(1)} ms — ${pass ? 'under' : 'OVER'} ${P95_LIMIT_MS} ms`);
      log(`  figures: ${c.figures(last as never)}`);
      log(`  SQL (${sql.length} statements):`);
      for (const s of sql) log(`    ${s}`);
    }
  } finally {
    await app.close();
  }
  log(`\nreports bench: ${ok ? 'every p95 under' : 'a p95 at or over'} ${P95_LIMIT_MS} ms`);
  return ok;
}

const invokedDirectly = process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href;
if (invokedDirectly) {
  const runs = process.argv[2] !== undefined ? Number(process.argv[2]) : undefined;
  runReportsBench(runs)
    .then((ok) => {
      if (!ok) process.exitCode = 1;
    })
    .catch((error: unknown) => {
      console.error(error);
      process.exitCode = 1;
    });
}
