import { LEVELS, PROCEDURES, TOOTH_GROUPS, type CellAccuracy } from '@ostium/shared';
import { PROCEDURE_LABELS } from '../case-sheet/case-sheet.util';

const rank = <T,>(list: readonly T[], v: T) => list.indexOf(v);

/** Procedure, then tooth group, then level, in the order the product lists them. */
export function sortCells(cells: CellAccuracy[]): CellAccuracy[] {
  return [...cells].sort(
    (a, b) =>
      rank(PROCEDURES, a.procedure) - rank(PROCEDURES, b.procedure) ||
      rank(TOOTH_GROUPS, a.toothGroup) - rank(TOOTH_GROUPS, b.toothGroup) ||
      rank(LEVELS, a.level) - rank(LEVELS, b.level),
  );
}

export const cellLabel = (c: CellAccuracy) => `${PROCEDURE_LABELS[c.procedure]} · ${c.toothGroup} · ${c.level}`;

export interface AccuracySummary {
  visits: number;
  /** Visit-weighted means over all cells, minutes. */
  before: { meanAbsoluteError: number; bias: number };
  after: { meanAbsoluteError: number; bias: number };
}

/** Practice-wide figures: each cell's mean weighted by its visit count, so the result is the mean over visits. */
export function summarise(cells: CellAccuracy[]): AccuracySummary | null {
  const visits = cells.reduce((s, c) => s + c.count, 0);
  if (visits === 0) return null;
  const w = (f: (c: CellAccuracy) => number) => cells.reduce((s, c) => s + f(c) * c.count, 0) / visits;
  return {
    visits,
    before: { meanAbsoluteError: w((c) => c.before.meanAbsoluteError), bias: w((c) => c.before.bias) },
    after: { meanAbsoluteError: w((c) => c.after.meanAbsoluteError), bias: w((c) => c.after.bias) },
  };
}

export type ChartMeasure = 'meanAbsoluteError' | 'bias';

export function chartData(cells: CellAccuracy[], measure: ChartMeasure) {
  return sortCells(cells).map((c) => ({ cell: cellLabel(c), before: round1(c.before[measure]), after: round1(c.after[measure]), visits: c.count }));
}

export const round1 = (n: number) => Math.round(n * 10) / 10;

/** "+4.2" / "−3.0" / "0.0": the sign says which way visits run against the estimate. */
export function signed(n: number): string {
  const r = round1(n);
  if (r === 0) return '0.0';
  return `${r > 0 ? '+' : '−'}${Math.abs(r).toFixed(1)}`;
}

/** Import errors named `line N` grouped per line, in file order; other fields (the file, a column) first. */
export function groupImportErrors(errors: { field: string; message: string }[]): { where: string; messages: string[] }[] {
  const byWhere = new Map<string, string[]>();
  for (const e of errors) byWhere.set(e.field, [...(byWhere.get(e.field) ?? []), e.message]);
  const line = (w: string) => {
    const m = /^line (\d+)$/.exec(w);
    return m ? Number(m[1]) : -1;
  };
  return [...byWhere.entries()]
    .sort(([a], [b]) => line(a) - line(b))
    .map(([where, messages]) => ({ where: where.replace(/^line /, 'Line ').replace(/^file\.columns\./, 'Column ').replace(/^file$/, 'File'), messages }));
}
