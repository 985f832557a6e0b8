// Property tests of the time finder against the naive minute-by-minute scan (naive-scan.util.ts) on random
// worlds: random zones (IANA tzdb via luxon, horizons placed on 2026 DST changes), opening hours, rules,
// breaks, time off, holds, closures and busy intervals. Design rules: scheduling.md "Time finder".
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { NaiveWorld } from './naive-scan.util.js';
import { findTimes } from './time-finder.util.js';
import { at } from './time-finder.fixtures.util.js';
import type {
  BusyIntervals,
  Chair,
  Hold,
  Interval,
  LocalRange,
  Microscope,
  OpeningHours,
  Operator,
  SchedulingResources,
  TimeFinderRequest,
} from './time-finder.types.js';

const MIN = 60_000;

// Start dates sit on DST changes: US 2026-03-08/11-01, EU 2026-03-29, Lord Howe 2026-04-05 (30-minute shift).
const ZONES = ['UTC', 'America/New_York', 'Europe/Berlin', 'Asia/Kolkata', 'Australia/Lord_Howe'];
const START_DATES = ['2026-03-07', '2026-03-08', '2026-10-31', '2026-03-28', '2026-04-04', '2026-06-10'];
const RULES = ['FREQ=DAILY', 'FREQ=DAILY', 'FREQ=WEEKLY;BYDAY=MO,WE,FR,SU', 'FREQ=WEEKLY;BYDAY=TU,TH,SA', 'FREQ=WEEKLY;BYDAY=SU,SA'];

const hhmm = (m: number): string => `${String(Math.floor(m / 60)).padStart(2, '0')}:${String(m % 60).padStart(2, '0')}`;

/** A wall-clock range in 15-minute steps (often touching 01:00–03:00 where the changes happen). */
const range = fc
  .tuple(fc.integer({ min: 0, max: 72 }), fc.integer({ min: 6, max: 64 }))
  .map(([s, l]): LocalRange => ({ startLocal: hhmm(s * 15), endLocal: hhmm(Math.min(96, s + l) * 15) }))
  .filter((r) => r.startLocal < r.endLocal);
// Half of the ranges are ordinary practice hours, so opening and working hours overlap often.
const dayRange = fc.oneof(range, fc.constantFrom<LocalRange>({ startLocal: '07:00', endLocal: '18:00' }, { startLocal: '00:30', endLocal: '12:00' }));

interface Scenario {
  resources: SchedulingResources;
  busy: BusyIntervals;
  request: TimeFinderRequest;
}

function scenario(visitCount: 1 | 2): fc.Arbitrary<Scenario> {
  return fc
    .record({
      zone: fc.constantFrom(...ZONES),
      startDate: fc.constantFrom(...START_DATES),
      days: fc.integer({ min: visitCount, max: visitCount + 2 }),
      fromOffset: fc.integer({ min: 0, max: 40 }),
      nowShift: fc.integer({ min: -48, max: 12 }),
      hours: fc.array(
        fc.oneof({ weight: 1, arbitrary: fc.constant([]) }, { weight: 6, arbitrary: fc.array(dayRange, { minLength: 1, maxLength: 2 }) }),
        { minLength: 7, maxLength: 7 },
      ),
      closeSecondDay: fc.integer({ min: 0, max: 3 }).map((v) => v === 0),
      chairCount: fc.integer({ min: 1, max: 3 }),
      fixedMicOnFirst: fc.boolean(),
      mobileMics: fc.integer({ min: 0, max: 2 }),
      operators: fc.array(
        fc.record({
          rules: fc.array(fc.record({ rule: fc.constantFrom(...RULES), hours: dayRange, lunch: fc.option(range, { nil: undefined }) }), { minLength: 1, maxLength: 2 }),
          timeOff: fc.array(fc.tuple(fc.integer({ min: 0, max: 800 }), fc.integer({ min: 1, max: 60 })), { maxLength: 1 }),
          hold: fc.option(fc.tuple(range, fc.option(fc.integer({ min: 1, max: 30 }), { nil: undefined })), { nil: undefined }),
        }),
        { minLength: 1, maxLength: 3 },
      ),
      busy: fc.array(fc.tuple(fc.integer({ min: 0, max: 7 }), fc.integer({ min: 0, max: 900 }), fc.integer({ min: 1, max: 30 })), { maxLength: 14 }),
      minutes: fc.array(fc.constantFrom(15, 30, 45, 60, 90), { minLength: visitCount, maxLength: visitCount }),
      needsMic: fc.array(fc.boolean(), { minLength: visitCount, maxLength: visitCount }),
      gapDays: fc.tuple(fc.integer({ min: 0, max: 1 }), fc.integer({ min: 0, max: 2 })),
      grid: fc.constantFrom(5, 10, 15, 30),
      turnover: fc.constantFrom(0, 10, 15),
      urgent: fc.boolean(),
      limit: fc.integer({ min: 1, max: 5 }),
      pinOperator: fc.boolean(),
      sameOperator: fc.boolean(),
    })
    .map((g): Scenario => {
      const zone = g.zone;
      const from = at(zone, `${g.startDate} 00:00`) + g.fromOffset * 15 * MIN;
      const to = at(zone, `${g.startDate} 00:00`) + g.days * 24 * 60 * MIN;
      const openingHours: OpeningHours = {};
      g.hours.forEach((ranges, i) => {
        if (ranges.length > 0) openingHours[(i + 1) as 1] = ranges;
      });
      const secondDay = new Date(at('UTC', `${g.startDate} 00:00`) + 24 * 60 * MIN).toISOString().slice(0, 10);
      const chairs: Chair[] = [];
      const microscopes: Microscope[] = [];
      for (let c = 0; c < g.chairCount; c++) chairs.push({ id: `C${c}`, locationId: 'L', ...(c === 0 && g.fixedMicOnFirst ? { fixedMicroscopeId: 'MF' } : {}) });
      if (g.fixedMicOnFirst) microscopes.push({ id: 'MF', locationId: 'L', mobile: false, chairId: 'C0' });
      for (let m = 0; m < g.mobileMics; m++) microscopes.push({ id: `MM${m}`, locationId: 'L', mobile: true });
      const holds: Hold[] = [];
      const operators: Operator[] = g.operators.map((o, i) => {
        const id = `O${i}`;
        if (o.hold !== undefined) {
          holds.push({ operatorId: id, locationId: 'L', rrule: 'FREQ=DAILY', ...o.hold[0], ...(o.hold[1] !== undefined ? { opensHoursBefore: o.hold[1] } : {}) });
        }
        return {
          id,
          name: `Operator ${id}`,
          workingRules: o.rules.map((r) => ({ locationId: 'L', rrule: r.rule, ...r.hours, ...(r.lunch !== undefined ? { breaks: [r.lunch] } : {}) })),
          timeOff: o.timeOff.map(([s, l]): Interval => ({ start: from + s * 5 * MIN, end: from + (s + l) * 5 * MIN })),
        };
      });
      const busy: BusyIntervals = { chairs: {}, operators: {}, microscopes: {} };
      const ids: [keyof BusyIntervals, string][] = [
        ...chairs.map((c): [keyof BusyIntervals, string] => ['chairs', c.id]),
        ...operators.map((o): [keyof BusyIntervals, string] => ['operators', o.id]),
        ...microscopes.map((m): [keyof BusyIntervals, string] => ['microscopes', m.id]),
      ];
      for (const [which, s, l] of g.busy) {
        const [kind, id] = ids[which % ids.length];
        const map = busy[kind] as Record<string, Interval[]>;
        (map[id] ??= []).push({ start: from + s * 5 * MIN, end: from + (s + l) * 5 * MIN });
      }
      const visits = g.minutes.map((minutes, k) => ({
        minutes,
        needsMicroscope: g.needsMic[k],
        ...(k > 0 ? { earliestDaysAfterPrevious: g.gapDays[0], latestDaysAfterPrevious: g.gapDays[0] + g.gapDays[1] } : {}),
      }));
      return {
        resources: {
          locations: [{ id: 'L', timeZone: zone, openingHours, closures: g.closeSecondDay ? [{ date: secondDay, reason: 'closed for repairs' }] : [] }],
          chairs,
          microscopes,
          operators,
          holds,
        },
        busy,
        request: {
          plan: { visits },
          from,
          to,
          now: from + g.nowShift * 30 * MIN,
          turnoverMinutes: g.turnover,
          gridMinutes: g.grid,
          urgent: g.urgent,
          limit: g.limit,
          sameOperator: g.sameOperator,
          ...(g.pinOperator ? { operatorId: 'O0' } : {}),
        },
      };
    });
}

const preferences = fc.option(
  fc.record({ weekdays: fc.option(fc.subarray([1, 2, 3, 4, 5, 6, 7] as const, { minLength: 1 }), { nil: undefined }), partOfDay: fc.option(fc.constantFrom('morning' as const, 'afternoon' as const), { nil: undefined }) }),
  { nil: undefined },
);

function overlaps(list: readonly Interval[] | undefined, start: number, end: number): boolean {
  return (list ?? []).some((iv) => iv.start < end && start < iv.end);
}

describe('time finder on random worlds', () => {
  it('never overlaps a busy interval of its resources nor leaves opening/working hours (property, 250 runs)', () => {
    fc.assert(
      fc.property(scenario(1), preferences, ({ resources, busy, request: base }, prefs) => {
        const request: TimeFinderRequest = prefs === undefined ? base : { ...base, preferences: prefs };
        const result = findTimes(resources, busy, request);
        const world = new NaiveWorld(resources, busy, request);
        const turnover = (request.turnoverMinutes ?? 10) * MIN;
        const visit = request.plan.visits[0];
        expect(result.proposals.length).toBeLessThanOrEqual(request.limit ?? 5);
        if (result.proposals.length === 0) expect(result.unplaceable?.reason).toBeTruthy();
        for (const p of result.proposals) {
          const v = p.visits[0];
          expect(overlaps(busy.chairs[v.chairId], v.start, v.end + turnover)).toBe(false);
          expect(overlaps(busy.operators[v.operatorId], v.start, v.end)).toBe(false);
          if (v.microscopeId !== undefined) expect(overlaps(busy.microscopes[v.microscopeId], v.start, v.end)).toBe(false);
          expect(v.start).toBeGreaterThanOrEqual(Math.max(request.from, request.now));
          expect(v.end).toBeLessThanOrEqual(request.to);
          expect(world.violations(v, visit.minutes, visit.needsMicroscope)).toEqual([]);
          expect(p.score).toBeGreaterThanOrEqual(0);
          expect(p.score).toBeLessThanOrEqual(100);
        }
        // One proposal per local half-day keeps them apart.
        const starts = result.proposals.map((p) => p.visits[0].start);
        expect(new Set(starts).size).toBe(starts.length);
        expect([...starts].sort((a, b) => a - b)).toEqual(starts);
      }),
      { numRuns: 250 },
    );
  }, 120_000);

  it('first proposal starts at the naive scan’s earliest feasible start, single visit (property, 250 runs)', () => {
    fc.assert(
      fc.property(scenario(1), ({ resources, busy, request }) => {
        const result = findTimes(resources, busy, request);
        const naive = new NaiveWorld(resources, busy, request).earliestSeries();
        expect(result.proposals[0]?.visits[0].start).toBe(naive?.[0].start);
      }),
      { numRuns: 250 },
    );
  }, 120_000);

  it('two-visit series: same earliest first visit as the naive scan, second visit valid and inside its window (property, 200 runs)', () => {
    fc.assert(
      fc.property(scenario(2), ({ resources, busy, request }) => {
        const result = findTimes(resources, busy, request);
        const world = new NaiveWorld(resources, busy, request);
        const naive = world.earliestSeries();
        expect(result.proposals[0]?.visits[0].start).toBe(naive?.[0].start);
        const zone = resources.locations[0].timeZone;
        const turnover = (request.turnoverMinutes ?? 10) * MIN;
        for (const p of result.proposals) {
          const [v1, v2] = p.visits;
          request.plan.visits.forEach((pv, k) => expect(world.violations(p.visits[k], pv.minutes, pv.needsMicroscope)).toEqual([]));
          expect(v2.start).toBeGreaterThanOrEqual(v1.end + (v1.chairId === v2.chairId ? turnover : 0));
          if (request.sameOperator !== false) expect(v2.operatorId).toBe(v1.operatorId);
          const days = (at(zone, `${localDate(v2.start, zone)} 12:00`) - at(zone, `${localDate(v1.start, zone)} 12:00`)) / (24 * 60 * MIN);
          const rule = request.plan.visits[1];
          expect(Math.round(days)).toBeGreaterThanOrEqual(rule.earliestDaysAfterPrevious ?? 0);
          expect(Math.round(days)).toBeLessThanOrEqual(rule.latestDaysAfterPrevious ?? Infinity);
        }
      }),
      { numRuns: 200 },
    );
  }, 120_000);
});

function localDate(t: number, zone: string): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone: zone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(t);
}
