// Interval arithmetic checked against a unit-cell bitmap model (each integer cell is in or out).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  complementIntervals,
  findContaining,
  firstIndexEndingAfter,
  intersectIntervals,
  normalizeIntervals,
  overlapsAny,
  shrinkEnds,
  subtractIntervals,
  unionIntervals,
} from './interval.util.js';
import type { Interval } from './time-finder.types.js';

const N = 60;
const rawList = fc.array(
  fc.tuple(fc.integer({ min: 0, max: N }), fc.integer({ min: 0, max: 12 })).map(([s, l]) => ({ start: s, end: Math.min(N, s + l) })),
  { maxLength: 8 },
);

function cells(list: readonly Interval[]): boolean[] {
  const out = new Array<boolean>(N).fill(false);
  for (const iv of list) for (let i = iv.start; i < iv.end; i++) out[i] = true;
  return out;
}

function isNormalized(list: readonly Interval[]): boolean {
  return list.every((iv, i) => iv.start < iv.end && (i === 0 || list[i - 1].end < iv.start));
}

describe('interval lists (property, 300 runs each)', () => {
  it('normalize keeps the covered cells and leaves sorted, disjoint, non-touching intervals', () => {
    fc.assert(
      fc.property(rawList, (raw) => {
        const n = normalizeIntervals(raw);
        expect(isNormalized(n)).toBe(true);
        expect(cells(n)).toEqual(cells(raw));
      }),
      { numRuns: 300 },
    );
  });

  it('union, intersection, difference and complement match the cell model', () => {
    fc.assert(
      fc.property(rawList, rawList, (ra, rb) => {
        const a = normalizeIntervals(ra);
        const b = normalizeIntervals(rb);
        const ca = cells(a);
        const cb = cells(b);
        const u = unionIntervals(a, b);
        const x = intersectIntervals(a, b);
        const d = subtractIntervals(a, b);
        const c = complementIntervals(a, 0, N);
        for (const list of [u, d, c]) expect(isNormalized(list)).toBe(true);
        expect(cells(u)).toEqual(ca.map((v, i) => v || cb[i]));
        expect(cells(x)).toEqual(ca.map((v, i) => v && cb[i]));
        expect(cells(d)).toEqual(ca.map((v, i) => v && !cb[i]));
        expect(cells(c)).toEqual(ca.map((v) => !v));
      }),
      { numRuns: 300 },
    );
  });

  it('lookup helpers agree with a linear search', () => {
    fc.assert(
      fc.property(rawList, fc.integer({ min: 0, max: N }), fc.integer({ min: 1, max: 10 }), (raw, t, len) => {
        const a = normalizeIntervals(raw);
        const i = firstIndexEndingAfter(a, t);
        expect(i).toBe(a.findIndex((iv) => iv.end > t) === -1 ? a.length : a.findIndex((iv) => iv.end > t));
        expect(overlapsAny(a, t, t + len)).toBe(a.some((iv) => iv.start < t + len && t < iv.end));
        expect(findContaining(a, t, t + len)).toEqual(a.find((iv) => iv.start <= t && iv.end >= t + len));
      }),
      { numRuns: 300 },
    );
  });

  it('shrinkEnds moves ends earlier and drops what no longer has room', () => {
    expect(shrinkEnds([{ start: 0, end: 10 }, { start: 20, end: 25 }], 5)).toEqual([{ start: 0, end: 5 }]);
  });
});
