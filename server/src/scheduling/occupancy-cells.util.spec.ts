import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { cellsOf, duplicateCells, onGrid, sortCells, visitCells } from './occupancy-cells.util.js';

const MIN = 60_000;
const T0 = Date.UTC(2027, 0, 4, 13, 0); // on the 5-minute grid

describe('occupancy cells', () => {
  it('covers a visit cell by cell, the chair with its turnover', () => {
    const cells = visitCells({ start: T0, end: T0 + 30 * MIN, turnoverMinutes: 10, chairId: 1, operatorId: 2, microscopeId: 3 });
    expect(cells.filter((c) => c.kind === 'chair')).toHaveLength(8); // 40 min / 5
    expect(cells.filter((c) => c.kind === 'operator')).toHaveLength(6);
    expect(cells.filter((c) => c.kind === 'microscope')).toHaveLength(6);
    expect(visitCells({ start: T0, end: T0 + 30 * MIN, turnoverMinutes: 0, chairId: 1, operatorId: 2, microscopeId: null }).some((c) => c.kind === 'microscope')).toBe(false);
  });

  it('gives two intervals a common cell exactly when they overlap (on the grid)', () => {
    const slot = fc.integer({ min: 0, max: 200 }).map((n) => T0 + n * 5 * MIN);
    const len = fc.integer({ min: 1, max: 40 }).map((n) => n * 5 * MIN);
    fc.assert(
      fc.property(slot, len, slot, len, (s1, l1, s2, l2) => {
        const a = new Set(cellsOf(s1, s1 + l1));
        const shared = cellsOf(s2, s2 + l2).some((c) => a.has(c));
        expect(shared).toBe(s1 < s2 + l2 && s2 < s1 + l1);
      }),
    );
  });

  it('rounds off-grid intervals outwards, so any overlap still shares a cell', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 100_000 }), fc.integer({ min: 1, max: 10_000 }), fc.integer({ min: 0, max: 100_000 }), fc.integer({ min: 1, max: 10_000 }), (a, la, b, lb) => {
        const s1 = T0 + a * 1000;
        const s2 = T0 + b * 1000;
        if (!(s1 < s2 + lb * 1000 && s2 < s1 + la * 1000)) return;
        const set = new Set(cellsOf(s1, s1 + la * 1000));
        expect(cellsOf(s2, s2 + lb * 1000).some((c) => set.has(c))).toBe(true);
      }),
    );
    expect(onGrid(T0)).toBe(true);
    expect(onGrid(T0 + MIN)).toBe(false);
  });

  it('orders cells the same way for every writer and finds cells claimed twice', () => {
    const a = visitCells({ start: T0, end: T0 + 10 * MIN, turnoverMinutes: 0, chairId: 2, operatorId: 1, microscopeId: null });
    const sorted = sortCells([...a].reverse());
    expect(sorted.map((c) => c.kind)).toEqual(['chair', 'chair', 'operator', 'operator']);
    expect(sorted[0]!.cellStart).toBeLessThan(sorted[1]!.cellStart);
    expect(duplicateCells([...a, a[0]!])).toEqual([a[0]]);
    expect(duplicateCells(a)).toEqual([]);
  });
});
