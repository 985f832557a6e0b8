// Benchmark of the time-finder API path (scheduling.md "Speed"): a fresh database seeded with 12 chairs,
// 8 operators, 3 microscopes and 6,000 appointments over 12 weeks (the practice of time-finder.bench.ts);
// 200 random plans searched over the whole 12 weeks through the real TimeFinderService (SQL read + finder),
// beside the raw SQL read of the same busy intervals and the naive minute scan on a subset.
// Run after building, with the DB_* variables of the test server (npm run bench does this):
//   node server/dist/bench/scheduling.bench.js [plans] [naiveSubset]
import 'reflect-metadata';
import mariadb, { type Connection } from 'mariadb';
import { randomUUID } from 'node:crypto';
import { pathToFileURL } from 'node:url';
import { Sequelize } from 'sequelize-typescript';
import { createApp } from '../app.factory.js';
import { loadConfig, type AppConfig } from '../config/configuration.js';
import { createMigrator } from '../database/migrator.js';
import { TimeFinderService } from '../scheduling/time-finder.service.js';
import { naiveEarliestSeries } from '../scheduling/time-finder/naive-scan.util.js';
import { findTimes } from '../scheduling/time-finder/time-finder.util.js';
import type { TimeFinderRequest } from '../scheduling/time-finder/time-finder.types.js';
import { generateBenchPlans, generateBenchWorld, type BenchWorld } from './time-finder.bench.js';

interface Ids {
  practiceId: number;
  locations: Map<string, number>;
  chairs: Map<string, number>;
  microscopes: Map<string, number>;
  operators: Map<string, number>;
}

const BUSY_SQL = `SELECT id, chair_id, operator_id, microscope_id, start, end, turnover_minutes FROM appointments
  WHERE practice_id = ? AND start < ? AND end > ? AND state NOT IN ('cancelled', 'no_show')`;
const TURNOVER_MARGIN_MS = 4 * 3_600_000;

function percentile(sorted: readonly number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))]!;
}
function stats(values: readonly number[]) {
  const s = [...values].sort((a, b) => a - b);
  return { p50: percentile(s, 50), p95: percentile(s, 95), max: s[s.length - 1]! };
}
const fmt = (s: { p50: number; p95: number; max: number }) => `p50 ${s.p50.toFixed(2)} ms, p95 ${s.p95.toFixed(2)} ms, max ${s.max.toFixed(2)} ms`;
const sqlTime = (t: number) => new Date(t).toISOString().slice(0, 23).replace('T', ' ');

/** Creates the database afresh and migrates it with the app's own migrator. */
async function freshDatabase(config: AppConfig): Promise<void> {
  const conn = await mariadb.createConnection({ host: config.db.host, port: config.db.port, user: config.db.user, password: config.db.password });
  await conn.query(`DROP DATABASE IF EXISTS \`${config.db.name}\``);
  await conn.query(`CREATE DATABASE \`${config.db.name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  await conn.end();
  const sequelize = new Sequelize({
    dialect: 'mariadb',
    host: config.db.host,
    port: config.db.port,
    username: config.db.user,
    password: config.db.password,
    database: config.db.name,
    timezone: '+00:00',
    logging: false,
  });
  await createMigrator(sequelize).up();
  await sequelize.close();
}

/** Writes the bench world's practice into the database (plain SQL in batches; cells are not needed to search). */
async function seed(conn: Connection, world: BenchWorld): Promise<Ids> {
  const now = new Date();
  const r = world.resources;
  const practice = await conn.query('INSERT INTO practices (name, settings, created_at, updated_at) VALUES (?, ?, ?, ?)', [
    'Bench Endodontics',
    JSON.stringify({ toothNotation: 'fdi', bookingGridMinutes: 5, lateCancellationHours: 48 }),
    now,
    now,
  ]);
  const practiceId = Number(practice.insertId);
  const ids: Ids = { practiceId, locations: new Map(), chairs: new Map(), microscopes: new Map(), operators: new Map() };
  for (const l of r.locations) {
    const hours = Object.entries(l.openingHours).flatMap(([weekday, ranges]) => (ranges ?? []).map((x) => ({ weekday: Number(weekday), open: x.startLocal, close: x.endLocal })));
    const res = await conn.query('INSERT INTO locations (practice_id, name, time_zone, opening_hours, created_at, updated_at) VALUES (?, ?, ?, ?, ?, ?)', [
      practiceId,
      l.id,
      l.timeZone,
      JSON.stringify(hours),
      now,
      now,
    ]);
    ids.locations.set(l.id, Number(res.insertId));
    for (const c of l.closures) {
      await conn.query('INSERT INTO location_closures (practice_id, location_id, date, reason, created_at, updated_at) VALUES (?, ?, ?, ?, ?, ?)', [practiceId, Number(res.insertId), c.date, c.reason, now, now]);
    }
  }
  for (const m of r.microscopes) {
    const res = await conn.query('INSERT INTO microscopes (practice_id, location_id, name, mobile, created_at, updated_at) VALUES (?, ?, ?, ?, ?, ?)', [practiceId, ids.locations.get(m.locationId), m.id, m.mobile, now, now]);
    ids.microscopes.set(m.id, Number(res.insertId));
  }
  for (const c of r.chairs) {
    const res = await conn.query('INSERT INTO chairs (practice_id, location_id, name, fixed_microscope_id, created_at, updated_at) VALUES (?, ?, ?, ?, ?, ?)', [
      practiceId,
      ids.locations.get(c.locationId),
      c.id,
      c.fixedMicroscopeId ? ids.microscopes.get(c.fixedMicroscopeId) : null,
      now,
      now,
    ]);
    ids.chairs.set(c.id, Number(res.insertId));
  }
  for (const o of r.operators) {
    const res = await conn.query("INSERT INTO users (practice_id, email, name, role, password_hash, created_at, updated_at) VALUES (?, ?, ?, 'endodontist', 'bench-no-login', ?, ?)", [
      practiceId,
      `${o.id}@bench.test`,
      o.name,
      now,
      now,
    ]);
    const id = Number(res.insertId);
    ids.operators.set(o.id, id);
    for (const w of o.workingRules) {
      await conn.query('INSERT INTO working_rules (practice_id, operator_id, location_id, rrule, start_local, end_local, breaks, created_at, updated_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)', [
        practiceId,
        id,
        ids.locations.get(w.locationId),
        w.rrule,
        w.startLocal,
        w.endLocal,
        JSON.stringify((w.breaks ?? []).map((b) => ({ start: b.startLocal, end: b.endLocal }))),
        now,
        now,
      ]);
    }
    for (const t of o.timeOff) {
      await conn.query('INSERT INTO time_off (practice_id, operator_id, start, end, created_at, updated_at) VALUES (?, ?, ?, ?, ?, ?)', [practiceId, id, sqlTime(t.start), sqlTime(t.end), now, now]);
    }
  }
  for (const h of r.holds) {
    await conn.query('INSERT INTO holds (practice_id, operator_id, location_id, rrule, start_local, end_local, created_at, updated_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?)', [
      practiceId,
      ids.operators.get(h.operatorId),
      ids.locations.get(h.locationId),
      h.rrule,
      h.startLocal,
      h.endLocal,
      now,
      now,
    ]);
  }
  // One case carries every appointment: the busy read never looks at the case.
  const dentist = await conn.query('INSERT INTO referring_dentists (practice_id, name, created_at, updated_at) VALUES (?, ?, ?, ?)', [practiceId, 'Bench Referrer', now, now]);
  const patient = await conn.query('INSERT INTO patients (practice_id, first_name, last_name, date_of_birth, created_at, updated_at) VALUES (?, ?, ?, ?, ?, ?)', [practiceId, 'Bench', 'Patient', '1980-01-01', now, now]);
  const firstLocation = ids.locations.values().next().value as number;
  const referral = await conn.query(
    "INSERT INTO referrals (practice_id, patient_id, referring_dentist_id, location_id, received_on, urgency, `procedure`, status, status_changed_at, created_at, updated_at) VALUES (?, ?, ?, ?, '2026-02-01', 'routine', 'initial', 'booked', ?, ?, ?)",
    [practiceId, Number(patient.insertId), Number(dentist.insertId), firstLocation, now, now, now],
  );
  const kase = await conn.query("INSERT INTO cases (practice_id, referral_id, tooth_fdi, `procedure`, status, created_at, updated_at) VALUES (?, ?, '36', 'initial', 'booked', ?, ?)", [
    practiceId,
    Number(referral.insertId),
    now,
    now,
  ]);
  const chairLocation = new Map(r.chairs.map((c) => [c.id, ids.locations.get(c.locationId)!]));
  await conn.batch(
    "INSERT INTO appointments (practice_id, series_id, visit_index, case_id, referral_id, location_id, chair_id, operator_id, microscope_id, start, end, turnover_minutes, state, version, created_at, updated_at) VALUES (?, ?, 0, ?, ?, ?, ?, ?, ?, ?, ?, ?, 'booked', 1, ?, ?)",
    world.appointments.map((a) => [
      practiceId,
      randomUUID(),
      Number(kase.insertId),
      Number(referral.insertId),
      chairLocation.get(a.chairId),
      ids.chairs.get(a.chairId),
      ids.operators.get(a.operatorId),
      a.microscopeId ? ids.microscopes.get(a.microscopeId) : null,
      sqlTime(a.start),
      sqlTime(a.end),
      a.turnoverMinutes,
      now,
      now,
    ]),
  );
  return ids;
}

export async function runSchedulingBench(planCount = 200, naiveSubset = 10, log: (line: string) => void = (l) => console.log(l)) {
  const base = loadConfig({ ...process.env, LOG_LEVEL: process.env.LOG_LEVEL ?? 'error' });
  const config: AppConfig = { ...base, db: { ...base.db, name: `${process.env.DB_NAME ?? 'ostium_bench'}_scheduling` }, clientDist: null };
  const world = generateBenchWorld();
  const plans = generateBenchPlans(world, planCount);
  log(
    `scheduling bench: ${world.resources.chairs.length} chairs, ${world.resources.operators.length} operators, ${world.resources.microscopes.length} microscopes, ${world.appointments.length} appointments over 12 weeks, ${plans.length} plans (database ${config.db.name})`,
  );
  await freshDatabase(config);
  const conn = await mariadb.createConnection({ host: config.db.host, port: config.db.port, user: config.db.user, password: config.db.password, database: config.db.name, timezone: '+00:00' });
  const t0 = performance.now();
  const ids = await seed(conn, world);
  log(`seeded in ${((performance.now() - t0) / 1000).toFixed(1)} s`);

  const app = await createApp(config);
  await app.init();
  try {
    const finder = app.get(TimeFinderService);
    const sequelize = app.get(Sequelize);
    // Statements sent through Sequelize (its logging hook runs once per query) ...
    let viaSequelize = 0;
    (sequelize.options as { logging: unknown }).logging = () => {
      viaSequelize++;
    };
    // ... and every SELECT the server ran, whichever path it came by (the busy read uses the raw driver).
    const selects = async () => Number(((await conn.query("SHOW GLOBAL STATUS LIKE 'Com_select'")) as { Value: string }[])[0]!.Value);
    let queries = 0;
    const counted = async <T>(work: () => Promise<T>): Promise<T> => {
      const before = await selects();
      const out = await work();
      queries += (await selects()) - before;
      return out;
    };
    const dtoOf = (p: TimeFinderRequest) => ({
      from: new Date(p.from).toISOString(),
      to: new Date(p.to).toISOString(),
      ...(p.locationId ? { locationId: ids.locations.get(p.locationId) } : {}),
      ...(p.operatorId ? { operatorId: ids.operators.get(p.operatorId) } : {}),
      ...(p.preferences ? { preferences: { weekdays: p.preferences.weekdays ? [...p.preferences.weekdays] : undefined, partOfDay: p.preferences.partOfDay } } : {}),
    });
    const run = (p: TimeFinderRequest, to = p.to) =>
      finder.search(ids.practiceId, dtoOf({ ...p, to }), {
        visits: [...p.plan.visits],
        turnoverMinutes: p.turnoverMinutes ?? 10,
        urgent: p.urgent ?? false,
        now: p.now,
        ...(p.previousOperatorId ? { previousOperatorId: ids.operators.get(p.previousOperatorId) } : {}),
      });
    for (const p of plans.slice(0, 10)) await run(p); // warm-up: JIT, pool connections, memoised rule expansions

    const service: number[] = [];
    const perSearch: number[] = [];
    let agree = 0;
    let compared = 0;
    const perSearchSequelize: number[] = [];
    for (const p of plans) {
      const s = performance.now();
      const res = await run(p);
      service.push(performance.now() - s);
      // Counted on a second run so the status reads stay out of the timing.
      const before = queries;
      const beforeSeq = viaSequelize;
      await counted(() => run(p));
      perSearch.push(queries - before);
      perSearchSequelize.push(viaSequelize - beforeSeq);
      // The SQL read must reproduce the in-memory busy intervals: the same first proposal.
      const mem = findTimes(world.resources, world.busy, { ...p, gridMinutes: 5 });
      compared++;
      if ((mem.proposals[0]?.visits[0]?.start ?? null) === (res.proposals[0] ? Date.parse(res.proposals[0].visits[0]!.start) : null)) agree++;
    }
    // The same plans over 4 weeks: the number of queries must not change with the horizon.
    const shortCounts: number[] = [];
    for (const p of plans.slice(0, 20)) {
      const before = queries;
      await counted(() => run(p, p.from + 28 * 86_400_000));
      shortCounts.push(queries - before);
    }

    const raw: number[] = [];
    for (const p of plans) {
      const s = performance.now();
      const rows = (await conn.query(BUSY_SQL, [ids.practiceId, new Date(p.to), new Date(p.from - TURNOVER_MARGIN_MS)])) as unknown[];
      raw.push(performance.now() - s);
      if (rows.length === 0) throw new Error('raw read found no appointments');
    }

    const naive: number[] = [];
    for (const p of plans.slice(0, naiveSubset)) {
      const s = performance.now();
      naiveEarliestSeries(world.resources, world.busy, p);
      naive.push(performance.now() - s);
    }

    const sv = stats(service);
    const rw = stats(raw);
    const nv = stats(naive);
    const svSubset = stats(service.slice(0, naiveSubset));
    const qMin = Math.min(...perSearch);
    const qMax = Math.max(...perSearch);
    log(`service search (SQL read + finder): ${fmt(sv)}`);
    log(`raw SQL read of the busy intervals:  ${fmt(rw)}`);
    log(`naive minute scan (first ${naive.length} plans, earliest series only): ${fmt(nv)}`);
    log(
      `SQL SELECTs per search (MariaDB Com_select): ${qMin === qMax ? qMin : `${qMin}–${qMax}`} over 12 weeks, ${Math.min(...shortCounts)}–${Math.max(...shortCounts)} over 4 weeks; of them through Sequelize's logging hook: ${Math.max(...perSearchSequelize)} (the busy read takes the raw driver)`,
    );
    log(`first proposal equals the in-memory finder's on ${agree}/${compared} plans`);
    const rawRatio = sv.p50 / rw.p50;
    const naiveRatio = nv.p50 / svSubset.p50;
    log(`ratio service / raw read (p50): ${rawRatio.toFixed(2)}× (target ≤ 2×); naive / service (p50, same plans): ${naiveRatio.toFixed(0)}× (target ≥ 20×)`);
    log(`target p95 < 50 ms: ${sv.p95 < 50 ? 'met' : 'MISSED'}; within 2× of raw read: ${rawRatio <= 2 ? 'met' : 'MISSED'}; ≥ 20× naive: ${naiveRatio >= 20 ? 'met' : 'MISSED'}`);
    return { service: sv, raw: rw, naive: nv, queriesPerSearch: [qMin, qMax], rawRatio, naiveRatio, agree, compared };
  } finally {
    await app.close();
    await conn.end();
  }
}

const invokedDirectly = process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href;
if (invokedDirectly) {
  const plans = process.argv[2] !== undefined ? Number(process.argv[2]) : undefined;
  const naiveSubset = process.argv[3] !== undefined ? Number(process.argv[3]) : undefined;
  runSchedulingBench(plans, naiveSubset).catch((error: unknown) => {
    console.error(error);
    process.exitCode = 1;
  });
}
