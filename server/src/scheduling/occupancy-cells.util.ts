// The occupancy grid of the booking guard: every resource a visit uses is claimed cell by cell, and the
// table's unique key (resource_kind, resource_id, cell_start) lets only one booking own a cell.

export const CELL_MINUTES = 5;
const CELL_MS = CELL_MINUTES * 60_000;

export type ResourceKind = 'chair' | 'operator' | 'microscope';

export interface OccupancyCell {
  kind: ResourceKind;
  resourceId: number;
  /** Epoch ms UTC, a multiple of the cell length. */
  cellStart: number;
}

export interface VisitResources {
  start: number;
  end: number;
  turnoverMinutes: number;
  chairId: number;
  operatorId: number;
  microscopeId: number | null;
}

/** Whether an instant lies on the cell grid (5-minute boundaries line up in every whole-quarter-hour zone). */
export const onGrid = (t: number) => t % CELL_MS === 0;

/** The cells [start, end) covers, rounded outwards so any overlap in time shares at least one cell. */
export function cellsOf(start: number, end: number): number[] {
  const out: number[] = [];
  for (let t = Math.floor(start / CELL_MS) * CELL_MS; t < end; t += CELL_MS) out.push(t);
  return out;
}

/** Every cell one visit claims: the chair including its turnover, the operator and the microscope without. */
export function visitCells(v: VisitResources): OccupancyCell[] {
  const out: OccupancyCell[] = [];
  for (const t of cellsOf(v.start, v.end + v.turnoverMinutes * 60_000)) out.push({ kind: 'chair', resourceId: v.chairId, cellStart: t });
  for (const t of cellsOf(v.start, v.end)) out.push({ kind: 'operator', resourceId: v.operatorId, cellStart: t });
  if (v.microscopeId !== null) for (const t of cellsOf(v.start, v.end)) out.push({ kind: 'microscope', resourceId: v.microscopeId, cellStart: t });
  return out;
}

const KIND_ORDER: Record<ResourceKind, number> = { chair: 0, operator: 1, microscope: 2 };

/** Cells in one fixed global order, so concurrent writers take the key locks in the same sequence. */
export function sortCells(cells: OccupancyCell[]): OccupancyCell[] {
  return [...cells].sort((a, b) => KIND_ORDER[a.kind] - KIND_ORDER[b.kind] || a.resourceId - b.resourceId || a.cellStart - b.cellStart);
}

/** Cells claimed twice within one request (e.g. a series whose two visits overlap on the same chair). */
export function duplicateCells(cells: readonly OccupancyCell[]): OccupancyCell[] {
  const seen = new Set<string>();
  const dup: OccupancyCell[] = [];
  for (const c of cells) {
    const k = `${c.kind}|${c.resourceId}|${c.cellStart}`;
    if (seen.has(k)) dup.push(c);
    else seen.add(k);
  }
  return dup;
}
