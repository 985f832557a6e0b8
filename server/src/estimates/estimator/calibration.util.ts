import {
  LEVELS,
  PROCEDURES,
  TOOTH_GROUPS,
  type AccuracyStats,
  type CellAccuracy,
  type CompletedVisit,
  type EstimateTable,
} from '@ostium/shared';
import { DEFAULT_ESTIMATE_TABLE } from '@ostium/shared';
import type { Calibration, CalibrationCell } from './estimate.util.js';
import { EstimateInputError } from './input-error.util.js';

/**
 * Learning from completed visits (design/estimator.md, "Learning from real visits").
 *
 * For each visit r = ln(actual / table estimate), clipped to ±ln(ratioClip) (default ±ln 3) so one
 * wild visit — a forgotten "dismissed" click, an extra tooth done in the same sitting — cannot drag a
 * cell far. Stage 1, per cell (procedure × tooth group × level): cell = Σr / (n + 5), a mean shrunk
 * toward 0 ("the table is right") by 5 pseudo-visits. Stage 2, per operator, on the residuals after
 * the cell effect: operator = Σ(r − cell) / (n + 10). Predicted = table × exp(cell + operator).
 *
 * Outlier bound (stage 1): adding one visit to a cell of n visits moves its log effect by
 * (x − cell) / (n + k + 1) with |x| ≤ ln c and |cell| < ln c, so by less than 2·ln(c) / (n + k + 1);
 * with c = 3, k = 5 that is < 0.366 for an empty cell and < 0.085 (a factor 1.088) at n = 20.
 */

export interface CalibrationOptions {
  cellPseudoVisits: number;
  operatorPseudoVisits: number;
  ratioClip: number;
  minVisitsForBand: number;
  bandCoverage: number;
}

export function calibrationOptions(table: EstimateTable = DEFAULT_ESTIMATE_TABLE): CalibrationOptions {
  const c = table.calibration;
  return {
    cellPseudoVisits: c.cellPseudoVisits,
    operatorPseudoVisits: c.operatorPseudoVisits,
    ratioClip: c.ratioClip,
    minVisitsForBand: c.minVisitsForBand,
    bandCoverage: c.bandCoverage,
  };
}

export interface CellEffect extends CalibrationCell {
  key: string;
  count: number;
  /** Shrunk mean log ratio (stage 1). */
  logEffect: number;
  factor: number;
  /** Sorted residuals after cell and operator effects; kept once count ≥ minVisitsForBand. */
  residuals?: number[];
}

export interface OperatorEffect {
  operatorId: number;
  count: number;
  /** Shrunk mean residual after the cell effect (stage 2); used in predictions. */
  logEffect: number;
  factor: number;
  /**
   * Pace relative to the visit-weighted median operator. Cells absorb part of every operator's
   * effect (they are means over all operators), so only differences between operators are
   * identifiable; this is the figure to show in reports.
   */
  relativeFactor: number;
}

export interface CalibrationModel {
  options: CalibrationOptions;
  cells: Map<string, CellEffect>;
  operators: Map<number, OperatorEffect>;
}

export function cellKey(cell: CalibrationCell): string {
  return `${cell.procedure}:${cell.toothGroup}:${cell.level}`;
}

/** ln(actual / estimated), clipped to ±ln(clip). */
export function clippedLogRatio(actualMinutes: number, estimatedMinutes: number, clip: number): number {
  const bound = Math.log(clip);
  const r = Math.log(actualMinutes / estimatedMinutes);
  return Math.min(bound, Math.max(-bound, r));
}

/** The stated outlier bound: one more visit moves a cell of n visits by less than this (log scale). */
export function cellOutlierBound(n: number, options: CalibrationOptions): number {
  return (2 * Math.log(options.ratioClip)) / (n + options.cellPseudoVisits + 1);
}

/** Linear-interpolation quantile (type 7) of an ascending array. */
export function quantile(sorted: readonly number[], p: number): number {
  if (sorted.length === 0) throw new RangeError('quantile of an empty list');
  if (!(p >= 0 && p <= 1)) throw new RangeError('p must be in [0, 1]');
  const h = (sorted.length - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, sorted.length - 1);
  return sorted[lo]! + (h - lo) * (sorted[hi]! - sorted[lo]!);
}

function checkOptions(o: CalibrationOptions): void {
  if (!(o.cellPseudoVisits >= 0) || !(o.operatorPseudoVisits >= 0)) {
    throw new EstimateInputError('table.calibration', 'pseudo-visit counts must be ≥ 0');
  }
  if (!(o.ratioClip > 1) || !Number.isFinite(o.ratioClip)) {
    throw new EstimateInputError('table.calibration.ratioClip', 'must be a finite number > 1');
  }
  if (!(o.bandCoverage > 0 && o.bandCoverage < 1)) {
    throw new EstimateInputError('table.calibration.bandCoverage', 'must be between 0 and 1');
  }
  if (!(o.minVisitsForBand >= 2)) {
    throw new EstimateInputError('table.calibration.minVisitsForBand', 'must be at least 2');
  }
}

function checkVisits(visits: readonly CompletedVisit[]): void {
  visits.forEach((v, i) => {
    for (const f of ['estimatedMinutes', 'actualMinutes'] as const) {
      if (!(v[f] > 0) || !Number.isFinite(v[f])) {
        throw new EstimateInputError(`visits[${i}].${f}`, 'must be a finite number of minutes > 0');
      }
    }
    if (!(PROCEDURES as readonly string[]).includes(v.procedure)) throw new EstimateInputError(`visits[${i}].procedure`, 'unknown');
    if (!(TOOTH_GROUPS as readonly string[]).includes(v.toothGroup)) throw new EstimateInputError(`visits[${i}].toothGroup`, 'unknown');
    if (!(LEVELS as readonly string[]).includes(v.level)) throw new EstimateInputError(`visits[${i}].level`, 'unknown');
  });
}

interface Fit {
  r: number[];
  keys: string[];
  cellSum: Map<string, number>;
  cellCount: Map<string, number>;
  cellEffect: Map<string, number>;
  opSum: Map<number, number>;
  opCount: Map<number, number>;
  opEffect: Map<number, number>;
}

function fit(visits: readonly CompletedVisit[], o: CalibrationOptions): Fit {
  const r = visits.map((v) => clippedLogRatio(v.actualMinutes, v.estimatedMinutes, o.ratioClip));
  const keys = visits.map((v) => cellKey(v));
  const cellSum = new Map<string, number>();
  const cellCount = new Map<string, number>();
  keys.forEach((k, i) => {
    cellSum.set(k, (cellSum.get(k) ?? 0) + r[i]!);
    cellCount.set(k, (cellCount.get(k) ?? 0) + 1);
  });
  const cellEffect = new Map<string, number>();
  for (const [k, s] of cellSum) cellEffect.set(k, s / (cellCount.get(k)! + o.cellPseudoVisits));

  const opSum = new Map<number, number>();
  const opCount = new Map<number, number>();
  visits.forEach((v, i) => {
    if (v.operatorId === undefined || v.operatorId === null) return;
    const e = r[i]! - cellEffect.get(keys[i]!)!;
    opSum.set(v.operatorId, (opSum.get(v.operatorId) ?? 0) + e);
    opCount.set(v.operatorId, (opCount.get(v.operatorId) ?? 0) + 1);
  });
  const opEffect = new Map<number, number>();
  for (const [id, s] of opSum) opEffect.set(id, s / (opCount.get(id)! + o.operatorPseudoVisits));
  return { r, keys, cellSum, cellCount, cellEffect, opSum, opCount, opEffect };
}

function weightedMedian(items: { value: number; weight: number }[]): number {
  if (items.length === 0) return 0;
  const sorted = [...items].sort((a, b) => a.value - b.value);
  const total = sorted.reduce((s, x) => s + x.weight, 0);
  let cum = 0;
  for (let i = 0; i < sorted.length; i++) {
    cum += sorted[i]!.weight;
    if (cum > total / 2) return sorted[i]!.value;
    // Exactly half: the median lies between this operator and the next.
    if (cum === total / 2) return (sorted[i]!.value + sorted[i + 1]!.value) / 2;
  }
  return sorted[sorted.length - 1]!.value;
}

/** Learns cell and operator effects from completed visits (estimatedMinutes = the uncalibrated table). */
export function learnCalibration(
  visits: readonly CompletedVisit[],
  options: CalibrationOptions = calibrationOptions(),
): CalibrationModel {
  checkOptions(options);
  checkVisits(visits);
  const f = fit(visits, options);

  const median = weightedMedian([...f.opEffect].map(([id, value]) => ({ value, weight: f.opCount.get(id)! })));
  const operators = new Map<number, OperatorEffect>();
  for (const [id, logEffect] of f.opEffect) {
    operators.set(id, {
      operatorId: id,
      count: f.opCount.get(id)!,
      logEffect,
      factor: Math.exp(logEffect),
      relativeFactor: Math.exp(logEffect - median),
    });
  }

  const residuals = new Map<string, number[]>();
  visits.forEach((v, i) => {
    const k = f.keys[i]!;
    const op = v.operatorId === undefined || v.operatorId === null ? 0 : f.opEffect.get(v.operatorId)!;
    const list = residuals.get(k) ?? [];
    list.push(f.r[i]! - f.cellEffect.get(k)! - op);
    residuals.set(k, list);
  });

  const cells = new Map<string, CellEffect>();
  const firstOf = new Map<string, CompletedVisit>();
  visits.forEach((v, i) => {
    if (!firstOf.has(f.keys[i]!)) firstOf.set(f.keys[i]!, v);
  });
  for (const [k, logEffect] of f.cellEffect) {
    const v = firstOf.get(k)!;
    const count = f.cellCount.get(k)!;
    const cell: CellEffect = {
      key: k,
      procedure: v.procedure,
      toothGroup: v.toothGroup,
      level: v.level,
      count,
      logEffect,
      factor: Math.exp(logEffect),
    };
    if (count >= options.minVisitsForBand) cell.residuals = residuals.get(k)!.sort((a, b) => a - b);
    cells.set(k, cell);
  }
  return { options, cells, operators };
}

/**
 * The calibration estimate() applies for a cell and operator. With a band-ready cell the multiplier
 * books at the chosen quantile of the cell's residuals and the band covers `bandCoverage` (80 %);
 * with fewer visits the tails are unknown, so it books the point prediction and gives no band.
 */
export function calibrationFor(
  model: CalibrationModel,
  cell: CalibrationCell,
  operatorId?: number,
  bookingQuantile = 0.5,
): Calibration {
  if (!(bookingQuantile > 0 && bookingQuantile < 1)) {
    throw new EstimateInputError('table.calibration.bookingQuantile', 'must be between 0 and 1');
  }
  const c = model.cells.get(cellKey(cell));
  const op = operatorId === undefined ? undefined : model.operators.get(operatorId);
  const log = (c?.logEffect ?? 0) + (op?.logEffect ?? 0);
  if (!c?.residuals) return { multiplier: Math.exp(log) };
  const q = quantile(c.residuals, bookingQuantile);
  const tail = (1 - model.options.bandCoverage) / 2;
  return {
    multiplier: Math.exp(log + q),
    band: {
      lowFactor: Math.exp(quantile(c.residuals, tail) - q),
      highFactor: Math.exp(quantile(c.residuals, 1 - tail) - q),
    },
  };
}

/** A calibration lookup for estimate(), bound to one operator and the table's booking quantile. */
export function calibrationLookup(
  model: CalibrationModel,
  operatorId: number | undefined,
  table: EstimateTable = DEFAULT_ESTIMATE_TABLE,
): (cell: CalibrationCell) => Calibration {
  return (cell) => calibrationFor(model, cell, operatorId, table.calibration.bookingQuantile);
}

/** Booked length: table minutes × calibration multiplier, rounded up to the grid. */
export function bookedMinutes(tableMinutes: number, calibration: Calibration | undefined, gridMinutes: number): number {
  const m = tableMinutes * (calibration?.multiplier ?? 1);
  return Math.max(gridMinutes, Math.ceil(m / gridMinutes - 1e-9) * gridMinutes);
}

function stats(errors: number[]): AccuracyStats {
  const n = errors.length;
  return {
    meanAbsoluteError: errors.reduce((s, e) => s + Math.abs(e), 0) / n,
    bias: errors.reduce((s, e) => s + e, 0) / n,
  };
}

/**
 * Each visit's minutes as the calibration would have predicted them without that visit (leave-one-out):
 * it leaves the cell's shrunk mean and its operator's, and the operator's other visits in the same cell
 * see the cell without it. No input checks (callers check or trust their rows).
 */
export function predictLeavingOneOut(visits: readonly CompletedVisit[], options: CalibrationOptions): number[] {
  const f = fit(visits, options);
  // Visits per (operator, cell), for the leave-one-out correction of the operator stage.
  const opCell = new Map<string, number>();
  visits.forEach((v, i) => {
    if (v.operatorId === undefined || v.operatorId === null) return;
    const k = `${v.operatorId}|${f.keys[i]}`;
    opCell.set(k, (opCell.get(k) ?? 0) + 1);
  });
  return visits.map((v, i) => {
    const k = f.keys[i]!;
    const n = f.cellCount.get(k)!;
    const cFull = f.cellEffect.get(k)!;
    const cellDenom = n - 1 + options.cellPseudoVisits;
    // With no pseudo-visits and a one-visit cell there is nothing left to learn from: no effect.
    const cLoo = cellDenom > 0 ? (f.cellSum.get(k)! - f.r[i]!) / cellDenom : 0;
    let oLoo = 0;
    if (v.operatorId !== undefined && v.operatorId !== null) {
      const nOp = f.opCount.get(v.operatorId)!;
      const e = f.r[i]! - cFull;
      const sameCell = opCell.get(`${v.operatorId}|${k}`)! - 1;
      // Without visit i: drop its residual, and the operator's other visits in this cell see cLoo.
      const sum = f.opSum.get(v.operatorId)! - e + sameCell * (cFull - cLoo);
      const denom = nOp - 1 + options.operatorPseudoVisits;
      oLoo = denom > 0 ? sum / denom : 0;
    }
    return v.estimatedMinutes * Math.exp(cLoo + oLoo);
  });
}

/**
 * Estimated vs actual per cell: before = the table's estimate; after = the calibrated prediction
 * computed leaving the visit itself out (exact for both stages), so the report does not flatter the
 * model with visits it has already seen. Errors are actual − estimate, in minutes.
 */
export function accuracyReport(
  visits: readonly CompletedVisit[],
  options: CalibrationOptions = calibrationOptions(),
): CellAccuracy[] {
  checkOptions(options);
  checkVisits(visits);
  const predictions = predictLeavingOneOut(visits, options);
  const before = new Map<string, number[]>();
  const after = new Map<string, number[]>();
  visits.forEach((v, i) => {
    const k = cellKey(v);
    const predicted = predictions[i]!;
    (before.get(k) ?? before.set(k, []).get(k)!).push(v.actualMinutes - v.estimatedMinutes);
    (after.get(k) ?? after.set(k, []).get(k)!).push(v.actualMinutes - predicted);
  });

  const order = (k: string) => {
    const [p, g, l] = k.split(':') as [string, string, string];
    return (
      (PROCEDURES as readonly string[]).indexOf(p) * 100 +
      (TOOTH_GROUPS as readonly string[]).indexOf(g) * 10 +
      (LEVELS as readonly string[]).indexOf(l)
    );
  };
  return [...before.keys()]
    .sort((a, b) => order(a) - order(b))
    .map((k) => {
      const [procedure, toothGroup, level] = k.split(':') as [CellAccuracy['procedure'], CellAccuracy['toothGroup'], CellAccuracy['level']];
      return {
        procedure,
        toothGroup,
        level,
        count: before.get(k)!.length,
        before: stats(before.get(k)!),
        after: stats(after.get(k)!),
      };
    });
}
