// Sorted interval-list arithmetic. Lists are half-open [start, end), sorted by start, disjoint and
// non-touching once normalized; every operation is a linear sweep over its inputs.
import type { Interval } from './time-finder.types.js';

/** Sorts (only when needed), drops empty intervals and merges overlapping or touching ones. */
export function normalizeIntervals(list: readonly Interval[]): Interval[] {
  let sorted = true;
  for (let i = 1; i < list.length; i++) {
    if (list[i].start < list[i - 1].start) {
      sorted = false;
      break;
    }
  }
  const source = sorted ? list : [...list].sort((a, b) => a.start - b.start);
  const out: Interval[] = [];
  for (const iv of source) {
    if (!(iv.end > iv.start)) continue;
    const last = out[out.length - 1];
    if (last !== undefined && iv.start <= last.end) {
      if (iv.end > last.end) last.end = iv.end;
    } else {
      out.push({ start: iv.start, end: iv.end });
    }
  }
  return out;
}

/** a ∪ b for normalized lists. */
export function unionIntervals(a: readonly Interval[], b: readonly Interval[]): Interval[] {
  const out: Interval[] = [];
  let i = 0;
  let j = 0;
  while (i < a.length || j < b.length) {
    const next = j >= b.length || (i < a.length && a[i].start <= b[j].start) ? a[i++] : b[j++];
    const last = out[out.length - 1];
    if (last !== undefined && next.start <= last.end) {
      if (next.end > last.end) last.end = next.end;
    } else {
      out.push({ start: next.start, end: next.end });
    }
  }
  return out;
}

/** a ∩ b for normalized lists. */
export function intersectIntervals(a: readonly Interval[], b: readonly Interval[]): Interval[] {
  const out: Interval[] = [];
  let i = 0;
  let j = 0;
  while (i < a.length && j < b.length) {
    const x = a[i];
    const y = b[j];
    const start = x.start > y.start ? x.start : y.start;
    const end = x.end < y.end ? x.end : y.end;
    if (start < end) out.push({ start, end });
    if (x.end < y.end) i++;
    else j++;
  }
  return out;
}

/** a − b for normalized lists. */
export function subtractIntervals(a: readonly Interval[], b: readonly Interval[]): Interval[] {
  const out: Interval[] = [];
  let j = 0;
  for (const x of a) {
    let cursor = x.start;
    while (j < b.length && b[j].end <= cursor) j++;
    let k = j;
    while (k < b.length && b[k].start < x.end) {
      if (b[k].start > cursor) out.push({ start: cursor, end: b[k].start });
      if (b[k].end > cursor) cursor = b[k].end;
      if (cursor >= x.end) break;
      k++;
    }
    if (cursor < x.end) out.push({ start: cursor, end: x.end });
  }
  return out;
}

/** [lo, hi) − list for a normalized list. */
export function complementIntervals(list: readonly Interval[], lo: number, hi: number): Interval[] {
  return subtractIntervals(lo < hi ? [{ start: lo, end: hi }] : [], list);
}

/** list ∩ [lo, hi). */
export function clipIntervals(list: readonly Interval[], lo: number, hi: number): Interval[] {
  return intersectIntervals(list, lo < hi ? [{ start: lo, end: hi }] : []);
}

/** Moves every end earlier by ms and drops what becomes empty (a visit needs ms after it). */
export function shrinkEnds(list: readonly Interval[], ms: number): Interval[] {
  if (ms === 0) return list.map((iv) => ({ start: iv.start, end: iv.end }));
  const out: Interval[] = [];
  for (const iv of list) if (iv.end - ms > iv.start) out.push({ start: iv.start, end: iv.end - ms });
  return out;
}

/** Index of the first interval whose end is after t (list.length when none). */
export function firstIndexEndingAfter(list: readonly Interval[], t: number): number {
  let lo = 0;
  let hi = list.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (list[mid].end > t) hi = mid;
    else lo = mid + 1;
  }
  return lo;
}

/** The interval of a normalized list that contains [start, end), if any. */
export function findContaining(list: readonly Interval[], start: number, end: number): Interval | undefined {
  const i = firstIndexEndingAfter(list, start);
  const iv = list[i];
  return iv !== undefined && iv.start <= start && iv.end >= end ? iv : undefined;
}

/** Whether [start, end) overlaps any interval of a normalized list. */
export function overlapsAny(list: readonly Interval[], start: number, end: number): boolean {
  const iv = list[firstIndexEndingAfter(list, start)];
  return iv !== undefined && iv.start < end;
}

/** Total covered length in ms. */
export function totalLength(list: readonly Interval[]): number {
  let sum = 0;
  for (const iv of list) sum += iv.end - iv.start;
  return sum;
}
