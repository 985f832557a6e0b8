// Nearest-rank percentiles (report-constants PERCENTILE_METHOD). Method as commonly defined (rank ⌈P/100·N⌉;
// from memory, no source in references.md).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { median, nearestRank } from './percentile.util.js';

describe('nearestRank', () => {
  it('worked examples', () => {
    // 10 values: P90 → rank 9, median → rank 5 (the lower middle of an even list).
    const v = [15, 20, 35, 40, 50, 3, 7, 8, 9, 12];
    expect(nearestRank(v, 90)).toBe(40);
    expect(median(v)).toBe(12); // sorted: 3 7 8 9 12 15 20 35 40 50
    // 5 values: P30 → rank ⌈1.5⌉ = 2; P100 → the largest; P0 → the smallest.
    expect(nearestRank([15, 20, 35, 40, 50], 30)).toBe(20);
    expect(nearestRank([15, 20, 35, 40, 50], 100)).toBe(50);
    expect(nearestRank([15, 20, 35, 40, 50], 0)).toBe(15);
    expect(nearestRank([], 50)).toBeNull();
    // 30 values: 90 % of 30 = 27 exactly (no floating-point ⌈27.000…04⌉ = 28).
    expect(nearestRank(Array.from({ length: 30 }, (_, i) => i + 1), 90)).toBe(27);
  });

  it('is always one of the values and grows with p', () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: -1000, max: 1000 }), { minLength: 1, maxLength: 60 }), fc.integer({ min: 0, max: 100 }), fc.integer({ min: 0, max: 100 }), (xs, p, q) => {
        const a = nearestRank(xs, Math.min(p, q))!;
        const b = nearestRank(xs, Math.max(p, q))!;
        expect(xs).toContain(a);
        expect(a).toBeLessThanOrEqual(b);
        // At least p % of the values are at or below it.
        expect(xs.filter((x) => x <= b).length * 100).toBeGreaterThanOrEqual(Math.max(p, q) * xs.length);
      }),
    );
  });
});
