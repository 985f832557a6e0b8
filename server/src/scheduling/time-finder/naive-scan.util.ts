// Naive reference for the time finder: one boolean per minute and resource, built from luxon's reading of
// every single minute, then a minute-by-minute scan for the earliest feasible series. Slow on purpose and
// independent of the interval arithmetic, so property tests use it as an oracle and the benchmark as a baseline.
import { DateTime } from 'luxon';
import rrulePkg from 'rrule';
import type {
  BusyMap,
  Chair,
  Hold,
  Interval,
  Location,
  Microscope,
  Operator,
  ProposedVisit,
  SchedulingResources,
  BusyIntervals,
  TimeFinderRequest,
} from './time-finder.types.js';

const { RRule } = rrulePkg;

const MIN = 60_000;

interface Readings {
  /** Local date as yyyymmdd. */
  date: Int32Array;
  minute: Int16Array;
  weekday: Int8Array;
}

interface NaiveCombo {
  loc: Location;
  op: Operator;
  chair: Chair;
  mic?: Microscope;
}

function hhmm(value: string): number {
  const [h, m] = value.split(':').map(Number);
  return h * 60 + m;
}

function dateNumOf(dt: DateTime): number {
  return dt.year * 10000 + dt.month * 100 + dt.day;
}

function dayIndexOfDateNum(n: number): number {
  return Date.UTC(Math.floor(n / 10000), (Math.floor(n / 100) % 100) - 1, n % 100) / 86_400_000;
}

/** The minute-mask world of one request. */
export class NaiveWorld {
  private readonly resources: SchedulingResources;
  private readonly request: TimeFinderRequest;
  /** First scanned minute (ms) and the number of minutes a visit may use / the chair masks cover. */
  readonly lo: number;
  readonly minutes: number;
  private readonly span: number;
  private readonly turnover: number;
  private readonly grid: number;
  private readonly readings = new Map<string, Readings>();
  private readonly openMask = new Map<string, Uint8Array>();
  private readonly workMask = new Map<string, Uint8Array>();
  private readonly opFreeMask = new Map<string, Uint8Array>();
  private readonly chairFreeMask = new Map<string, Uint8Array>();
  private readonly micFreeMask = new Map<string, Uint8Array>();
  private readonly ruleDateCache = new Map<string, Set<number>>();

  constructor(resources: SchedulingResources, busy: BusyIntervals, request: TimeFinderRequest) {
    this.resources = resources;
    this.request = request;
    this.turnover = request.turnoverMinutes ?? 10;
    this.grid = request.gridMinutes ?? 5;
    this.lo = Math.ceil(Math.max(request.from, request.now) / MIN) * MIN;
    this.minutes = Math.max(0, Math.floor((request.to - this.lo) / MIN));
    this.span = this.minutes + this.turnover;
    for (const loc of resources.locations) this.openMask.set(loc.id, this.buildOpen(loc));
    for (const op of resources.operators) {
      for (const loc of resources.locations) this.workMask.set(`${op.id}|${loc.id}`, this.buildWork(op, loc));
      this.opFreeMask.set(op.id, this.buildOperatorFree(op, busy.operators));
    }
    for (const chair of resources.chairs) this.chairFreeMask.set(chair.id, this.freeMask(busy.chairs, chair.id));
    for (const mic of resources.microscopes) this.micFreeMask.set(mic.id, this.freeMask(busy.microscopes, mic.id));
  }

  private zoneReadings(zone: string): Readings {
    let r = this.readings.get(zone);
    if (r === undefined) {
      r = { date: new Int32Array(this.span), minute: new Int16Array(this.span), weekday: new Int8Array(this.span) };
      for (let i = 0; i < this.span; i++) {
        const dt = DateTime.fromMillis(this.lo + i * MIN, { zone });
        r.date[i] = dateNumOf(dt);
        r.minute[i] = dt.hour * 60 + dt.minute;
        r.weekday[i] = dt.weekday;
      }
      this.readings.set(zone, r);
    }
    return r;
  }

  private zoneOf(locationId: string): string | undefined {
    return this.resources.locations.find((l) => l.id === locationId)?.timeZone;
  }

  /** Local dates (yyyymmdd) on which the rule occurs, anchored like the finder: DTSTART or the `from` date. */
  private ruleDates(rule: string, zone: string): Set<number> {
    const key = `${rule}|${zone}`;
    let set = this.ruleDateCache.get(key);
    if (set !== undefined) return set;
    set = new Set<number>();
    const parsed = RRule.parseString(rule.trim());
    const from = DateTime.fromMillis(this.request.from, { zone });
    const anchor = parsed.dtstart instanceof Date ? parsed.dtstart : new Date(Date.UTC(from.year, from.month - 1, from.day));
    const dtstart = new Date(Date.UTC(anchor.getUTCFullYear(), anchor.getUTCMonth(), anchor.getUTCDate()));
    const first = DateTime.fromMillis(Math.min(this.lo, this.request.from), { zone }).minus({ days: 3 });
    const last = DateTime.fromMillis(this.lo + this.span * MIN, { zone }).plus({ days: 3 });
    const r = new RRule({ ...parsed, dtstart, tzid: null, byhour: null, byminute: null, bysecond: null });
    for (const d of r.between(new Date(Date.UTC(first.year, first.month - 1, first.day)), new Date(Date.UTC(last.year, last.month - 1, last.day)), true)) {
      set.add(d.getUTCFullYear() * 10000 + (d.getUTCMonth() + 1) * 100 + d.getUTCDate());
    }
    this.ruleDateCache.set(key, set);
    return set;
  }

  private buildOpen(loc: Location): Uint8Array {
    const r = this.zoneReadings(loc.timeZone);
    const closed = new Set(loc.closures.map((c) => Number(c.date.replaceAll('-', ''))));
    const mask = new Uint8Array(this.span);
    for (let i = 0; i < this.span; i++) {
      if (closed.has(r.date[i])) continue;
      const ranges = loc.openingHours[r.weekday[i] as 1] ?? [];
      for (const range of ranges) {
        if (r.minute[i] >= hhmm(range.startLocal) && r.minute[i] < hhmm(range.endLocal)) mask[i] = 1;
      }
    }
    return mask;
  }

  private buildWork(op: Operator, loc: Location): Uint8Array {
    const r = this.zoneReadings(loc.timeZone);
    const mask = new Uint8Array(this.span);
    for (const rule of op.workingRules) {
      if (rule.locationId !== loc.id) continue;
      const dates = this.ruleDates(rule.rrule, loc.timeZone);
      const s = hhmm(rule.startLocal);
      const e = hhmm(rule.endLocal);
      for (let i = 0; i < this.span; i++) {
        const m = r.minute[i];
        if (!dates.has(r.date[i]) || m < s || m >= e) continue;
        if ((rule.breaks ?? []).some((b) => m >= hhmm(b.startLocal) && m < hhmm(b.endLocal))) continue;
        mask[i] = 1;
      }
    }
    return mask;
  }

  private markBusy(mask: Uint8Array, list: readonly Interval[] | undefined): void {
    for (const iv of list ?? []) {
      for (let i = Math.max(0, Math.floor((iv.start - this.lo) / MIN)); i < this.span && this.lo + i * MIN < iv.end; i++) {
        if (this.lo + (i + 1) * MIN > iv.start) mask[i] = 0;
      }
    }
  }

  private freeMask(map: BusyMap, id: string): Uint8Array {
    const mask = new Uint8Array(this.span).fill(1);
    this.markBusy(mask, map[id]);
    return mask;
  }

  /** Earliest instant whose local reading is at or after (date, minute), by stepping through minutes. */
  private firstInstantAtOrAfter(zone: string, dateNum: number, minute: number): number {
    const guess = DateTime.fromObject(
      { year: Math.floor(dateNum / 10000), month: Math.floor(dateNum / 100) % 100, day: dateNum % 100, hour: Math.floor(minute / 60) % 24, minute: minute % 60 },
      { zone },
    ).plus({ days: minute >= 1440 ? 1 : 0 });
    for (let t = guess.toMillis() - 3 * 60 * MIN; ; t += MIN) {
      const dt = DateTime.fromMillis(t, { zone });
      const dn = dateNumOf(dt);
      if (dn > dateNum || (dn === dateNum && dt.hour * 60 + dt.minute >= minute)) return t;
    }
  }

  private holdOpensAt(hold: Hold, zone: string, dateNum: number): number {
    const start = this.firstInstantAtOrAfter(zone, dateNum, hhmm(hold.startLocal));
    if (hold.opensHoursBefore !== undefined) return start - hold.opensHoursBefore * 60 * MIN;
    const prev = DateTime.fromObject(
      { year: Math.floor(dateNum / 10000), month: Math.floor(dateNum / 100) % 100, day: dateNum % 100 },
      { zone: 'UTC' },
    ).minus({ days: 1 });
    return this.firstInstantAtOrAfter(zone, dateNumOf(prev), hhmm(hold.opensEveningBeforeAt ?? '18:00'));
  }

  private buildOperatorFree(op: Operator, busy: BusyMap): Uint8Array {
    const mask = new Uint8Array(this.span).fill(1);
    this.markBusy(mask, busy[op.id]);
    this.markBusy(mask, op.timeOff);
    for (const hold of this.resources.holds) {
      if (hold.operatorId !== op.id) continue;
      const zone = this.zoneOf(hold.locationId);
      if (zone === undefined) continue;
      const r = this.zoneReadings(zone);
      const dates = this.ruleDates(hold.rrule, zone);
      const s = hhmm(hold.startLocal);
      const e = hhmm(hold.endLocal);
      const opens = new Map<number, number>();
      for (let i = 0; i < this.span; i++) {
        if (!dates.has(r.date[i]) || r.minute[i] < s || r.minute[i] >= e) continue;
        let at = opens.get(r.date[i]);
        if (at === undefined) opens.set(r.date[i], (at = this.holdOpensAt(hold, zone, r.date[i])));
        if (!(this.request.urgent ?? false) && this.request.now < at) mask[i] = 0;
      }
    }
    return mask;
  }

  private combos(needsMicroscope: boolean, locationId?: string, operatorId?: string): NaiveCombo[] {
    const out: NaiveCombo[] = [];
    for (const loc of this.resources.locations) {
      if (locationId !== undefined && loc.id !== locationId) continue;
      for (const op of this.resources.operators) {
        if (operatorId !== undefined && op.id !== operatorId) continue;
        for (const chair of this.resources.chairs) {
          if (chair.locationId !== loc.id) continue;
          if (!needsMicroscope) {
            out.push({ loc, op, chair });
            continue;
          }
          for (const mic of this.resources.microscopes) {
            if (mic.locationId !== loc.id) continue;
            const fits = mic.mobile || mic.id === chair.fixedMicroscopeId || mic.chairId === chair.id;
            if (fits) out.push({ loc, op, chair, mic });
          }
        }
      }
    }
    return out;
  }

  /** Whether a visit of `minutes` may start at minute index i with this combo (turnover included). */
  feasible(i: number, minutes: number, c: NaiveCombo): boolean {
    if (i < 0 || i + minutes > this.minutes) return false;
    const r = this.zoneReadings(c.loc.timeZone);
    if (r.minute[i] % this.grid !== 0) return false;
    const open = this.openMask.get(c.loc.id)!;
    const work = this.workMask.get(`${c.op.id}|${c.loc.id}`)!;
    const opFree = this.opFreeMask.get(c.op.id)!;
    const chairFree = this.chairFreeMask.get(c.chair.id)!;
    const micFree = c.mic === undefined ? undefined : this.micFreeMask.get(c.mic.id)!;
    for (let j = i; j < i + minutes; j++) {
      if (!open[j] || !work[j] || !opFree[j] || !chairFree[j]) return false;
      if (micFree !== undefined && !micFree[j]) return false;
    }
    for (let j = i + minutes; j < i + minutes + this.turnover; j++) if (!chairFree[j]) return false;
    return true;
  }

  private toVisit(i: number, minutes: number, c: NaiveCombo): ProposedVisit {
    const v: ProposedVisit = { start: this.lo + i * MIN, end: this.lo + (i + minutes) * MIN, chairId: c.chair.id, operatorId: c.op.id };
    if (c.mic !== undefined) v.microscopeId = c.mic.id;
    return v;
  }

  /** The series with the earliest feasible first visit (later visits searched exhaustively), or null. */
  earliestSeries(): ProposedVisit[] | null {
    const visits = this.request.plan.visits;
    const first = this.combos(visits[0].needsMicroscope, this.request.locationId, this.request.operatorId);
    for (let i = 0; i < this.minutes; i++) {
      for (const c of first) {
        if (!this.feasible(i, visits[0].minutes, c)) continue;
        const rest = this.follow([{ i, c }], 1);
        if (rest !== null) return rest.map((p, k) => this.toVisit(p.i, visits[k].minutes, p.c));
      }
    }
    return null;
  }

  private follow(placed: { i: number; c: NaiveCombo }[], k: number): { i: number; c: NaiveCombo }[] | null {
    const visits = this.request.plan.visits;
    if (k === visits.length) return placed;
    const prev = placed[k - 1];
    const r = this.zoneReadings(prev.c.loc.timeZone);
    const prevDay = dayIndexOfDateNum(r.date[prev.i]);
    const v = visits[k];
    const lowDays = v.earliestDaysAfterPrevious ?? 0;
    const highDays = v.latestDaysAfterPrevious ?? Infinity;
    const sameOp = this.request.sameOperator ?? true;
    const combos = this.combos(v.needsMicroscope, prev.c.loc.id, sameOp ? placed[0].c.op.id : this.request.operatorId);
    const prevEnd = prev.i + visits[k - 1].minutes;
    for (let i = prevEnd; i < this.minutes; i++) {
      const days = dayIndexOfDateNum(r.date[i]) - prevDay;
      if (days > highDays) break;
      if (days < lowDays) continue;
      for (const c of combos) {
        const chairClash = placed.some((p, n) => p.c.chair.id === c.chair.id && i < p.i + visits[n].minutes + this.turnover);
        if (chairClash || !this.feasible(i, v.minutes, c)) continue;
        const rest = this.follow([...placed, { i, c }], k + 1);
        if (rest !== null) return rest;
      }
    }
    return null;
  }

  /** Everything wrong with a proposed visit, minute by minute (empty when it is bookable). */
  violations(visit: ProposedVisit, minutes: number, needsMicroscope: boolean): string[] {
    const out: string[] = [];
    const chair = this.resources.chairs.find((c) => c.id === visit.chairId);
    const op = this.resources.operators.find((o) => o.id === visit.operatorId);
    const loc = this.resources.locations.find((l) => l.id === chair?.locationId);
    const mic = this.resources.microscopes.find((m) => m.id === visit.microscopeId);
    if (chair === undefined || op === undefined || loc === undefined) return ['unknown chair, operator or location'];
    if (visit.end - visit.start !== minutes * MIN) out.push('wrong length');
    if (needsMicroscope && mic === undefined) out.push('no microscope assigned');
    if (mic !== undefined && (mic.locationId !== loc.id || !(mic.mobile || mic.id === chair.fixedMicroscopeId || mic.chairId === chair.id))) {
      out.push('microscope cannot serve this chair');
    }
    const i = (visit.start - this.lo) / MIN;
    if (!Number.isInteger(i) || i < 0 || i + minutes > this.minutes) return [...out, 'outside the horizon or off the minute grid'];
    if (this.zoneReadings(loc.timeZone).minute[i] % this.grid !== 0) out.push('start off the local grid');
    const checks: [string, Uint8Array | undefined, number][] = [
      ['outside opening hours', this.openMask.get(loc.id), minutes],
      ['outside the operator working hours', this.workMask.get(`${op.id}|${loc.id}`), minutes],
      ['operator busy, off or held', this.opFreeMask.get(op.id), minutes],
      ['chair busy (turnover included)', this.chairFreeMask.get(chair.id), minutes + this.turnover],
    ];
    if (mic !== undefined) checks.push(['microscope busy', this.micFreeMask.get(mic.id), minutes]);
    for (const [text, mask, length] of checks) {
      for (let j = i; j < i + length; j++) {
        if (mask === undefined || !mask[j]) {
          out.push(text);
          break;
        }
      }
    }
    return out;
  }
}

/** Earliest feasible series by a minute-by-minute scan (the reference the fast finder must match). */
export function naiveEarliestSeries(resources: SchedulingResources, busy: BusyIntervals, request: TimeFinderRequest): ProposedVisit[] | null {
  return new NaiveWorld(resources, busy, request).earliestSeries();
}
