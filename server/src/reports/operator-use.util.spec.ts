// Operator use on the fixture week (reports.fixtures.util.ts): O1 Mon–Fri 08:00–12:00 less a 10:00–10:15
// break, off Fri 10-30 08:00–10:00; O2 Thu and Fri 12:00–17:00; the location is shut Tue 11-03.
import { describe, expect, it } from 'vitest';
import { operatorUse } from './operator-use.util.js';
import { FIXTURE_BOOKINGS, FIXTURE_LOCATION, FIXTURE_OPERATORS, FROM, ny, TO } from './reports.fixtures.util.js';

const report = (extra = {}) => operatorUse({ from: FROM, to: TO, locations: [FIXTURE_LOCATION], operators: FIXTURE_OPERATORS, bookings: FIXTURE_BOOKINGS, ...extra });

describe('operatorUse on the fixture week', () => {
  it('working minutes: rules minus breaks, time off and the closure', () => {
    // O1: 240 − 15 = 225 a day on Thu, Mon, Wed; Fri 225 − 120 (time off) = 105; Tue closed → 780.
    // O2: Thu 300 + Fri 300 = 600.
    const r = report();
    expect(r.byOperator.map((o) => [o.operatorId, o.workingMinutes])).toEqual([
      [21, 780],
      [22, 600],
    ]);
    expect(r.totals.workingMinutes).toBe(1380);
  });

  it('clinical minutes: visit lengths without turnover, inside working time', () => {
    // O1: b1 90; b7 09:00–11:00 less the 10:00–10:15 break = 105; b9 60; b10 on a Saturday he does not
    // work 0; b4 no-show and b5 cancelled 0; b6 on the closure 0 → 255.
    // O2: b2 50 + b3 30 + b8 60 = 140.
    const r = report();
    expect(r.byOperator.map((o) => o.clinicalMinutes)).toEqual([255, 140]);
    expect(r.byOperator[0]!.share).toBeCloseTo(255 / 780, 12);
    expect(r.totals.clinicalMinutes).toBe(395);
  });

  it('per ISO week, every week for every operator', () => {
    const r = report();
    expect(r.byWeek.map((w) => [w.operatorId, w.weekStart, w.workingMinutes, w.clinicalMinutes, w.share === null ? null : Number(w.share.toFixed(4))])).toEqual([
      [21, '2026-10-26', 330, 90, Number((90 / 330).toFixed(4))],
      [21, '2026-11-02', 450, 165, Number((165 / 450).toFixed(4))],
      [22, '2026-10-26', 600, 140, Number((140 / 600).toFixed(4))],
      [22, '2026-11-02', 0, 0, null],
    ]);
  });

  it('a location filter keeps only the rules and visits there', () => {
    const r = report({ locationId: 99 });
    expect(r.totals).toEqual({ workingMinutes: 0, clinicalMinutes: 0, share: null });
  });

  it('working hours are wall-clock across the change: 08:00–12:00 is four hours on Fri 10-30 and Mon 11-02', () => {
    const op = { id: 5, name: 'Dr. Dst', rules: [{ locationId: 1, rrule: 'FREQ=DAILY', startLocal: '00:00', endLocal: '04:00', breaks: [] }], timeOff: [] };
    const loc = { ...FIXTURE_LOCATION, closures: [] };
    // 00:00–04:00 on Sun 11-01 covers the repeated hour: five real hours.
    const r = operatorUse({ from: '2026-10-31', to: '2026-11-02', locations: [loc], operators: [op], bookings: [] });
    expect(r.totals.workingMinutes).toBe(240 + 300 + 240);
    const b = operatorUse({ from: '2026-11-01', to: '2026-11-01', locations: [loc], operators: [op], bookings: [{ operatorId: 5, locationId: 1, start: ny('2026-11-01 00:00'), end: ny('2026-11-01 03:00'), state: 'booked' }] });
    expect(b.totals.clinicalMinutes).toBe(240);
  });
});
