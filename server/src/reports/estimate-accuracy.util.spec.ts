// Estimate accuracy before and after calibration: the leave-one-out errors must be the estimator's own
// (accuracyReport), worked by hand on a two-visit cell; overrun days on the fixture week.
import { DEFAULT_ESTIMATE_TABLE, LEVELS, PROCEDURES, TOOTH_GROUPS } from '@ostium/shared';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { accuracyReport, calibrationOptions } from '../estimates/estimator/index.js';
import { estimateAccuracy, overrunDays, visitErrors, type AccuracyVisit } from './estimate-accuracy.util.js';
import { FIXTURE_BOOKINGS, FIXTURE_CHAIRS, FIXTURE_LOCATION, FROM, TO } from './reports.fixtures.util.js';

const options = calibrationOptions(DEFAULT_ESTIMATE_TABLE);
const visit = (id: number, over: Partial<AccuracyVisit>): AccuracyVisit => ({
  id,
  visitDate: '2026-10-01',
  procedure: 'initial',
  toothGroup: 'molar',
  level: 'high',
  estimatedMinutes: 60,
  actualMinutes: 60,
  locationId: null,
  chairId: null,
  ...over,
});

describe('visitErrors', () => {
  it('worked example: two visits of one cell, no operator, k = 5', () => {
    // r1 = ln(72/60) = 0.182322, r2 = ln(66/60) = 0.095310.
    // Without visit 1 the cell is r2 / (1 + 5) = 0.015885 → 60·e^0.015885 = 60.961 → error 11.039.
    // Without visit 2 the cell is r1 / 6 = 0.030387 → 61.851 → error 4.149. MAE after 7.594, before (12 + 6) / 2 = 9.
    const v = [visit(1, { actualMinutes: 72 }), visit(2, { actualMinutes: 66 })];
    const e = visitErrors(v, options);
    expect(e.map((x) => x.before)).toEqual([12, 6]);
    expect(e[0]!.after).toBeCloseTo(72 - 60 * Math.exp(Math.log(66 / 60) / 6), 9);
    expect(e[1]!.after).toBeCloseTo(66 - 60 * Math.exp(Math.log(72 / 60) / 6), 9);
    const r = estimateAccuracy({ from: '2026-10-01', to: '2026-10-31', options, visits: v, include: () => true, operators: [], locations: [], chairs: [], done: [] });
    expect(r.totals.beforeMae).toBe(9);
    expect(r.totals.afterMae).toBeCloseTo(7.594, 2);
  });

  it('grouped per cell, the errors are exactly the estimator’s accuracyReport', () => {
    const arb = fc.array(
      fc.record({
        procedure: fc.constantFrom(...PROCEDURES),
        toothGroup: fc.constantFrom(...TOOTH_GROUPS),
        level: fc.constantFrom(...LEVELS),
        operatorId: fc.option(fc.integer({ min: 1, max: 4 }), { nil: undefined }),
        estimatedMinutes: fc.integer({ min: 20, max: 150 }),
        actualMinutes: fc.integer({ min: 10, max: 300 }),
      }),
      { minLength: 1, maxLength: 80 },
    );
    fc.assert(
      fc.property(arb, (rows) => {
        const visits = rows.map((r, i) => visit(i + 1, r));
        const errors = visitErrors(visits, options);
        for (const cell of accuracyReport(visits, options)) {
          const mine = errors.filter((e) => e.visit.procedure === cell.procedure && e.visit.toothGroup === cell.toothGroup && e.visit.level === cell.level);
          expect(mine.length).toBe(cell.count);
          const mae = (k: 'before' | 'after') => mine.reduce((s, e) => s + Math.abs(e[k]), 0) / mine.length;
          expect(mae('before')).toBeCloseTo(cell.before.meanAbsoluteError, 9);
          expect(mae('after')).toBeCloseTo(cell.after.meanAbsoluteError, 9);
        }
      }),
      { numRuns: 200 },
    );
  });

  it('by level, operator and month, only for the visits included', () => {
    const v = [
      visit(1, { level: 'low', operatorId: 3, actualMinutes: 70, visitDate: '2026-09-30' }),
      visit(2, { level: 'low', operatorId: 3, actualMinutes: 50 }),
      visit(3, { level: 'moderate', operatorId: 4, actualMinutes: 90 }),
    ];
    const r = estimateAccuracy({ from: '2026-10-01', to: '2026-10-31', options, visits: v, include: (x) => x.visitDate >= '2026-10-01', operators: [{ id: 3, name: 'A' }, { id: 4, name: 'B' }], locations: [], chairs: [], done: [] });
    expect(r.byLevel.map((l) => [l.level, l.visits, l.beforeMae])).toEqual([
      ['low', 1, 10],
      ['moderate', 1, 30],
      ['high', 0, null],
    ]);
    expect(r.byOperator.map((o) => [o.operatorId, o.visits])).toEqual([
      [3, 1],
      [4, 1],
    ]);
    expect(r.byMonth).toEqual([{ month: '2026-10', visits: 2, beforeMae: 20, afterMae: r.totals.afterMae }]);
  });
});

describe('overrunDays on the fixture week', () => {
  it('finds the chair days whose last done visit, with turnover, ended after closing', () => {
    const done = FIXTURE_BOOKINGS.filter((b) => b.state === 'dismissed').map((b) => ({ chairId: b.chairId, locationId: 1, operatorId: b.operatorId, start: b.start, turnoverMinutes: b.turnoverMinutes, dismissedAt: b.dismissedAt! }));
    // Chair 1 Thu: b2 dismissed 17:15 + 10 = 17:25 → 25 min past 17:00. Chair 1 Fri: b3 17:00 + 10 → 10 min.
    // Chair 2 Thu ends 13:00 and Sat 09:40: well inside.
    expect(overrunDays({ from: FROM, to: TO, locations: [FIXTURE_LOCATION], chairs: FIXTURE_CHAIRS, done })).toEqual([
      { date: '2026-10-29', chairId: 11, chairName: 'Fernhollow 1', closesAt: '2026-10-29T21:00:00.000Z', lastEndAt: '2026-10-29T21:25:00.000Z', overrunMinutes: 25 },
      { date: '2026-10-30', chairId: 11, chairName: 'Fernhollow 1', closesAt: '2026-10-30T21:00:00.000Z', lastEndAt: '2026-10-30T21:10:00.000Z', overrunMinutes: 10 },
    ]);
  });
});
