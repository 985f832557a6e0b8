// The time finder (design: scheduling.md "Time finder"): free time per resource as sorted interval lists,
// intersected per chair/operator/microscope combination, then visit series searched and ranked.
import { DateTime } from 'luxon';
import {
  clipIntervals,
  complementIntervals,
  findContaining,
  firstIndexEndingAfter,
  intersectIntervals,
  normalizeIntervals,
  shrinkEnds,
  subtractIntervals,
  unionIntervals,
} from './interval.util.js';
import { clearRecurrenceCache, expandRuleDays } from './recurrence.util.js';
import type {
  BusyMap,
  Chair,
  Hold,
  Interval,
  IsoWeekday,
  Location,
  Microscope,
  Operator,
  PlannedVisit,
  Proposal,
  ProposedVisit,
  SchedulingResources,
  BusyIntervals,
  TimeFinderRequest,
  TimeFinderResult,
  Unplaceable,
  UnplaceableCode,
} from './time-finder.types.js';
import {
  clearZoneClockCache,
  DAY_MS,
  HOUR_MS,
  MINUTE_MS,
  parseLocalDate,
  parseLocalTime,
  weekdayOfDay,
  zoneClock,
  type LocalDay,
  type ZoneClock,
} from './zone-clock.util.js';

// Common practice, no source: about ten minutes to clean and set up an operatory between patients.
export const DEFAULT_TURNOVER_MINUTES = 10;
export const DEFAULT_LIMIT = 5;
export const DEFAULT_GRID_MINUTES = 5;
// Common practice, no source: a chair gap under half an hour rarely fits any endodontic visit.
export const DEFAULT_MIN_USEFUL_GAP_MINUTES = 30;
// scheduling.md: unused holds open up the evening before; 18:00 local is the brief's example.
export const DEFAULT_HOLD_OPENS_AT = '18:00';

const WEEKDAY_NAMES = ['', 'Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'];

interface Settings {
  lo: number;
  hi: number;
  from: number;
  now: number;
  turnoverMs: number;
  gridMinutes: number;
  limit: number;
  sameOperator: boolean;
  urgent: boolean;
  minUsefulGapMs: number;
  weekdays?: ReadonlySet<number>;
  partOfDay?: 'morning' | 'afternoon';
  hasPrefs: boolean;
  previousOperatorId?: string;
  visits: readonly PlannedVisit[];
}

interface LocationCtx {
  location: Location;
  clock: ZoneClock;
  firstDay: LocalDay;
  lastDay: LocalDay;
  anchorDay: LocalDay;
  openRaw: Interval[];
  open: Interval[];
  closureReasons: string[];
  chairs: Chair[];
  mobileMics: Microscope[];
  chairAvail: Map<string, Interval[]>;
}

interface HoldOccurrence {
  interval: Interval;
  opensAt: number;
  blocked: boolean;
}

interface OperatorCtx {
  operator: Operator;
  timeOff: Interval[];
  busy: Interval[];
  blockedHolds: Interval[];
  blocked: Interval[];
  holds: HoldOccurrence[];
}

interface Combo {
  loc: LocationCtx;
  op: OperatorCtx;
  chair: Chair;
  microscope?: Microscope;
  microscopeFixed: boolean;
  avail: Interval[];
}

interface Placed {
  start: number;
  end: number;
  combo: Combo;
}

interface VisitQuality {
  gapBefore: number;
  gapAfter: number;
  fitClass: number;
  micPref: number;
  prefMatch: boolean;
}

/** Drops the memoised zone clocks and rule expansions (for cold-start measurements). */
export function clearTimeFinderCaches(): void {
  clearZoneClockCache();
  clearRecurrenceCache();
}

function busyOf(map: BusyMap, id: string): Interval[] {
  const list = map[id];
  return list === undefined ? [] : normalizeIntervals(list);
}

function settingsOf(request: TimeFinderRequest): Settings {
  const visits = request.plan.visits;
  if (visits.length === 0) throw new RangeError('plan has no visits');
  for (const v of visits) {
    if (!(v.minutes > 0) || !Number.isFinite(v.minutes)) throw new RangeError(`visit minutes must be positive, got ${v.minutes}`);
  }
  const gridMinutes = request.gridMinutes ?? DEFAULT_GRID_MINUTES;
  if (!Number.isInteger(gridMinutes) || gridMinutes < 1 || gridMinutes > 1440) throw new RangeError('gridMinutes must be an integer 1–1440');
  const turnoverMinutes = request.turnoverMinutes ?? DEFAULT_TURNOVER_MINUTES;
  if (!(turnoverMinutes >= 0)) throw new RangeError('turnoverMinutes must be ≥ 0');
  const limit = request.limit ?? DEFAULT_LIMIT;
  if (!Number.isInteger(limit) || limit < 1) throw new RangeError('limit must be a positive integer');
  const prefs = request.preferences;
  const weekdays = prefs?.weekdays !== undefined && prefs.weekdays.length > 0 ? new Set<number>(prefs.weekdays) : undefined;
  return {
    lo: Math.max(request.from, request.now),
    hi: request.to,
    from: request.from,
    now: request.now,
    turnoverMs: turnoverMinutes * MINUTE_MS,
    gridMinutes,
    limit,
    sameOperator: request.sameOperator ?? true,
    urgent: request.urgent ?? false,
    minUsefulGapMs: (request.minUsefulGapMinutes ?? DEFAULT_MIN_USEFUL_GAP_MINUTES) * MINUTE_MS,
    weekdays,
    partOfDay: prefs?.partOfDay,
    hasPrefs: weekdays !== undefined || prefs?.partOfDay !== undefined,
    previousOperatorId: request.previousOperatorId,
    visits,
  };
}

/** Instants of wall-clock range r on day, minus its breaks. */
function rangeOnDay(clock: ZoneClock, day: LocalDay, startLocal: string, endLocal: string, breaks?: readonly { startLocal: string; endLocal: string }[]): Interval[] {
  const s = parseLocalTime(startLocal);
  const e = parseLocalTime(endLocal);
  if (e <= s) throw new RangeError(`range ${startLocal}–${endLocal} must end after it starts`);
  let pieces = clock.readingRange(day, s, e);
  if (breaks !== undefined && breaks.length > 0) {
    const cut: Interval[] = [];
    for (const b of breaks) cut.push(...clock.readingRange(day, parseLocalTime(b.startLocal), parseLocalTime(b.endLocal)));
    pieces = subtractIntervals(pieces, normalizeIntervals(cut));
  }
  return pieces;
}

class Search {
  readonly s: Settings;
  private readonly resources: SchedulingResources;
  private readonly busy: BusyIntervals;
  private readonly locCtx = new Map<string, LocationCtx>();
  private readonly opCtx = new Map<string, OperatorCtx>();
  private readonly workCache = new Map<string, Interval[]>();
  private readonly opAvailCache = new Map<string, Interval[]>();
  private readonly chairMicCache = new Map<string, Interval[]>();
  private readonly comboCache = new Map<string, Combo[]>();
  private readonly micFreeCache = new Map<string, Interval[]>();
  private readonly qualityCache = new WeakMap<Placed, VisitQuality>();
  private readonly tailMemo = new Map<string, Placed[] | null>();
  readonly locations: LocationCtx[];
  readonly operators: OperatorCtx[];

  constructor(resources: SchedulingResources, busy: BusyIntervals, request: TimeFinderRequest, settings: Settings) {
    this.s = settings;
    this.resources = resources;
    this.busy = busy;
    const locs = request.locationId === undefined ? resources.locations : resources.locations.filter((l) => l.id === request.locationId);
    this.locations = locs.map((l) => this.location(l.id)).filter((l): l is LocationCtx => l !== undefined);
    const ops = request.operatorId === undefined ? resources.operators : resources.operators.filter((o) => o.id === request.operatorId);
    this.operators = ops.map((o) => this.operator(o));
  }

  location(id: string): LocationCtx | undefined {
    const cached = this.locCtx.get(id);
    if (cached !== undefined) return cached;
    const location = this.resources.locations.find((l) => l.id === id);
    if (location === undefined) return undefined;
    const { lo, hi, turnoverMs } = this.s;
    const clock = zoneClock(location.timeZone, Math.min(lo, this.s.from) - DAY_MS, hi + turnoverMs + DAY_MS);
    const firstDay = clock.day(lo) - 1;
    const lastDay = clock.day(hi) + 1;
    const raw: Interval[] = [];
    for (let day = firstDay; day <= lastDay; day++) {
      const ranges = location.openingHours[weekdayOfDay(day) as IsoWeekday];
      if (ranges === undefined) continue;
      for (const r of ranges) raw.push(...rangeOnDay(clock, day, r.startLocal, r.endLocal));
    }
    const openRaw = clipIntervals(normalizeIntervals(raw), lo, hi);
    const closed: Interval[] = [];
    const closureReasons: string[] = [];
    for (const c of location.closures) {
      const day = parseLocalDate(c.date);
      if (day < firstDay || day > lastDay) continue;
      const piece = clock.readingRange(day, 0, 1440);
      if (intersectIntervals(openRaw, piece).length > 0) closureReasons.push(`${c.date} ${c.reason}`);
      closed.push(...piece);
    }
    const open = subtractIntervals(openRaw, normalizeIntervals(closed));
    const chairs = this.resources.chairs.filter((c) => c.locationId === id);
    const chairAvail = new Map<string, Interval[]>();
    for (const chair of chairs) {
      // The chair must stay free for the turnover after the visit; that turnover may run past closing.
      const notBusy = complementIntervals(busyOf(this.busy.chairs, chair.id), lo, hi + turnoverMs);
      chairAvail.set(chair.id, intersectIntervals(open, shrinkEnds(notBusy, turnoverMs)));
    }
    const ctx: LocationCtx = {
      location,
      clock,
      firstDay,
      lastDay,
      anchorDay: clock.day(this.s.from),
      openRaw,
      open,
      closureReasons,
      chairs,
      mobileMics: this.resources.microscopes.filter((m) => m.mobile && m.locationId === id),
      chairAvail,
    };
    this.locCtx.set(id, ctx);
    return ctx;
  }

  private operator(operator: Operator): OperatorCtx {
    const cached = this.opCtx.get(operator.id);
    if (cached !== undefined) return cached;
    const timeOff = normalizeIntervals(operator.timeOff);
    const busy = busyOf(this.busy.operators, operator.id);
    const holds: HoldOccurrence[] = [];
    for (const hold of this.resources.holds) if (hold.operatorId === operator.id) holds.push(...this.holdOccurrences(hold));
    const blockedHolds = normalizeIntervals(holds.filter((h) => h.blocked).map((h) => h.interval));
    const ctx: OperatorCtx = {
      operator,
      timeOff,
      busy,
      blockedHolds,
      blocked: unionIntervals(unionIntervals(timeOff, busy), blockedHolds),
      holds,
    };
    this.opCtx.set(operator.id, ctx);
    return ctx;
  }

  private holdOccurrences(hold: Hold): HoldOccurrence[] {
    const loc = this.location(hold.locationId);
    if (loc === undefined) return [];
    const out: HoldOccurrence[] = [];
    const eveningMin = parseLocalTime(hold.opensEveningBeforeAt ?? DEFAULT_HOLD_OPENS_AT);
    for (const day of expandRuleDays(hold.rrule, loc.anchorDay, loc.firstDay, loc.lastDay)) {
      const pieces = rangeOnDay(loc.clock, day, hold.startLocal, hold.endLocal);
      if (pieces.length === 0) continue;
      const opensAt =
        hold.opensHoursBefore !== undefined
          ? pieces[0].start - hold.opensHoursBefore * HOUR_MS
          : loc.clock.firstInstantAtOrAfter((day - 1) * DAY_MS + eveningMin * MINUTE_MS);
      for (const interval of pieces) out.push({ interval, opensAt, blocked: !this.s.urgent && this.s.now < opensAt });
    }
    return out;
  }

  /** Working time of an operator at a location from the rules alone, clipped to the horizon. */
  work(op: OperatorCtx, loc: LocationCtx): Interval[] {
    const key = `${op.operator.id}|${loc.location.id}`;
    const cached = this.workCache.get(key);
    if (cached !== undefined) return cached;
    const pieces: Interval[] = [];
    for (const rule of op.operator.workingRules) {
      if (rule.locationId !== loc.location.id) continue;
      for (const day of expandRuleDays(rule.rrule, loc.anchorDay, loc.firstDay, loc.lastDay)) {
        pieces.push(...rangeOnDay(loc.clock, day, rule.startLocal, rule.endLocal, rule.breaks));
      }
    }
    const work = clipIntervals(normalizeIntervals(pieces), this.s.lo, this.s.hi);
    this.workCache.set(key, work);
    return work;
  }

  opAvail(op: OperatorCtx, loc: LocationCtx): Interval[] {
    const key = `${op.operator.id}|${loc.location.id}`;
    let avail = this.opAvailCache.get(key);
    if (avail === undefined) {
      avail = subtractIntervals(intersectIntervals(this.work(op, loc), loc.open), op.blocked);
      this.opAvailCache.set(key, avail);
    }
    return avail;
  }

  micFree(mic: Microscope): Interval[] {
    let free = this.micFreeCache.get(mic.id);
    if (free === undefined) {
      free = complementIntervals(busyOf(this.busy.microscopes, mic.id), this.s.lo, this.s.hi);
      this.micFreeCache.set(mic.id, free);
    }
    return free;
  }

  /** Microscopes that can serve a chair: its fixed one and the mobile ones of its location. */
  microscopeOptions(loc: LocationCtx, chair: Chair): { mic: Microscope; fixed: boolean }[] {
    const out: { mic: Microscope; fixed: boolean }[] = [];
    for (const m of this.resources.microscopes) {
      if (m.locationId !== loc.location.id || m.mobile) continue;
      if (m.id === chair.fixedMicroscopeId || m.chairId === chair.id) out.push({ mic: m, fixed: true });
    }
    for (const m of loc.mobileMics) out.push({ mic: m, fixed: false });
    return out;
  }

  private chairMic(loc: LocationCtx, chair: Chair, mic: Microscope | undefined): Interval[] {
    const key = `${chair.id}|${mic?.id ?? ''}`;
    let avail = this.chairMicCache.get(key);
    if (avail === undefined) {
      const chairAvail = loc.chairAvail.get(chair.id) ?? [];
      avail = mic === undefined ? chairAvail : intersectIntervals(chairAvail, this.micFree(mic));
      this.chairMicCache.set(key, avail);
    }
    return avail;
  }

  combos(loc: LocationCtx, op: OperatorCtx, needsMicroscope: boolean): Combo[] {
    const key = `${loc.location.id}|${op.operator.id}|${needsMicroscope ? 1 : 0}`;
    const cached = this.comboCache.get(key);
    if (cached !== undefined) return cached;
    const out: Combo[] = [];
    const opAvail = this.opAvail(op, loc);
    if (opAvail.length > 0) {
      for (const chair of loc.chairs) {
        const options = needsMicroscope ? this.microscopeOptions(loc, chair) : [{ mic: undefined, fixed: false }];
        for (const { mic, fixed } of options) {
          const avail = intersectIntervals(this.chairMic(loc, chair, mic), opAvail);
          if (avail.length > 0) out.push({ loc, op, chair, microscope: mic, microscopeFixed: fixed, avail });
        }
      }
    }
    this.comboCache.set(key, out);
    return out;
  }

  prefMatchAt(clock: ZoneClock, t: number): boolean {
    return this.bucketMatches(clock.bucket(t));
  }

  bucketMatches(bucket: number): boolean {
    const { weekdays, partOfDay } = this.s;
    if (weekdays !== undefined && !weekdays.has(weekdayOfDay(Math.floor(bucket / 2)))) return false;
    if (partOfDay !== undefined && (bucket % 2 === 1 ? 'afternoon' : 'morning') !== partOfDay) return false;
    return true;
  }

  /** Earliest grid start s in [from, before) with [s, s+duration) inside the combo's free time. */
  earliestInCombo(combo: Combo, from: number, before: number, durationMs: number, prefsOnly: boolean): number | undefined {
    const list = combo.avail;
    const clock = combo.loc.clock;
    const grid = this.s.gridMinutes;
    for (let i = firstIndexEndingAfter(list, from); i < list.length; i++) {
      const iv = list[i];
      if (iv.start >= before) break;
      let s = clock.nextGridStart(iv.start > from ? iv.start : from, grid);
      while (s < before && s + durationMs <= iv.end) {
        if (!prefsOnly || this.prefMatchAt(clock, s)) return s;
        const next = clock.nextGridStart(clock.nextBucketStart(s), grid);
        if (!(next > s)) break;
        s = next;
      }
    }
    return undefined;
  }

  /** First candidate per half-day bucket of every combo for the first visit. */
  firstVisitCandidates(): Map<number, Placed[]> {
    const visit = this.s.visits[0];
    const durationMs = visit.minutes * MINUTE_MS;
    const grid = this.s.gridMinutes;
    const buckets = new Map<number, Placed[]>();
    for (const loc of this.locations) {
      const clock = loc.clock;
      for (const op of this.operators) {
        for (const combo of this.combos(loc, op, visit.needsMicroscope)) {
          let lastBucket = Number.NaN;
          for (const iv of combo.avail) {
            let s = clock.nextGridStart(iv.start, grid);
            while (s + durationMs <= iv.end) {
              const bucket = clock.bucket(s);
              if (bucket !== lastBucket) {
                lastBucket = bucket;
                let list = buckets.get(bucket);
                if (list === undefined) buckets.set(bucket, (list = []));
                list.push({ start: s, end: s + durationMs, combo });
              }
              const next = clock.nextGridStart(clock.nextBucketStart(s), grid);
              if (!(next > s)) break;
              s = next;
            }
          }
        }
      }
    }
    return buckets;
  }

  quality(p: Placed, visit: PlannedVisit): VisitQuality {
    const cached = this.qualityCache.get(p);
    if (cached !== undefined) return cached;
    const chairFree = p.combo.loc.chairAvail.get(p.combo.chair.id) ?? [];
    const iv = findContaining(chairFree, p.start, p.end);
    const gapBefore = iv === undefined ? 0 : p.start - iv.start;
    const gapAfter = iv === undefined ? 0 : iv.end - p.end;
    const min = this.s.minUsefulGapMs;
    const unusable = (gapBefore > 0 && gapBefore < min) || (gapAfter > 0 && gapAfter < min);
    const fitClass = unusable ? 0 : gapBefore === 0 && gapAfter === 0 ? 3 : gapBefore === 0 || gapAfter === 0 ? 2 : 1;
    // Microscope visits prefer the chair's own microscope; others keep microscope chairs free.
    const micPref = visit.needsMicroscope ? (p.combo.microscopeFixed ? 1 : 0) : this.chairHasFixedMic(p.combo.chair) ? 0 : 1;
    const q: VisitQuality = { gapBefore, gapAfter, fitClass, micPref, prefMatch: this.s.hasPrefs && this.prefMatchAt(p.combo.loc.clock, p.start) };
    this.qualityCache.set(p, q);
    return q;
  }

  private chairHasFixedMic(chair: Chair): boolean {
    return chair.fixedMicroscopeId !== undefined || this.resources.microscopes.some((m) => !m.mobile && m.chairId === chair.id);
  }

  continuity(series: readonly Placed[]): number {
    let score = 0;
    const first = series[0].combo.op.operator.id;
    for (let k = 0; k < series.length; k++) {
      const id = series[k].combo.op.operator.id;
      if (this.s.previousOperatorId !== undefined && id === this.s.previousOperatorId) score++;
      if (k > 0 && id === first) score++;
    }
    return score;
  }

  compareSeries(a: readonly Placed[], b: readonly Placed[]): number {
    if (a[0].start !== b[0].start) return a[0].start - b[0].start;
    const qa = a.map((p, k) => this.quality(p, this.s.visits[k]));
    const qb = b.map((p, k) => this.quality(p, this.s.visits[k]));
    const count = (qs: VisitQuality[], f: (q: VisitQuality) => number): number => qs.reduce((sum, q) => sum + f(q), 0);
    const minFit = (qs: VisitQuality[]): number => Math.min(...qs.map((q) => q.fitClass));
    return (
      count(qb, (q) => (q.prefMatch ? 1 : 0)) - count(qa, (q) => (q.prefMatch ? 1 : 0)) ||
      this.continuity(b) - this.continuity(a) ||
      minFit(qb) - minFit(qa) ||
      count(qb, (q) => q.fitClass) - count(qa, (q) => q.fitClass) ||
      count(qb, (q) => q.micPref) - count(qa, (q) => q.micPref) ||
      a.reduce((sum, p) => sum + p.start, 0) - b.reduce((sum, p) => sum + p.start, 0) ||
      keyOf(a).localeCompare(keyOf(b))
    );
  }

  /** Best placement of visit k at or after cursor (earliest start, then continuity and fit). */
  private findNext(k: number, placed: readonly Placed[], cursor: number, before: number, prefsOnly: boolean): Placed | undefined {
    const visit = this.s.visits[k];
    const durationMs = visit.minutes * MINUTE_MS;
    const loc = placed[0].combo.loc;
    const ops = this.s.sameOperator ? [placed[0].combo.op] : this.operators;
    let best: Placed | undefined;
    let bestSeries: Placed[] | undefined;
    for (const op of ops) {
      for (const combo of this.combos(loc, op, visit.needsMicroscope)) {
        let from = cursor;
        for (const p of placed) {
          if (p.combo.chair.id === combo.chair.id && p.end + this.s.turnoverMs > from) from = p.end + this.s.turnoverMs;
          if (p.end > from) from = p.end;
        }
        const s = this.earliestInCombo(combo, from, before, durationMs, prefsOnly);
        if (s === undefined || (best !== undefined && s > best.start)) continue;
        const candidate: Placed = { start: s, end: s + durationMs, combo };
        const series = [...placed, candidate];
        if (best === undefined || bestSeries === undefined || s < best.start || this.compareSeries(series, bestSeries) < 0) {
          best = candidate;
          bestSeries = series;
        }
      }
    }
    return best;
  }

  /** Places visits k.. after the placed ones (depth-first over days), or null. */
  extend(placed: Placed[], k: number): Placed[] | null {
    if (k === this.s.visits.length) return placed;
    const prev = placed[k - 1];
    const visit = this.s.visits[k];
    const clock = prev.combo.loc.clock;
    const prevDay = clock.day(prev.start);
    const earliestDays = visit.earliestDaysAfterPrevious ?? 0;
    const windowStart = clock.firstInstantAtOrAfter((prevDay + earliestDays) * DAY_MS);
    const before =
      visit.latestDaysAfterPrevious === undefined
        ? this.s.hi
        : Math.min(this.s.hi, clock.firstInstantAtOrAfter((prevDay + visit.latestDaysAfterPrevious + 1) * DAY_MS));
    // Once the window opens after every placed visit and its turnover, the tail only depends on the day.
    const latestRelease = Math.max(...placed.map((p) => p.end + this.s.turnoverMs));
    const memoKey = latestRelease <= windowStart ? `${k}|${prev.combo.loc.location.id}|${placed[0].combo.op.operator.id}|${prevDay}` : undefined;
    if (memoKey !== undefined && this.tailMemo.has(memoKey)) {
      const tail = this.tailMemo.get(memoKey);
      return tail === null || tail === undefined ? null : [...placed, ...tail];
    }
    let result: Placed[] | null = null;
    for (const prefsOnly of this.s.hasPrefs ? [true, false] : [false]) {
      let cursor = Math.max(windowStart, prev.end, this.s.lo);
      while (result === null && cursor < before) {
        const next = this.findNext(k, placed, cursor, before, prefsOnly);
        if (next === undefined) break;
        result = this.extend([...placed, next], k + 1);
        if (result === null) cursor = clock.firstInstantAtOrAfter((clock.day(next.start) + 1) * DAY_MS);
      }
      if (result !== null) break;
    }
    if (memoKey !== undefined) this.tailMemo.set(memoKey, result === null ? null : result.slice(k));
    return result;
  }

  /** Best full series whose first visit is one of the bucket's candidates. */
  bestSeries(candidates: Placed[]): Placed[] | undefined {
    const sorted = [...candidates].sort((a, b) => a.start - b.start);
    for (let i = 0; i < sorted.length; ) {
      let j = i;
      let best: Placed[] | undefined;
      while (j < sorted.length && sorted[j].start === sorted[i].start) {
        const series = this.extend([sorted[j]], 1);
        if (series !== null && (best === undefined || this.compareSeries(series, best) < 0)) best = series;
        j++;
      }
      if (best !== undefined) return best;
      i = j;
    }
    return undefined;
  }

  /** Number of other feasible resource choices for the first visit at the same start. */
  alternativesAtStart(candidates: Placed[], start: number): number {
    return candidates.filter((c) => c.start === start).length - 1;
  }
}

function keyOf(series: readonly Placed[]): string {
  return series.map((p) => `${p.combo.chair.id}/${p.combo.op.operator.id}/${p.combo.microscope?.id ?? ''}`).join('|');
}

function formatLocal(t: number, zone: string, format: string): string {
  return DateTime.fromMillis(t, { zone }).setLocale('en-GB').toFormat(format);
}

function ordinal(n: number): string {
  return n === 1 ? '1st' : n === 2 ? '2nd' : n === 3 ? '3rd' : `${n}th`;
}

interface Selected {
  series: Placed[];
  matched: boolean;
  alternatives: number;
}

function describe(search: Search, selected: Selected[], index: number, matchingCount: number): Proposal {
  const s = search.s;
  const { series, matched, alternatives } = selected[index];
  const first = series[0];
  const zone = first.combo.loc.location.timeZone;
  const clock = first.combo.loc.clock;
  const qualities = series.map((p, k) => search.quality(p, s.visits[k]));
  const reasons: string[] = [];
  const when = `${formatLocal(first.start, zone, 'ccc yyyy-MM-dd HH:mm')} (${zone})`;
  const part = clock.bucket(first.start) % 2 === 1 ? 'afternoon' : 'morning';
  if (index === 0) {
    reasons.push(
      s.hasPrefs && matched
        ? `${ordinal(index + 1)} option: earliest start matching the preferences, ${when}`
        : `${ordinal(index + 1)} option: earliest feasible start, ${when}`,
    );
  } else {
    reasons.push(`${ordinal(index + 1)} option: earliest start of that ${part}, ${when}; one proposal per half-day keeps the options apart`);
  }
  if (s.hasPrefs) {
    const weekday = WEEKDAY_NAMES[weekdayOfDay(clock.day(first.start))];
    if (matched) {
      const parts: string[] = [];
      if (s.weekdays !== undefined) parts.push(`preferred weekday (${weekday})`);
      if (s.partOfDay !== undefined) parts.push(`preferred ${s.partOfDay}`);
      reasons.push(`matches the ${parts.join(' and ')}`);
    } else {
      reasons.push(`outside the preferences (${weekday} ${part}): only ${matchingCount} matching option(s) in the horizon`);
    }
  }
  const firstOp = first.combo.op.operator;
  if (series.length > 1 && series.every((p) => p.combo.op.operator.id === firstOp.id)) {
    reasons.push(`same operator (${firstOp.name}) for all ${series.length} visits`);
  }
  if (s.previousOperatorId !== undefined) {
    const seen = series.filter((p) => p.combo.op.operator.id === s.previousOperatorId).length;
    reasons.push(seen > 0 ? `with the operator the patient saw before (${seen} of ${series.length} visits)` : 'the operator the patient saw before is not free in this option');
  }
  if (alternatives > 0) reasons.push(`chosen over ${alternatives} other chair/operator choice(s) at the same start by preference, continuity and fit`);
  let smallestGap = Infinity;
  series.forEach((p, k) => {
    const q = qualities[k];
    const visitZone = p.combo.loc.location.timeZone;
    const mic = p.combo.microscope === undefined ? '' : `, ${p.combo.microscope.name ?? `microscope ${p.combo.microscope.id}`} (${p.combo.microscopeFixed ? 'fixed to the chair' : 'mobile'})`;
    const head = `visit ${k + 1}: ${formatLocal(p.start, visitZone, 'ccc d LLL yyyy, HH:mm')}–${formatLocal(p.end, visitZone, 'HH:mm')}, ${p.combo.chair.name ?? `chair ${p.combo.chair.id}`}, ${p.combo.op.operator.name}${mic}`;
    reasons.push(`${head}; ${fitText(q, s.minUsefulGapMs)}`);
    for (const g of [q.gapBefore, q.gapAfter]) if (g > 0 && g < smallestGap) smallestGap = g;
    if (k > 0) {
      const prev = series[k - 1];
      const days = p.combo.loc.clock.day(p.start) - prev.combo.loc.clock.day(prev.start);
      const v = s.visits[k];
      const window = `${v.earliestDaysAfterPrevious ?? 0}–${v.latestDaysAfterPrevious ?? 'any'}`;
      reasons.push(`visit ${k + 1} is ${days} day(s) after visit ${k} (allowed ${window})`);
    }
    for (const h of p.combo.op.holds) {
      if (h.interval.start < p.end && p.start < h.interval.end) {
        reasons.push(
          h.opensAt <= s.now
            ? `visit ${k + 1} uses an emergency hold that opened ${formatLocal(h.opensAt, visitZone, 'ccc HH:mm')}`
            : `visit ${k + 1} uses an emergency hold (urgent case)`,
        );
        break;
      }
    }
  });
  const prefFrac = s.hasPrefs ? qualities.filter((q) => q.prefMatch).length / series.length : 1;
  const contPossible = (s.previousOperatorId !== undefined ? series.length : 0) + (series.length - 1);
  const contFrac = contPossible === 0 ? 1 : search.continuity(series) / contPossible;
  const fitFrac = qualities.reduce((sum, q) => sum + q.fitClass, 0) / (3 * series.length);
  const visits: ProposedVisit[] = series.map((p) => {
    const v: ProposedVisit = { start: p.start, end: p.end, chairId: p.combo.chair.id, operatorId: p.combo.op.operator.id };
    if (p.combo.microscope !== undefined) v.microscopeId = p.combo.microscope.id;
    return v;
  });
  return {
    visits,
    gapMinutesLeft: smallestGap === Infinity ? 0 : Math.round(smallestGap / MINUTE_MS),
    reasons,
    score: Math.round(40 * prefFrac + 20 * contFrac + 40 * fitFrac),
  };
}

function fitText(q: VisitQuality, minUsefulGapMs: number): string {
  const min = (ms: number): string => `${Math.round(ms / MINUTE_MS)} min`;
  const parts: string[] = [];
  if (q.gapBefore === 0 && q.gapAfter === 0) return 'fills the free stretch exactly: no gap left';
  parts.push(q.gapBefore === 0 ? 'touches the booking or day start before it' : `leaves ${min(q.gapBefore)} free before`);
  parts.push(q.gapAfter === 0 ? 'touches the booking or day end after it' : `leaves ${min(q.gapAfter)} free after`);
  const bad = [q.gapBefore, q.gapAfter].filter((g) => g > 0 && g < minUsefulGapMs);
  if (bad.length > 0) parts.push(`a gap under ${min(minUsefulGapMs)} is too short for another visit`);
  return parts.join(', ');
}

const STAGES: { code: UnplaceableCode; text: string }[] = [
  { code: 'no-opening-hours', text: 'outside opening hours: the location has no opening hours in the horizon' },
  { code: 'location-closed', text: 'location closed (closures) on every open day in the horizon' },
  { code: 'no-operator-working', text: 'no operator working at this location in the horizon' },
  { code: 'outside-opening-hours', text: 'outside opening hours: the operators work here only while the location is closed' },
  { code: 'operator-off', text: 'operator off (time off) whenever they work here in the horizon' },
  { code: 'operator-fully-booked', text: 'operator fully booked in the horizon' },
  { code: 'only-holds-left', text: 'only emergency holds are free (urgent cases only until they open)' },
  { code: 'no-chair-free', text: 'no chair free when the operator is' },
  { code: 'no-microscope', text: 'no microscope at this location' },
  { code: 'no-microscope-free', text: 'no microscope free when the operator and a chair are' },
  { code: 'no-stretch-long-enough', text: 'no common free stretch long enough for the visit' },
];

/** How far a visit of this kind gets through the intersections: the index of the first empty stage. */
function funnel(search: Search, visit: PlannedVisit): { stage: number; loc?: LocationCtx; op?: OperatorCtx } {
  let best: { stage: number; loc?: LocationCtx; op?: OperatorCtx } = { stage: -1 };
  const durationMs = visit.minutes * MINUTE_MS;
  const reach = (stage: number, loc?: LocationCtx, op?: OperatorCtx): void => {
    if (stage > best.stage) best = { stage, loc, op };
  };
  for (const loc of search.locations) {
    if (loc.openRaw.length === 0) {
      reach(0, loc);
      continue;
    }
    if (loc.open.length === 0) {
      reach(1, loc);
      continue;
    }
    for (const op of search.operators) {
      const work = search.work(op, loc);
      if (work.length === 0) {
        reach(2, loc, op);
        continue;
      }
      const inOpen = intersectIntervals(work, loc.open);
      if (inOpen.length === 0) {
        reach(3, loc, op);
        continue;
      }
      const notOff = subtractIntervals(inOpen, op.timeOff);
      if (notOff.length === 0) {
        reach(4, loc, op);
        continue;
      }
      const notBusy = subtractIntervals(notOff, op.busy);
      if (notBusy.length === 0) {
        reach(5, loc, op);
        continue;
      }
      if (subtractIntervals(notBusy, op.blockedHolds).length === 0) {
        reach(6, loc, op);
        continue;
      }
      const opAvail = search.opAvail(op, loc);
      const withChair = loc.chairs.map((c) => intersectIntervals(opAvail, loc.chairAvail.get(c.id) ?? []));
      if (withChair.every((l) => l.length === 0)) {
        reach(7, loc, op);
        continue;
      }
      if (visit.needsMicroscope) {
        if (loc.chairs.every((c) => search.microscopeOptions(loc, c).length === 0)) {
          reach(8, loc, op);
          continue;
        }
        const anyMic = loc.chairs.some((c, i) =>
          search.microscopeOptions(loc, c).some(({ mic }) => intersectIntervals(withChair[i], search.micFree(mic)).length > 0),
        );
        if (!anyMic) {
          reach(9, loc, op);
          continue;
        }
      }
      const fits = search.combos(loc, op, visit.needsMicroscope).some((c) => search.earliestInCombo(c, search.s.lo, search.s.hi, durationMs, false) !== undefined);
      reach(fits ? STAGES.length : 10, loc, op);
    }
  }
  return best;
}

function stageReason(search: Search, visit: PlannedVisit, visitIndex: number, result: { stage: number; loc?: LocationCtx; op?: OperatorCtx }, multi: boolean): Unplaceable {
  const stage = STAGES[result.stage];
  let reason = stage.text;
  if (stage.code === 'location-closed' && result.loc !== undefined && result.loc.closureReasons.length > 0) {
    reason = `location closed on every open day in the horizon (${result.loc.closureReasons.join('; ')})`;
  }
  if (stage.code === 'no-stretch-long-enough') {
    reason = `no common free stretch of ${visit.minutes} min when a chair, the operator${visit.needsMicroscope ? ' and a microscope' : ''} are all free (on the ${search.s.gridMinutes}-minute grid)`;
  }
  if (result.op !== undefined && search.operators.length === 1 && result.stage >= 2) reason = `${reason} (${result.op.operator.name})`;
  if (result.loc !== undefined && search.locations.length === 1) reason = `${reason} [${result.loc.location.id}]`;
  return { reason: multi ? `visit ${visitIndex + 1}: ${reason}` : reason, code: stage.code, visitIndex };
}

/**
 * Finds up to `limit` proposals (each a full visit series) for the request, or says why none exists.
 * Pure: the caller loads resources and busy intervals (a fixed number of queries) and passes them in.
 */
export function findTimes(resources: SchedulingResources, busy: BusyIntervals, request: TimeFinderRequest): TimeFinderResult {
  const settings = settingsOf(request);
  if (settings.hi <= settings.lo) {
    return { proposals: [], unplaceable: { reason: 'the horizon is empty or already past', code: 'empty-horizon', visitIndex: 0 } };
  }
  const search = new Search(resources, busy, request, settings);
  if (search.locations.length === 0) {
    return { proposals: [], unplaceable: { reason: 'no location matches the request', code: 'no-location', visitIndex: 0 } };
  }
  if (search.operators.length === 0) {
    return { proposals: [], unplaceable: { reason: 'no operator matches the request', code: 'no-operator', visitIndex: 0 } };
  }
  const buckets = search.firstVisitCandidates();
  const order = [...buckets.keys()].sort((a, b) => a - b);
  const selected: Selected[] = [];
  const take = (wantMatch: boolean | undefined): void => {
    for (const bucket of order) {
      if (selected.length >= settings.limit) return;
      const matched = search.bucketMatches(bucket);
      if (wantMatch !== undefined && matched !== wantMatch) continue;
      const candidates = buckets.get(bucket) ?? [];
      const series = search.bestSeries(candidates);
      if (series !== undefined) selected.push({ series, matched, alternatives: search.alternativesAtStart(candidates, series[0].start) });
    }
  };
  if (settings.hasPrefs) {
    take(true);
    const matchingCount = selected.length;
    take(false);
    selected.sort((a, b) => a.series[0].start - b.series[0].start);
    if (selected.length > 0) return { proposals: selected.map((_, i) => describe(search, selected, i, matchingCount)) };
  } else {
    take(undefined);
    if (selected.length > 0) return { proposals: selected.map((_, i) => describe(search, selected, i, selected.length)) };
  }
  return { proposals: [], unplaceable: explain(search, buckets.size > 0, order.length > 0 ? earliestCandidate(buckets) : undefined) };
}

function earliestCandidate(buckets: Map<number, Placed[]>): Placed | undefined {
  let best: Placed | undefined;
  for (const list of buckets.values()) for (const p of list) if (best === undefined || p.start < best.start) best = p;
  return best;
}

function explain(search: Search, firstPlaceable: boolean, earliest: Placed | undefined): Unplaceable {
  const visits = search.s.visits;
  const multi = visits.length > 1;
  if (!firstPlaceable) return stageReason(search, visits[0], 0, funnel(search, visits[0]), multi);
  for (let k = 1; k < visits.length; k++) {
    const result = funnel(search, visits[k]);
    if (result.stage < STAGES.length) return stageReason(search, visits[k], k, result, multi);
  }
  const v = visits[1];
  if (earliest !== undefined) {
    const clock = earliest.combo.loc.clock;
    const windowStart = clock.firstInstantAtOrAfter((clock.day(earliest.start) + (v.earliestDaysAfterPrevious ?? 0)) * DAY_MS);
    if (windowStart >= search.s.hi) {
      return {
        reason: `the interval between visits reaches past the end of the search horizon (visit 2: ${v.earliestDaysAfterPrevious ?? 0}–${v.latestDaysAfterPrevious ?? 'any'} days after visit 1)`,
        code: 'interval-past-horizon',
        visitIndex: 1,
      };
    }
  }
  const same = search.s.sameOperator ? ' with the same operator' : '';
  const windows = visits
    .slice(1)
    .map((x, i) => `visit ${i + 2}: ${x.earliestDaysAfterPrevious ?? 0}–${x.latestDaysAfterPrevious ?? 'any'} days after visit ${i + 1}`)
    .join('; ');
  return { reason: `no time inside the interval between visits${same} (${windows})`, code: 'no-time-between-visits', visitIndex: 1 };
}
