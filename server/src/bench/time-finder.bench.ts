// Benchmark of the time finder (scheduling.md "Speed"): a seeded practice with 12 chairs, 8 operators,
// 3 microscopes and 6,000 appointments over 12 weeks; 200 random plans searched over the whole 12 weeks.
// Prints p50/p95 per search and the speed-up over the naive minute scan. Run after building:
//   node server/dist/bench/time-finder.bench.js [plans] [naiveSubset]
import { pathToFileURL } from 'node:url';
import { naiveEarliestSeries } from '../scheduling/time-finder/naive-scan.util.js';
import { clearTimeFinderCaches, findTimes } from '../scheduling/time-finder/time-finder.util.js';
import type {
  BusyIntervals,
  Chair,
  Hold,
  Interval,
  IsoWeekday,
  Location,
  Microscope,
  Operator,
  PlannedVisit,
  SchedulingResources,
  TimeFinderRequest,
  TimeFinderResult,
} from '../scheduling/time-finder/time-finder.types.js';
import { DateTime } from 'luxon';

const MIN = 60_000;
const ZONE = 'America/New_York';
// Monday 2026-02-16 + 12 weeks: the horizon crosses the 2026-03-08 change to daylight time.
const FIRST_DAY = '2026-02-16';
const WEEKS = 12;
const TARGET_APPOINTMENTS = 6000;
const TURNOVER = 10;

export interface BenchAppointment {
  chairId: string;
  operatorId: string;
  microscopeId?: string;
  /** Patient time [start, end); the chair is also busy for the turnover after end. */
  start: number;
  end: number;
  turnoverMinutes: number;
}

export interface BenchWorld {
  resources: SchedulingResources;
  appointments: BenchAppointment[];
  /** Busy intervals derived in memory from the appointments (what a SQL read must reproduce). */
  busy: BusyIntervals;
  from: number;
  to: number;
  now: number;
  timeZone: string;
}

/** Small fast seeded PRNG (mulberry32) so every run builds the same practice. */
function prng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function pick<T>(rand: () => number, items: readonly T[]): T {
  return items[Math.floor(rand() * items.length)];
}

function local(date: string, time: string): number {
  return DateTime.fromISO(`${date}T${time}`, { zone: ZONE }).toMillis();
}

const WEEKDAY = 'FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR';
const LUNCH = [{ startLocal: '12:00', endLocal: '12:45' }];

function benchResources(): SchedulingResources {
  const week = [{ startLocal: '07:30', endLocal: '18:00' }];
  const saturday = [{ startLocal: '08:00', endLocal: '14:00' }];
  const openingHours = { 1: week, 2: week, 3: week, 4: week, 5: week, 6: saturday } as Record<IsoWeekday, typeof week>;
  const locations: Location[] = [
    { id: 'loc-north', timeZone: ZONE, openingHours, closures: [{ date: '2026-03-20', reason: 'staff training' }] },
    { id: 'loc-south', timeZone: ZONE, openingHours, closures: [] },
  ];
  const chairs: Chair[] = [];
  for (let i = 1; i <= 7; i++) chairs.push({ id: `N${i}`, locationId: 'loc-north', ...(i === 1 ? { fixedMicroscopeId: 'mic-1' } : {}) });
  for (let i = 1; i <= 5; i++) chairs.push({ id: `S${i}`, locationId: 'loc-south' });
  const microscopes: Microscope[] = [
    { id: 'mic-1', locationId: 'loc-north', mobile: false, chairId: 'N1' },
    { id: 'mic-2', locationId: 'loc-north', mobile: true },
    { id: 'mic-3', locationId: 'loc-south', mobile: true },
  ];
  const rule = (locationId: string, rrule: string, startLocal = '07:30', endLocal = '18:00', breaks = LUNCH) => ({ locationId, rrule, startLocal, endLocal, breaks });
  const sat = (locationId: string) => rule(locationId, 'FREQ=WEEKLY;BYDAY=SA', '08:00', '14:00', []);
  const operators: Operator[] = [
    { id: 'op-1', name: 'Operator 1', workingRules: [rule('loc-north', WEEKDAY), sat('loc-north')], timeOff: [] },
    { id: 'op-2', name: 'Operator 2', workingRules: [rule('loc-north', WEEKDAY)], timeOff: [] },
    { id: 'op-3', name: 'Operator 3', workingRules: [rule('loc-north', WEEKDAY)], timeOff: [{ start: local('2026-03-23', '00:00'), end: local('2026-03-28', '00:00') }] },
    { id: 'op-4', name: 'Operator 4', workingRules: [rule('loc-north', WEEKDAY, '08:00', '16:30')], timeOff: [] },
    { id: 'op-5', name: 'Operator 5', workingRules: [rule('loc-south', WEEKDAY), sat('loc-south')], timeOff: [] },
    { id: 'op-6', name: 'Operator 6', workingRules: [rule('loc-south', WEEKDAY)], timeOff: [{ start: local('2026-04-13', '00:00'), end: local('2026-04-15', '00:00') }] },
    { id: 'op-7', name: 'Operator 7', workingRules: [rule('loc-north', 'FREQ=WEEKLY;BYDAY=MO,WE,FR'), rule('loc-south', 'FREQ=WEEKLY;BYDAY=TU,TH')], timeOff: [] },
    { id: 'op-8', name: 'Operator 8', workingRules: [rule('loc-south', 'FREQ=WEEKLY;BYDAY=MO,WE,FR'), rule('loc-north', 'FREQ=WEEKLY;BYDAY=TU,TH'), sat('loc-north')], timeOff: [] },
  ];
  const holds: Hold[] = operators.map((o) => ({ operatorId: o.id, locationId: o.workingRules[0].locationId, rrule: WEEKDAY, startLocal: '16:00', endLocal: '16:30' }));
  return { locations, chairs, microscopes, operators, holds };
}

function overlapsList(list: readonly Interval[], start: number, end: number): boolean {
  for (const iv of list) if (iv.start < end && start < iv.end) return true;
  return false;
}

/** Builds the seeded practice: operators booked day by day with short gaps, then thinned to 6,000. */
export function generateBenchWorld(seed = 20260216): BenchWorld {
  const rand = prng(seed);
  const resources = benchResources();
  const from = local(FIRST_DAY, '00:00');
  const to = DateTime.fromMillis(from, { zone: ZONE }).plus({ weeks: WEEKS }).toMillis();
  const all: BenchAppointment[] = [];
  // Per resource and local day, to keep the overlap checks short.
  const dayBusy = new Map<string, Interval[]>();
  const busyFor = (key: string): Interval[] => {
    let list = dayBusy.get(key);
    if (list === undefined) dayBusy.set(key, (list = []));
    return list;
  };
  for (let d = DateTime.fromMillis(from, { zone: ZONE }); d.toMillis() < to; d = d.plus({ days: 1 })) {
    const date = d.toISODate()!;
    const weekday = d.weekday;
    for (const op of resources.operators) {
      for (const rule of op.workingRules) {
        const days = rule.rrule.includes('BYDAY=SA') ? [6] : rule.rrule.includes('MO,TU,WE,TH,FR') ? [1, 2, 3, 4, 5] : rule.rrule.includes('MO,WE,FR') ? [1, 3, 5] : [2, 4];
        if (!days.includes(weekday)) continue;
        const loc = resources.locations.find((l) => l.id === rule.locationId)!;
        if (loc.closures.some((c) => c.date === date)) continue;
        const dayEnd = local(date, rule.endLocal);
        const blocked: Interval[] = [
          ...(rule.breaks ?? []).map((b) => ({ start: local(date, b.startLocal), end: local(date, b.endLocal) })),
          ...op.timeOff,
          ...(weekday <= 5 ? [{ start: local(date, '16:00'), end: local(date, '16:30') }] : []),
        ];
        const chairs = resources.chairs.filter((c) => c.locationId === loc.id);
        let cursor = local(date, rule.startLocal);
        while (cursor < dayEnd) {
          const start = cursor + pick(rand, [0, 0, 0, 0, 5, 10, 20]) * MIN;
          const minutes = pick(rand, [15, 15, 20, 30, 30, 45, 60, 90]);
          const end = start + minutes * MIN;
          if (end > dayEnd) break;
          if (overlapsList(blocked, start, end)) {
            cursor = start + 5 * MIN;
            continue;
          }
          const wantsMic = rand() < 0.35;
          const shuffled = [...chairs].sort(() => rand() - 0.5);
          const chair = shuffled.find((c) => !overlapsList(busyFor(`${c.id}|${date}`), start, end + TURNOVER * MIN));
          if (chair === undefined) {
            cursor = start + 5 * MIN;
            continue;
          }
          let microscopeId: string | undefined;
          if (wantsMic) {
            const options = resources.microscopes.filter((m) => m.locationId === loc.id && (m.mobile || m.chairId === chair.id));
            microscopeId = options.find((m) => !overlapsList(busyFor(`${m.id}|${date}`), start, end))?.id;
          }
          all.push({ chairId: chair.id, operatorId: op.id, ...(microscopeId !== undefined ? { microscopeId } : {}), start, end, turnoverMinutes: TURNOVER });
          busyFor(`${chair.id}|${date}`).push({ start, end: end + TURNOVER * MIN });
          if (microscopeId !== undefined) busyFor(`${microscopeId}|${date}`).push({ start, end });
          cursor = end;
        }
      }
    }
  }
  // Thin to exactly the target with a seeded shuffle (like cancellations), keep time order.
  for (let i = all.length - 1; i > 0; i--) {
    const j = Math.floor(rand() * (i + 1));
    [all[i], all[j]] = [all[j], all[i]];
  }
  if (all.length < TARGET_APPOINTMENTS) throw new Error(`generator produced only ${all.length} appointments`);
  const appointments = all.slice(0, TARGET_APPOINTMENTS).sort((a, b) => a.start - b.start);
  return { resources, appointments, busy: busyFromAppointments(appointments), from, to, now: from - 6 * 3_600_000, timeZone: ZONE };
}

/** Busy intervals per resource as the time finder takes them (chair busy includes the turnover). */
export function busyFromAppointments(appointments: readonly BenchAppointment[]): BusyIntervals {
  const chairs: Record<string, Interval[]> = {};
  const operators: Record<string, Interval[]> = {};
  const microscopes: Record<string, Interval[]> = {};
  for (const a of appointments) {
    (chairs[a.chairId] ??= []).push({ start: a.start, end: a.end + a.turnoverMinutes * MIN });
    (operators[a.operatorId] ??= []).push({ start: a.start, end: a.end });
    if (a.microscopeId !== undefined) (microscopes[a.microscopeId] ??= []).push({ start: a.start, end: a.end });
  }
  return { chairs, operators, microscopes };
}

/** 200 seeded plans: 1 or 2 visits, with/without microscope, some pinned, some with preferences or urgent. */
export function generateBenchPlans(world: BenchWorld, count = 200, seed = 7): TimeFinderRequest[] {
  const rand = prng(seed);
  const plans: TimeFinderRequest[] = [];
  for (let i = 0; i < count; i++) {
    const twoVisits = rand() < 0.4;
    const window = pick(rand, [
      [7, 21],
      [14, 28],
      [1, 7],
    ]);
    const visits: PlannedVisit[] = [{ minutes: pick(rand, [30, 45, 60, 90, 120]), needsMicroscope: rand() < 0.45 }];
    if (twoVisits) {
      visits.push({ minutes: pick(rand, [30, 45, 60, 90]), needsMicroscope: rand() < 0.45, earliestDaysAfterPrevious: window[0], latestDaysAfterPrevious: window[1] });
    }
    const request: TimeFinderRequest = { plan: { visits }, from: world.from, to: world.to, now: world.now, turnoverMinutes: TURNOVER };
    if (rand() < 0.5) request.locationId = pick(rand, world.resources.locations).id;
    if (rand() < 0.3) request.operatorId = pick(rand, world.resources.operators).id;
    if (rand() < 0.2) request.previousOperatorId = pick(rand, world.resources.operators).id;
    const p = rand();
    if (p < 0.2) request.preferences = { partOfDay: rand() < 0.5 ? 'morning' : 'afternoon' };
    else if (p < 0.35) request.preferences = { weekdays: [pick(rand, [1, 2, 3, 4, 5] as const), pick(rand, [1, 2, 3, 4, 5, 6] as const)] };
    if (rand() < 0.1) request.urgent = true;
    plans.push(request);
  }
  return plans;
}

function percentile(sorted: readonly number[], p: number): number {
  if (sorted.length === 0) return Number.NaN;
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)];
}

function stats(values: readonly number[]): { p50: number; p95: number; max: number; mean: number } {
  const sorted = [...values].sort((a, b) => a - b);
  return { p50: percentile(sorted, 50), p95: percentile(sorted, 95), max: sorted[sorted.length - 1], mean: values.reduce((s, v) => s + v, 0) / values.length };
}

export interface BenchReport {
  appointments: number;
  plans: number;
  /** Warm: zone clocks and rule expansions memoised across searches, as in a running server. */
  findMs: { p50: number; p95: number; max: number; mean: number };
  /** Cold: memo caches cleared before each search. */
  findColdMs: { p50: number; p95: number; max: number; mean: number };
  /** Only when loadBusy was given: the read per search, and read + find. */
  loadMs?: { p50: number; p95: number; max: number; mean: number };
  totalMs?: { p50: number; p95: number; max: number; mean: number };
  withProposals: number;
  unplaceable: Record<string, number>;
  naive: {
    subset: number;
    naiveMs: { p50: number; p95: number; max: number; mean: number };
    fastMs: { p50: number; p95: number; max: number; mean: number };
    /** Median naive time / median fast (cold) time on the same plans. */
    ratio: number;
    /** Plans without preferences on which the fast first start equals the naive earliest start. */
    agree: number;
    compared: number;
  };
}

export interface BenchOptions {
  plans?: number;
  /** Plans (the first ones) also run through the naive scan; default 10. */
  naiveSubset?: number;
  seed?: number;
  log?: (line: string) => void;
}

/**
 * Runs the benchmark. loadBusy, when given, replaces the in-memory busy intervals with a real read (e.g.
 * the SQL queries over the seeded appointments of `world`) and is timed per search.
 */
export async function runTimeFinderBench(loadBusy?: (world: BenchWorld) => Promise<BusyIntervals>, options: BenchOptions = {}): Promise<BenchReport> {
  const log = options.log ?? ((line: string) => console.log(line));
  const world = generateBenchWorld(options.seed);
  const plans = generateBenchPlans(world, options.plans ?? 200);
  const naiveSubset = Math.min(options.naiveSubset ?? 10, plans.length);
  log(`time-finder bench: ${world.resources.chairs.length} chairs, ${world.resources.operators.length} operators, ${world.resources.microscopes.length} microscopes, ${world.appointments.length} appointments, ${WEEKS} weeks (${ZONE}), ${plans.length} plans`);

  let busy = world.busy;
  if (loadBusy !== undefined) busy = await loadBusy(world);
  // Warm the JIT on a few plans before measuring.
  for (const plan of plans.slice(0, 10)) findTimes(world.resources, busy, plan);

  const results: TimeFinderResult[] = [];
  const warm: number[] = [];
  const load: number[] = [];
  const total: number[] = [];
  for (const plan of plans) {
    const t0 = performance.now();
    if (loadBusy !== undefined) busy = await loadBusy(world);
    const t1 = performance.now();
    results.push(findTimes(world.resources, busy, plan));
    const t2 = performance.now();
    warm.push(t2 - t1);
    if (loadBusy !== undefined) {
      load.push(t1 - t0);
      total.push(t2 - t0);
    }
  }
  const cold: number[] = [];
  for (const plan of plans) {
    clearTimeFinderCaches();
    const t0 = performance.now();
    findTimes(world.resources, busy, plan);
    cold.push(performance.now() - t0);
  }

  const naiveTimes: number[] = [];
  const fastTimes: number[] = [];
  let agree = 0;
  let compared = 0;
  for (let i = 0; i < naiveSubset; i++) {
    const plan = plans[i];
    const t0 = performance.now();
    const naive = naiveEarliestSeries(world.resources, busy, plan);
    naiveTimes.push(performance.now() - t0);
    fastTimes.push(cold[i]);
    if (plan.preferences === undefined) {
      compared++;
      if (naive?.[0].start === results[i].proposals[0]?.visits[0].start) agree++;
    }
  }

  const unplaceable: Record<string, number> = {};
  for (const r of results) if (r.unplaceable !== undefined) unplaceable[r.unplaceable.code] = (unplaceable[r.unplaceable.code] ?? 0) + 1;
  const naiveStats = stats(naiveTimes);
  const fastStats = stats(fastTimes);
  const report: BenchReport = {
    appointments: world.appointments.length,
    plans: plans.length,
    findMs: stats(warm),
    findColdMs: stats(cold),
    ...(loadBusy !== undefined ? { loadMs: stats(load), totalMs: stats(total) } : {}),
    withProposals: results.filter((r) => r.proposals.length > 0).length,
    unplaceable,
    naive: { subset: naiveSubset, naiveMs: naiveStats, fastMs: fastStats, ratio: naiveStats.p50 / fastStats.p50, agree, compared },
  };
  const f = (s: { p50: number; p95: number; max: number }): string => `p50 ${s.p50.toFixed(2)} ms, p95 ${s.p95.toFixed(2)} ms, max ${s.max.toFixed(2)} ms`;
  log(`find (warm caches): ${f(report.findMs)}`);
  log(`find (cold caches): ${f(report.findColdMs)}`);
  if (report.loadMs !== undefined && report.totalMs !== undefined) {
    log(`load busy:          ${f(report.loadMs)}`);
    log(`load + find:        ${f(report.totalMs)}`);
  }
  log(`plans with proposals: ${report.withProposals}/${plans.length}; unplaceable: ${JSON.stringify(unplaceable)}`);
  log(
    `naive minute scan on the first ${naiveSubset} plans (earliest series only, the fast finder builds ${5} ranked proposals): naive p50 ${naiveStats.p50.toFixed(0)} ms vs fast cold p50 ${fastStats.p50.toFixed(2)} ms → ${report.naive.ratio.toFixed(0)}× faster; first start agrees on ${agree}/${compared} plans without preferences`,
  );
  // Design targets (scheduling.md "Speed"): well under 50 ms per search on one core (Node runs the search
  // on one thread), and the brief's ≥ 20× over the naive scan.
  log(`target p95 < 50 ms (cold): ${report.findColdMs.p95 < 50 ? 'met' : 'MISSED'}; target ≥ 20× naive: ${report.naive.ratio >= 20 ? 'met' : 'MISSED'}`);
  return report;
}

const invokedDirectly = process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href;
if (invokedDirectly) {
  const plans = process.argv[2] !== undefined ? Number(process.argv[2]) : undefined;
  const naiveSubset = process.argv[3] !== undefined ? Number(process.argv[3]) : undefined;
  runTimeFinderBench(undefined, { plans, naiveSubset }).catch((error: unknown) => {
    console.error(error);
    process.exitCode = 1;
  });
}

