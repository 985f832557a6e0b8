import { describe, expect, it } from 'vitest';
import { clockTime, percent, percentNumber, rangeLabel, sharesToTenths, shownChange, signedNumber, weeks } from './report-format.util';

describe('report formatting', () => {
  it('shows every percentage with one decimal, and "no open time" instead of a share of nothing', () => {
    expect([percent(2 / 3), percent(0.5), percent(1), percent(0)]).toEqual(['66.7 %', '50.0 %', '100.0 %', '0.0 %']);
    expect(percentNumber(0.0005)).toBe('0.1');
    expect(percent(null)).toBe('no open time');
    expect(percentNumber(null, '—')).toBe('—');
  });

  it('keeps shares adding to the whole after rounding (largest remainder)', () => {
    // Thirds one by one: 33.3 × 3 = 99.9; the largest remainder gives the missing tenth to the first.
    expect(sharesToTenths([1 / 3, 1 / 3, 1 / 3])).toEqual(['33.4', '33.3', '33.3']);
    // 428.57 + 285.71 + 142.86 + 142.86 tenths: floors make 997; the three largest remainders (.86, .86, .71) get one each.
    expect(sharesToTenths([3 / 7, 2 / 7, 1 / 7, 1 / 7])).toEqual(['42.8', '28.6', '14.3', '14.3']);
    expect(sharesToTenths([0.875, 0.075, 0.05])).toEqual(['87.5', '7.5', '5.0']);
    expect(sharesToTenths([0.6, null, 0.4])).toEqual(['60.0', null, '40.0']);
    expect(sharesToTenths([])).toEqual([]);
    for (const parts of [[1, 1, 1, 1, 1, 1, 1], [5, 3, 3], [97, 2, 1], [1, 2, 3, 4, 5, 6]]) {
      const total = parts.reduce((a, b) => a + b, 0);
      const shown = sharesToTenths(parts.map((p) => p / total));
      expect(shown.reduce((s, v) => s + Math.round(Number(v) * 10), 0), parts.join('/')).toBe(1000);
    }
  });

  it('signs changes with a true minus', () => {
    expect([signedNumber(1.25), signedNumber(-0.264), signedNumber(0.01), signedNumber(null)]).toEqual(['+1.3', '−0.3', '0.0', '—']);
  });

  it('gives the change of the figures as shown, so the eye’s subtraction agrees', () => {
    // 0.26 → 0.23 shows as 0.3 → 0.2: "−0.1", where the unrounded −0.03 would show as a puzzling "0.0".
    expect(shownChange(0.26, 0.23)).toBe('−0.1');
    expect(shownChange(0.925, 1110 / 1680)).toBe('−0.2');
    expect(shownChange(1.2, 1.2)).toBe('0.0');
    expect(shownChange(null, 0.5)).toBe('—');
    expect(shownChange(0.73, 0.66, '—', 2)).toBe('−0.07');
    expect(shownChange(0.5, 0.5, '—', 2)).toBe('0.00');
  });

  it('says week or weeks', () => {
    expect([weeks(1), weeks(0.925), weeks(null), weeks(1.004, '—', 2), weeks(0.925, '—', 2)]).toEqual(['1.0 week', '0.9 weeks', 'no open time', '1.00 week', '0.93 weeks']);
  });

  it('names ranges with the year once when both ends share it', () => {
    expect(rangeLabel('2026-10-05', '2026-11-29')).toBe('Oct 5 – Nov 29, 2026');
    expect(rangeLabel('2025-12-01', '2026-01-25')).toBe('Dec 1, 2025 – Jan 25, 2026');
  });

  it('shows an instant on the location’s wall clock and a wall-clock time as it is', () => {
    // Oct 29, 2026 is daylight time in New York (UTC−4); Nov 2 is standard time (UTC−5). From memory: DST ends Nov 1, 2026.
    expect(clockTime('2026-10-29T21:25:00.000Z', 'America/New_York')).toBe('17:25');
    expect(clockTime('2026-11-02T21:25:00.000Z', 'America/New_York')).toBe('16:25');
    expect(clockTime('17:00', 'America/New_York')).toBe('17:00');
    expect(clockTime('17:00:00', 'America/New_York')).toBe('17:00');
  });
});
