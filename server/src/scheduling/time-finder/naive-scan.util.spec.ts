// The naive minute scan is the oracle of the property tests, so it is checked by hand here too:
// it must find the hand-worked earliest start and its checker must flag each kind of violation.
// Rules: scheduling.md "Time finder"; dates: 2026-03-02 is a Monday (ISO 8601).
import { describe, expect, it } from 'vitest';
import { NaiveWorld, naiveEarliestSeries } from './naive-scan.util.js';
import { at, noBusy, operator, span, world, WEEKDAYS_RULE } from './time-finder.fixtures.util.js';
import type { BusyIntervals, TimeFinderRequest } from './time-finder.types.js';

const Z = 'Europe/Vienna';
const request: TimeFinderRequest = {
  plan: { visits: [{ minutes: 30, needsMicroscope: false }] },
  from: at(Z, '2026-03-02 00:00'),
  to: at(Z, '2026-03-04 00:00'),
  now: at(Z, '2026-03-01 00:00'),
};

describe('naive minute scan', () => {
  const busy: BusyIntervals = { ...noBusy(), chairs: { C1: [span(Z, '2026-03-02 08:00', '2026-03-02 10:10')] } };

  it('finds the hand-worked earliest start (chair free from 10:10 after a booking ending 10:00 + turnover)', () => {
    expect(naiveEarliestSeries(world(), busy, request)?.[0].start).toBe(at(Z, '2026-03-02 10:10'));
  });

  it('places a second visit inside its day window with the same operator', () => {
    const plan = { visits: [request.plan.visits[0], { minutes: 30, needsMicroscope: false, earliestDaysAfterPrevious: 1, latestDaysAfterPrevious: 1 }] };
    const series = naiveEarliestSeries(world(), busy, { ...request, plan });
    expect(series?.map((v) => v.start)).toEqual([at(Z, '2026-03-02 10:10'), at(Z, '2026-03-03 08:00')]);
  });

  it('flags every kind of violation', () => {
    const held = { ...world({ operators: [operator('O1', WEEKDAYS_RULE, { timeOff: [span(Z, '2026-03-03 09:00', '2026-03-03 10:00')] })] }) };
    const w = new NaiveWorld(held, busy, request);
    const visit = (from: string, to: string) => ({ start: at(Z, from), end: at(Z, to), chairId: 'C1', operatorId: 'O1' });
    expect(w.violations(visit('2026-03-02 10:10', '2026-03-02 10:40'), 30, false)).toEqual([]);
    expect(w.violations(visit('2026-03-02 10:00', '2026-03-02 10:30'), 30, false)).toContain('chair busy (turnover included)');
    // Ends 17:00 at closing: allowed; the turnover may run past closing.
    expect(w.violations(visit('2026-03-02 16:30', '2026-03-02 17:00'), 30, false)).toEqual([]);
    expect(w.violations(visit('2026-03-02 16:45', '2026-03-02 17:15'), 30, false)).toContain('outside opening hours');
    expect(w.violations(visit('2026-03-02 12:15', '2026-03-02 12:45'), 30, false)).toContain('outside the operator working hours');
    expect(w.violations(visit('2026-03-03 09:30', '2026-03-03 10:00'), 30, false)).toContain('operator busy, off or held');
    expect(w.violations(visit('2026-03-03 09:32', '2026-03-03 10:02'), 30, false)).toContain('start off the local grid');
    expect(w.violations(visit('2026-03-03 11:00', '2026-03-03 11:30'), 30, true)).toContain('no microscope assigned');
  });
});
