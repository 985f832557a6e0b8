// The backlog forecast worked by hand, and its what-if.
import { DEFAULT_ESTIMATE_TABLE } from '@ostium/shared';
import { describe, expect, it } from 'vitest';
import { backlogForecast, leadTimeWeeks, levelAverages, tableMinutesForLevel, type LocationCapacity } from './backlog.util.js';

// Two weeks; weekdays open: 2 chairs × 500 = 1000 open chair minutes, 600 still free; one endodontist
// with 400 of 480 working minutes free. Weekends shut.
const days = Array.from({ length: 14 }, (_, i) => (i % 7 < 5 ? { chairFree: 600, operatorFree: 400, chairOpen: 1000 } : { chairFree: 0, operatorFree: 0, chairOpen: 0 }));
const loc: LocationCapacity = { locationId: 1, locationName: 'Fernhollow', days, openChairDays: 20, operatorDays: 10, workingMinutes: 4800 };
const averages = [
  { level: 'low' as const, minutes: 70, basis: 'visits' as const },
  { level: 'moderate' as const, minutes: 120, basis: 'visits' as const },
  { level: 'high' as const, minutes: 180, basis: 'visits' as const },
  { level: 'untriaged' as const, minutes: 100, basis: 'visits' as const },
];
const cases = [
  { locationId: 1, level: 'moderate' as const, cases: 4 },
  { locationId: 1, level: 'untriaged' as const, cases: 2 },
];

describe('backlogForecast', () => {
  it('divides the priced cases by the chair time an endodontist can work', () => {
    // Capacity per open day min(600, 400) = 400 → 2000 a week. Backlog 4 × 120 + 2 × 100 = 680 → 0.34 weeks.
    const r = backlogForecast({ locations: [loc], cases, averages });
    expect(r.capacityMinutesPerWeek).toBe(2000);
    expect(r.freeChairMinutesPerWeek).toBe(3000);
    expect(r.freeOperatorMinutesPerWeek).toBe(2000);
    expect(r.openChairMinutesPerWeek).toBe(5000);
    expect(r.limitedBy).toBe('operators');
    expect(r.totals).toEqual({ cases: 6, minutes: 680, weeksOfBacklog: 0.34 });
    expect(r.rows.map((x) => [x.level, x.cases, x.minutes, x.weeksOfBacklog])).toEqual([
      ['moderate', 4, 480, 0.24],
      ['untriaged', 2, 200, 0.1],
    ]);
    // Day 1 serves 400, day 2 the remaining 280 of its 400 → 1.7 days = 0.242857 weeks.
    expect(r.leadTimeWeeks).toBeCloseTo(1.7 / 7, 12);
    // A chair day = 10,000 open minutes / 20 chair days = 500; an operator day = 4800 / 10 = 480.
    expect(r.assumptions).toEqual({ chairDayMinutes: 500, operatorDayMinutes: 480, horizonWeeks: 2 });
  });

  it('a chair day (with its endodontist) adds its 500 minutes a week', () => {
    const r = backlogForecast({ locations: [loc], cases, averages, whatIf: { chairDaysPerWeek: 1, operatorDaysPerWeek: 0 } });
    expect(r.capacityMinutesPerWeek).toBeCloseTo(2500, 9);
    expect(r.totals.weeksOfBacklog).toBeCloseTo(680 / 2500, 12);
  });

  it('an operator day adds 480 minutes spread over the open days, up to the free chair time', () => {
    // 480 × 2 weeks / 10 open days = 96 a day → min(600, 496) = 496 → 2480 a week.
    const r = backlogForecast({ locations: [loc], cases, averages, whatIf: { chairDaysPerWeek: 0, operatorDaysPerWeek: 1 } });
    expect(r.capacityMinutesPerWeek).toBeCloseTo(2480, 9);
    // Three operator days would need 1440 / 5 = 288 more a day, but only 200 chair minutes are free: 600 cap.
    const three = backlogForecast({ locations: [loc], cases, averages, whatIf: { chairDaysPerWeek: 0, operatorDaysPerWeek: 3 } });
    expect(three.capacityMinutesPerWeek).toBeCloseTo(3000, 9);
    expect(three.limitedBy).toBe('chairs');
  });

  it('no capacity at all: "no open time", never ÷ 0', () => {
    const shut = { ...loc, days: days.map(() => ({ chairFree: 0, operatorFree: 0, chairOpen: 0 })), openChairDays: 0, operatorDays: 0, workingMinutes: 0 };
    const r = backlogForecast({ locations: [shut], cases, averages });
    expect(r).toMatchObject({ noOpenTime: true, leadTimeWeeks: null, capacityMinutesPerWeek: 0, limitedBy: 'none' });
    expect(r.totals.weeksOfBacklog).toBeNull();
    expect(r.rows.every((x) => x.weeksOfBacklog === null)).toBe(true);
    // Removing more than there is stays at zero, not negative.
    const less = backlogForecast({ locations: [loc], cases, averages, whatIf: { chairDaysPerWeek: -40, operatorDaysPerWeek: -40 } });
    expect(less.noOpenTime).toBe(true);
    expect(less.capacityMinutesPerWeek).toBe(0);
  });

  it('lead time beyond the horizon continues at the average capacity', () => {
    // 14 days of 100: 1400 served by day 14; 700 more at 100 a day = 7 days → 21 days = 3 weeks.
    expect(leadTimeWeeks(Array(14).fill(100), 2100)).toBeCloseTo(3, 12);
    expect(leadTimeWeeks(Array(14).fill(100), 0)).toBe(0);
    expect(leadTimeWeeks(Array(14).fill(0), 10)).toBeNull();
  });
});

describe('levelAverages', () => {
  it('own cases when there are enough, else stored estimates, else the table', () => {
    const table = DEFAULT_ESTIMATE_TABLE;
    // Table alone for high: mean(60, 75, 90) = 75 × 1.5 + 10 turnover = 122.5.
    expect(tableMinutesForLevel(table, 'high')).toBe(75 * table.tierMultiplier.high + table.turnoverMinutes);
    const a = levelAverages(
      [
        { level: 'low', cases: 5, minutes: 400 },
        { level: 'moderate', cases: 4, minutes: 600 },
      ],
      [{ level: 'moderate', cases: 2, minutes: 250 }],
      table,
    );
    expect(a).toEqual([
      { level: 'low', minutes: 80, basis: 'visits' },
      { level: 'moderate', minutes: 125, basis: 'estimate_table' },
      { level: 'high', minutes: 122.5, basis: 'estimate_table' },
      // Untriaged: all 9 booked cases, 1000 minutes.
      { level: 'untriaged', minutes: 1000 / 9, basis: 'visits' },
    ]);
  });
});
