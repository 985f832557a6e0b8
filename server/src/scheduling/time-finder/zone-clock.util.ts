// Wall-clock ↔ instant conversion for one IANA zone over a bounded span, from the tz database through
// luxon's IANAZone. The span is cut into segments of constant UTC offset, so a wall-clock reading maps to
// instants exactly: a reading in a skipped hour has no instant, a repeated hour has two.
import { IANAZone } from 'luxon';
import type { Interval } from './time-finder.types.js';

export const MINUTE_MS = 60_000;
export const HOUR_MS = 3_600_000;
export const DAY_MS = 86_400_000;

/** Instants [from, to) share offsetMs (local reading = instant + offsetMs). */
export interface ZoneSegment {
  from: number;
  to: number;
  offsetMs: number;
}

/** Floating local day number: days since 1970-01-01 of the local calendar date. */
export type LocalDay = number;

/** Parses 'HH:mm' (00:00–24:00) into minutes after local midnight. */
export function parseLocalTime(value: string): number {
  const match = /^(\d{2}):(\d{2})$/.exec(value);
  if (match === null) throw new RangeError(`local time must be HH:mm, got '${value}'`);
  const minutes = Number(match[1]) * 60 + Number(match[2]);
  if (Number(match[2]) > 59 || minutes > 1440) throw new RangeError(`local time out of range: '${value}'`);
  return minutes;
}

/** Parses 'YYYY-MM-DD' into a local day number. */
export function parseLocalDate(value: string): LocalDay {
  const match = /^(\d{4})-(\d{2})-(\d{2})$/.exec(value);
  if (match === null) throw new RangeError(`local date must be YYYY-MM-DD, got '${value}'`);
  return Date.UTC(Number(match[1]), Number(match[2]) - 1, Number(match[3])) / DAY_MS;
}

/** 'YYYY-MM-DD' of a local day number. */
export function formatLocalDate(day: LocalDay): string {
  return new Date(day * DAY_MS).toISOString().slice(0, 10);
}

/** ISO weekday (1 = Monday) of a local day number; day 0 (1970-01-01) was a Thursday. */
export function weekdayOfDay(day: LocalDay): number {
  return ((((day + 3) % 7) + 7) % 7) + 1;
}

export class ZoneClock {
  readonly timeZone: string;
  readonly segments: readonly ZoneSegment[];

  constructor(timeZone: string, segments: readonly ZoneSegment[]) {
    this.timeZone = timeZone;
    this.segments = segments;
  }

  private segmentIndex(t: number): number {
    const segs = this.segments;
    for (let i = 0; i < segs.length; i++) if (t < segs[i].to) return i;
    return segs.length - 1;
  }

  offsetMs(t: number): number {
    return this.segments[this.segmentIndex(t)].offsetMs;
  }

  /** Local reading of t as floating ms (the UTC fields of the result are the wall clock). */
  local(t: number): number {
    return t + this.offsetMs(t);
  }

  day(t: number): LocalDay {
    return Math.floor(this.local(t) / DAY_MS);
  }

  minuteOfDay(t: number): number {
    const local = this.local(t);
    return Math.floor((local - Math.floor(local / DAY_MS) * DAY_MS) / MINUTE_MS);
  }

  /** Half-day bucket: day*2 (+1 from 12:00 local). */
  bucket(t: number): number {
    const local = this.local(t);
    const day = Math.floor(local / DAY_MS);
    return day * 2 + (local - day * DAY_MS >= 12 * HOUR_MS ? 1 : 0);
  }

  /** Instants whose reading on `day` lies in [startMin, endMin) minutes after midnight. */
  readingRange(day: LocalDay, startMin: number, endMin: number): Interval[] {
    const ls = day * DAY_MS + startMin * MINUTE_MS;
    const le = day * DAY_MS + endMin * MINUTE_MS;
    const out: Interval[] = [];
    for (const seg of this.segments) {
      const start = Math.max(ls - seg.offsetMs, seg.from);
      const end = Math.min(le - seg.offsetMs, seg.to);
      if (start >= end) continue;
      const last = out[out.length - 1];
      if (last !== undefined && start <= last.end) last.end = Math.max(last.end, end);
      else out.push({ start, end });
    }
    return out;
  }

  /** Earliest instant whose reading is at or after the floating local ms value. */
  firstInstantAtOrAfter(localMs: number): number {
    let best = Infinity;
    for (const seg of this.segments) {
      const t = Math.max(localMs - seg.offsetMs, seg.from);
      if (t < seg.to && t < best) best = t;
    }
    return best;
  }

  /** Start of the next half-day bucket after t (always later than t). */
  nextBucketStart(t: number): number {
    const local = this.local(t);
    const day = Math.floor(local / DAY_MS);
    const boundary = local - day * DAY_MS >= 12 * HOUR_MS ? (day + 1) * DAY_MS : day * DAY_MS + 12 * HOUR_MS;
    let best = Infinity;
    for (const seg of this.segments) {
      const c = Math.max(boundary - seg.offsetMs, seg.from, t + 1);
      if (c < seg.to && c < best) best = c;
    }
    return best;
  }

  /** Smallest instant ≥ t whose reading is a multiple of gridMinutes after local midnight. */
  nextGridStart(t: number, gridMinutes: number): number {
    const gridMs = gridMinutes * MINUTE_MS;
    const segs = this.segments;
    let cursor = t;
    for (let i = this.segmentIndex(t); i < segs.length; i++) {
      const seg = segs[i];
      if (cursor < seg.from) cursor = seg.from;
      const local = cursor + seg.offsetMs;
      const dayStart = Math.floor(local / DAY_MS) * DAY_MS;
      const rounded = Math.ceil((local - dayStart) / gridMs) * gridMs;
      const candidate = (rounded >= DAY_MS ? dayStart + DAY_MS : dayStart + rounded) - seg.offsetMs;
      if (candidate < seg.to) return candidate;
    }
    return Infinity;
  }
}

const clockCache = new Map<string, ZoneClock>();
const CLOCK_CACHE_LIMIT = 64;
// Offsets are sampled this often; zones never change offset twice within it.
const SAMPLE_MS = DAY_MS;
// Clocks cover 30-day-aligned blocks so repeated searches over similar horizons reuse them.
const BLOCK_MS = 30 * DAY_MS;

function buildSegments(zone: IANAZone, lo: number, hi: number): ZoneSegment[] {
  const offsetAt = (t: number): number => zone.offset(t) * MINUTE_MS;
  const transitions: { at: number; offsetMs: number }[] = [];
  let prevT = lo;
  let prevOffset = offsetAt(lo);
  const firstOffset = prevOffset;
  for (let t = lo + SAMPLE_MS; ; t += SAMPLE_MS) {
    const sampleT = Math.min(t, hi);
    const offset = offsetAt(sampleT);
    if (offset !== prevOffset) {
      // Binary search the first whole minute carrying the new offset (tzdb transitions fall on minutes).
      let a = Math.floor(prevT / MINUTE_MS);
      let b = Math.ceil(sampleT / MINUTE_MS);
      while (b - a > 1) {
        const mid = Math.floor((a + b) / 2);
        if (offsetAt(mid * MINUTE_MS) === prevOffset) a = mid;
        else b = mid;
      }
      transitions.push({ at: b * MINUTE_MS, offsetMs: offset });
      prevOffset = offset;
    }
    prevT = sampleT;
    if (sampleT >= hi) break;
  }
  const segments: ZoneSegment[] = [];
  let from = -Infinity;
  let offsetMs = firstOffset;
  for (const tr of transitions) {
    segments.push({ from, to: tr.at, offsetMs });
    from = tr.at;
    offsetMs = tr.offsetMs;
  }
  segments.push({ from, to: Infinity, offsetMs });
  return segments;
}

/** A clock for timeZone valid at least over [lo, hi] (beyond it the outermost offsets are assumed). */
export function zoneClock(timeZone: string, lo: number, hi: number): ZoneClock {
  const blockLo = Math.floor(lo / BLOCK_MS) * BLOCK_MS - 2 * DAY_MS;
  const blockHi = Math.ceil(hi / BLOCK_MS) * BLOCK_MS + 2 * DAY_MS;
  const key = `${timeZone}|${blockLo}|${blockHi}`;
  const cached = clockCache.get(key);
  if (cached !== undefined) return cached;
  if (!IANAZone.isValidZone(timeZone)) throw new RangeError(`unknown IANA time zone '${timeZone}'`);
  const clock = new ZoneClock(timeZone, buildSegments(IANAZone.create(timeZone), blockLo, blockHi));
  if (clockCache.size >= CLOCK_CACHE_LIMIT) clockCache.delete(clockCache.keys().next().value as string);
  clockCache.set(key, clock);
  return clock;
}

export function clearZoneClockCache(): void {
  clockCache.clear();
}
