import { describe, expect, it } from 'vitest';
import { lastFullWeeks, rangePresets, readFilters } from './report-range.util';

const NY = 'America/New_York';

describe('report ranges', () => {
  it('defaults to the last 8 full weeks, Monday to Sunday, before this week on the location’s clock', () => {
    // Wednesday Dec 2, 2026 → Mon Oct 5 … Sun Nov 29 (ISO 8601 weeks start on Monday).
    expect(lastFullWeeks(new Date('2026-12-02T15:00:00Z'), NY)).toEqual({ from: '2026-10-05', to: '2026-11-29' });
    // 05:30Z on Monday Nov 30 is 00:30 Monday in New York: the current week has begun.
    expect(lastFullWeeks(new Date('2026-11-30T05:30:00Z'), NY)).toEqual({ from: '2026-10-05', to: '2026-11-29' });
    // Sunday 23:30 in New York is already Monday in UTC; the week is not over yet on the location's clock.
    expect(lastFullWeeks(new Date('2026-11-30T04:30:00Z'), NY)).toEqual({ from: '2026-09-28', to: '2026-11-22' });
  });

  it('offers quick ranges that end on whole weeks or months', () => {
    const presets = rangePresets(new Date('2026-12-02T15:00:00Z'), NY);
    expect(presets.map((p) => [p.label, ...p.value])).toEqual([
      ['Last 4 full weeks', '2026-11-02', '2026-11-29'],
      ['Last 8 full weeks', '2026-10-05', '2026-11-29'],
      ['Last 13 full weeks', '2026-08-31', '2026-11-29'],
      ['Last month', '2026-11-01', '2026-11-30'],
      ['This month so far', '2026-12-01', '2026-12-02'],
    ]);
  });

  it('reads the filters from the address and falls back to the default range on nonsense', () => {
    const fallback = { from: '2026-10-05', to: '2026-11-29' };
    expect(readFilters(new URLSearchParams('from=2026-01-05&to=2026-02-01&locationId=2&chairId=7&operatorId=5'), fallback)).toEqual({ from: '2026-01-05', to: '2026-02-01', locationId: 2, chairId: 7, operatorId: 5 });
    expect(readFilters(new URLSearchParams(''), fallback)).toEqual(fallback);
    expect(readFilters(new URLSearchParams('from=2026-02-30&to=2026-03-01'), fallback)).toEqual(fallback);
    expect(readFilters(new URLSearchParams('from=2026-03-01&to=2026-02-01'), fallback)).toEqual(fallback);
    expect(readFilters(new URLSearchParams('from=2026-01-05&to=2026-02-01&chairId=abc&locationId=-1'), fallback)).toEqual({ from: '2026-01-05', to: '2026-02-01' });
  });
});
