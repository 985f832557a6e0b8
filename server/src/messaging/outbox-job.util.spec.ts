import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { forEachLimited, retryDelayMs } from './outbox-job.util.js';

describe('retryDelayMs', () => {
  it('doubles from the base, jitters ±25 % and never passes the maximum', () => {
    expect(retryDelayMs(1, 2_000, 20_000, () => 0.5)).toBe(2_000);
    expect(retryDelayMs(2, 2_000, 20_000, () => 0.5)).toBe(4_000);
    expect(retryDelayMs(4, 2_000, 20_000, () => 0.5)).toBe(16_000);
    expect(retryDelayMs(5, 2_000, 20_000, () => 0.5)).toBe(20_000);
    expect(retryDelayMs(1, 2_000, 20_000, () => 0)).toBe(1_500);
    expect(retryDelayMs(1, 2_000, 20_000, () => 0.999_999)).toBe(2_500);
    expect(retryDelayMs(30, 2_000, 20_000, () => 0.999_999)).toBe(20_000);
  });

  it('stays within [0.75, 1.25] × min(max, base·2^(n−1)) and at most max for any input', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 60 }), fc.integer({ min: 1, max: 100_000 }), fc.integer({ min: 1, max: 10_000_000 }), fc.double({ min: 0, max: 0.999_999, noNaN: true }), (n, base, max, r) => {
        const d = retryDelayMs(n, base, max, () => r);
        const exp = Math.min(max, base * 2 ** (n - 1));
        expect(d).toBeLessThanOrEqual(max);
        expect(d).toBeGreaterThanOrEqual(Math.floor(exp * 0.75));
        expect(d).toBeLessThanOrEqual(Math.ceil(exp * 1.25));
      }),
    );
  });
});

describe('forEachLimited', () => {
  const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

  it('never runs more than the limit at once, and a failing or slow item holds up no other', async () => {
    let active = 0;
    let peak = 0;
    const done: number[] = [];
    const errors: number[] = [];
    await forEachLimited(
      Array.from({ length: 20 }, (_, i) => i),
      4,
      async (i) => {
        active++;
        peak = Math.max(peak, active);
        try {
          if (i === 0) await sleep(100); // the slow one
          else await sleep(2);
          if (i === 3) throw new Error('boom');
          done.push(i);
        } finally {
          active--;
        }
      },
      (i) => errors.push(i),
    );
    expect(peak).toBe(4);
    expect(errors).toEqual([3]);
    expect(done).toHaveLength(19);
    // Everything else finished while the slow item was still waiting.
    expect(done[done.length - 1]).toBe(0);
  });

  it('does nothing for no items', async () => {
    let calls = 0;
    await forEachLimited([], 8, async () => void calls++, () => undefined);
    expect(calls).toBe(0);
  });
});
