import { describe, expect, it } from 'vitest';
import { dateIn, daysBefore, daysBetween, todayIn } from './referral-dates.util.js';

describe('referral dates', () => {
  it('reads "today" on the location’s wall calendar, not UTC’s', () => {
    // 03:30 UTC on 2 December is still 1 December in New York (UTC−5 in winter).
    const instant = new Date('2026-12-02T03:30:00Z');
    expect(todayIn('America/New_York', instant)).toBe('2026-12-01');
    expect(todayIn('UTC', instant)).toBe('2026-12-02');
    expect(dateIn(instant, 'Asia/Tokyo')).toBe('2026-12-02');
  });

  it('counts whole calendar days across a daylight-saving change', () => {
    // IANA tz database via luxon (references.md): New York moves 2026-03-08 02:00 → 03:00.
    expect(daysBetween('2026-03-07', '2026-03-09')).toBe(2);
    expect(daysBetween('2026-10-31', '2026-11-02')).toBe(2);
    expect(daysBetween('2026-12-01', '2026-12-01')).toBe(0);
    expect(daysBetween('2026-12-05', '2026-12-01')).toBe(0);
    expect(daysBetween('2025-12-31', '2026-12-31')).toBe(365);
  });

  it('counts back over month and leap-year ends', () => {
    expect(daysBefore('2026-03-01', 1)).toBe('2026-02-28');
    expect(daysBefore('2028-03-01', 1)).toBe('2028-02-29');
    expect(daysBefore('2026-01-05', 20)).toBe('2025-12-16');
  });
});
