import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { LEVELS, TOOTH_GROUPS, type CompletedVisit, type Procedure } from '@ostium/shared';
import {
  accuracyReport,
  bookedMinutes,
  calibrationFor,
  calibrationLookup,
  calibrationOptions,
  cellKey,
  cellOutlierBound,
  clippedLogRatio,
  learnCalibration,
  quantile,
} from './calibration.util.js';
import { DEFAULT_ESTIMATE_TABLE as T } from '@ostium/shared';
import { estimate } from './estimate.util.js';
import { EstimateInputError } from './input-error.util.js';
import { mulberry32, normal, pick } from './seeded-random.util.js';

const OPTS = calibrationOptions(T);
const CELL = { procedure: 'initial' as Procedure, toothGroup: 'molar' as const, level: 'moderate' as const };

function visit(ratio: number, extra: Partial<CompletedVisit> = {}): CompletedVisit {
  return { ...CELL, estimatedMinutes: 100, actualMinutes: 100 * ratio, ...extra };
}

describe('shrinkage and clipping', () => {
  it('shrinks a cell mean toward 0 with 5 pseudo-visits', () => {
    const m = learnCalibration(Array.from({ length: 5 }, () => visit(1.2)));
    // Σr / (n + k) = 5 ln 1.2 / 10.
    expect(m.cells.get(cellKey(CELL))!.logEffect).toBeCloseTo(Math.log(1.2) / 2, 12);
    expect(m.cells.get(cellKey(CELL))!.count).toBe(5);
  });

  it('fits the operator on residuals after the cell, with 10 pseudo-visits', () => {
    const visits = [
      ...Array.from({ length: 10 }, () => visit(1.5, { operatorId: 7 })),
      ...Array.from({ length: 10 }, () => visit(1.0, { operatorId: 8 })),
    ];
    const m = learnCalibration(visits);
    const c = (10 * Math.log(1.5)) / 25;
    expect(m.cells.get(cellKey(CELL))!.logEffect).toBeCloseTo(c, 12);
    expect(m.operators.get(7)!.logEffect).toBeCloseTo((10 * (Math.log(1.5) - c)) / 20, 12);
    expect(m.operators.get(8)!.logEffect).toBeCloseTo((10 * (0 - c)) / 20, 12);
    // Two operators with equal visits: the median sits halfway, so they are mirror images.
    expect(m.operators.get(7)!.relativeFactor * m.operators.get(8)!.relativeFactor).toBeCloseTo(1, 12);
  });

  it('clips log ratios to ±ln 3', () => {
    expect(clippedLogRatio(1000, 10, 3)).toBeCloseTo(Math.log(3), 12);
    expect(clippedLogRatio(1, 10, 3)).toBeCloseTo(-Math.log(3), 12);
    expect(clippedLogRatio(12, 10, 3)).toBeCloseTo(Math.log(1.2), 12);
  });

  it('rejects impossible minutes, naming the visit', () => {
    try {
      learnCalibration([visit(1), visit(1, { estimatedMinutes: 0 })]);
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(EstimateInputError);
      expect((e as EstimateInputError).field).toBe('visits[1].estimatedMinutes');
    }
  });
});

describe('robustness to one outlier', () => {
  it('a visit 100 times over its estimate moves a 20-visit cell by less than 2·ln3/(n+k+1)', () => {
    const rand = mulberry32(11);
    const history = Array.from({ length: 20 }, () => visit(Math.exp(0.1 + 0.2 * normal(rand))));
    const before = learnCalibration(history).cells.get(cellKey(CELL))!.logEffect;
    const after = learnCalibration([...history, visit(100)]).cells.get(cellKey(CELL))!.logEffect;
    const bound = cellOutlierBound(20, OPTS);
    expect(bound).toBeCloseTo((2 * Math.log(3)) / 26, 12);
    expect(Math.abs(after - before)).toBeLessThan(bound);
    // As a multiplier: under a factor 3^(2/26) ≈ 1.088.
    expect(Math.exp(Math.abs(after - before))).toBeLessThan(1.088);
    // Without the clip the same visit would have moved the cell past the bound.
    expect((Math.log(100) - before) / 26).toBeGreaterThan(bound);
  });

  it('property: any single added visit stays inside the bound and leaves other cells alone', () => {
    const other = { procedure: 'surgery' as Procedure, toothGroup: 'anterior' as const, level: 'low' as const };
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: 0.2, max: 5, noNaN: true }), { maxLength: 60 }),
        fc.array(fc.double({ min: 0.5, max: 2, noNaN: true }), { maxLength: 10 }),
        fc.double({ min: 1e-3, max: 1e3, noNaN: true }),
        fc.option(fc.integer({ min: 1, max: 3 }), { nil: undefined }),
        (ratios, otherRatios, outlier, op) => {
          const history = [
            ...ratios.map((r, i) => visit(r, { operatorId: (i % 3) + 1 })),
            ...otherRatios.map((r) => visit(r, { ...other, operatorId: 1 })),
          ];
          const a = learnCalibration(history);
          const b = learnCalibration([...history, visit(outlier, { operatorId: op })]);
          const ca = a.cells.get(cellKey(CELL))?.logEffect ?? 0;
          const cb = b.cells.get(cellKey(CELL))!.logEffect;
          expect(Math.abs(cb - ca)).toBeLessThan(cellOutlierBound(ratios.length, OPTS));
          if (otherRatios.length > 0) {
            expect(b.cells.get(cellKey(other))!.logEffect).toBe(a.cells.get(cellKey(other))!.logEffect);
          }
        },
      ),
      { numRuns: 500 },
    );
  });
});

describe('learning a hidden operator factor', () => {
  const PROCS: Procedure[] = ['initial', 'retreatment'];
  /**
   * A practice with three endodontists at the table's pace (600 visits each) and a fourth whose
   * visits take 1.3 × as long; the table is off by a hidden factor 0.85–1.2 per cell, and each
   * visit has lognormal noise (σ = 0.2 on the log scale).
   */
  function simulate(seed: number) {
    const rand = mulberry32(seed);
    const cells = PROCS.flatMap((procedure) =>
      TOOTH_GROUPS.flatMap((toothGroup) => LEVELS.map((level) => ({ procedure, toothGroup, level, truth: 0.85 + 0.35 * rand() }))),
    );
    const visits: (CompletedVisit & { truth: number })[] = [];
    const add = (operatorId: number, factor: number) => {
      const c = pick(rand, cells);
      const est = 60 + 5 * Math.floor(rand() * 13);
      const truth = c.truth * factor;
      visits.push({
        procedure: c.procedure,
        toothGroup: c.toothGroup,
        level: c.level,
        operatorId,
        estimatedMinutes: est,
        actualMinutes: est * truth * Math.exp(0.2 * normal(rand)),
        truth,
      });
    };
    for (let i = 0; i < 1800; i++) add(1 + (i % 3), 1);
    for (let i = 0; i < 200; i++) add(4, 1.3);
    return visits;
  }

  it('after 200 visits the slow operator is learned within 5 % of 1.3, colleagues within 5 % of 1', () => {
    for (let seed = 1; seed <= 10; seed++) {
      const visits = simulate(seed);
      const m = learnCalibration(visits);
      const slow = m.operators.get(4)!;
      expect(slow.count).toBe(200);
      expect(Math.abs(slow.relativeFactor / 1.3 - 1)).toBeLessThan(0.05);
      for (const id of [1, 2, 3]) expect(Math.abs(m.operators.get(id)!.relativeFactor - 1)).toBeLessThan(0.05);
      // What booking uses: exp(cell + operator) for the slow operator's visits vs the hidden truth.
      const mine = visits.filter((v) => v.operatorId === 4);
      const logErr =
        mine.reduce((s, v) => s + Math.log(calibrationFor(m, v, 4).multiplier / v.truth), 0) / mine.length;
      expect(Math.abs(Math.exp(logErr) - 1)).toBeLessThan(0.05);
    }
  });

  it('the accuracy report shows calibration shrinking error and bias', () => {
    const visits = simulate(3);
    const rows = accuracyReport(visits);
    expect(rows).toHaveLength(18);
    expect(rows.reduce((s, r) => s + r.count, 0)).toBe(visits.length);
    const weighted = (pick: (r: (typeof rows)[number]) => number) => rows.reduce((s, r) => s + pick(r) * r.count, 0) / visits.length;
    const maeBefore = weighted((r) => r.before.meanAbsoluteError);
    const maeAfter = weighted((r) => r.after.meanAbsoluteError);
    expect(maeAfter).toBeLessThan(maeBefore * 0.9);
    const absBias = (pick: (r: (typeof rows)[number]) => number) => rows.reduce((s, r) => s + Math.abs(pick(r)) * r.count, 0) / visits.length;
    expect(absBias((r) => r.after.bias)).toBeLessThan(absBias((r) => r.before.bias) / 2);
  });
});

describe('bands, quantiles and booked length', () => {
  it('type-7 quantiles', () => {
    expect(quantile([1, 2, 3, 4], 0.5)).toBe(2.5);
    expect(quantile([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11], 0.1)).toBe(2);
    expect(quantile([5], 0.9)).toBe(5);
    expect(() => quantile([], 0.5)).toThrow(RangeError);
  });

  it('gives an 80 % band only once a cell has 20 visits', () => {
    const rand = mulberry32(5);
    const make = (n: number) => Array.from({ length: n }, () => visit(Math.exp(0.25 * normal(rand))));
    expect(calibrationFor(learnCalibration(make(19)), CELL).band).toBeUndefined();
    const m = learnCalibration(make(20));
    const cal = calibrationFor(m, CELL);
    const cell = m.cells.get(cellKey(CELL))!;
    expect(cell.residuals).toHaveLength(20);
    const q = (p: number) => quantile(cell.residuals!, p);
    expect(cal.multiplier).toBeCloseTo(Math.exp(cell.logEffect + q(0.5)), 12);
    expect(cal.band!.lowFactor).toBeCloseTo(Math.exp(q(0.1) - q(0.5)), 12);
    expect(cal.band!.highFactor).toBeCloseTo(Math.exp(q(0.9) - q(0.5)), 12);
  });

  it('the band covers about 80 % of new visits', () => {
    const rand = mulberry32(21);
    const draw = () => visit(1.1 * Math.exp(0.3 * normal(rand)));
    const m = learnCalibration(Array.from({ length: 400 }, draw));
    const cal = calibrationFor(m, CELL);
    const fresh = Array.from({ length: 4000 }, draw);
    const inside = fresh.filter((v) => {
      const mid = v.estimatedMinutes * cal.multiplier;
      return v.actualMinutes >= mid * cal.band!.lowFactor && v.actualMinutes <= mid * cal.band!.highFactor;
    }).length;
    expect(inside / fresh.length).toBeGreaterThan(0.76);
    expect(inside / fresh.length).toBeLessThan(0.84);
  });

  it('books at a chosen quantile, rounded up to the grid', () => {
    const rand = mulberry32(8);
    const m = learnCalibration(Array.from({ length: 50 }, () => visit(Math.exp(0.3 * normal(rand)))));
    const median = calibrationFor(m, CELL, undefined, 0.5);
    const p80 = calibrationFor(m, CELL, undefined, 0.8);
    expect(p80.multiplier).toBeGreaterThan(median.multiplier);
    expect(bookedMinutes(60, { multiplier: 1.13 }, 5)).toBe(70);
    expect(bookedMinutes(60, undefined, 5)).toBe(60);
    // Binary noise (60 × (1 + 1e-13)) does not cost a grid step.
    expect(bookedMinutes(60, { multiplier: 1 + 1e-13 }, 5)).toBe(60);
  });

  it('the report leaves each visit out: a lone visit gets no help from itself', () => {
    const rows = accuracyReport([visit(1.5)]);
    expect(rows[0]!.after).toEqual(rows[0]!.before);
    expect(rows[0]!.before).toEqual({ meanAbsoluteError: 50, bias: 50 });
  });

  it('feeds estimate(): the lookup scales the planned minutes for the case cell', () => {
    const visits = Array.from({ length: 30 }, () => ({
      procedure: 'initial' as Procedure,
      toothGroup: 'anterior' as const,
      level: 'low' as const,
      estimatedMinutes: 60,
      actualMinutes: 75,
    }));
    const m = learnCalibration(visits);
    const r = estimate({ toothFdi: '11', procedure: 'initial' }, T, calibrationLookup(m, undefined, T));
    // Cell: 30 ln 1.25 / 35; residuals all equal, so the band collapses to the estimate.
    const expected = 60 * Math.exp((30 * Math.log(1.25)) / 35);
    expect(r.totalMinutes).toBe(Math.ceil(expected / 5) * 5);
    expect(r.breakdown.find((l) => l.label.startsWith('Calibration'))).toBeDefined();
    expect(r.band).toEqual({ low: r.totalMinutes, high: r.totalMinutes });
  });
});
