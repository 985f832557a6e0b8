import type { CellAccuracy } from '@ostium/shared';
import { describe, expect, it } from 'vitest';
import { chartData, groupImportErrors, signed, sortCells, summarise } from './accuracy.util';

const cell = (procedure: CellAccuracy['procedure'], toothGroup: CellAccuracy['toothGroup'], level: CellAccuracy['level'], count: number, mae: [number, number], bias: [number, number]): CellAccuracy => ({
  procedure,
  toothGroup,
  level,
  count,
  before: { meanAbsoluteError: mae[0], bias: bias[0] },
  after: { meanAbsoluteError: mae[1], bias: bias[1] },
});

describe('accuracy helpers', () => {
  it('weights each cell by its visits, so the summary is the mean over all visits', () => {
    const s = summarise([cell('initial', 'molar', 'low', 3, [10, 4], [6, -2]), cell('surgery', 'anterior', 'high', 1, [30, 8], [-30, 8])])!;
    expect(s.visits).toBe(4);
    expect(s.before.meanAbsoluteError).toBeCloseTo((10 * 3 + 30) / 4);
    expect(s.after.bias).toBeCloseTo((-2 * 3 + 8) / 4);
    expect(summarise([])).toBeNull();
  });

  it('orders cells procedure → tooth group → level and labels the chart rows', () => {
    const cells = [cell('surgery', 'anterior', 'low', 1, [1, 1], [0, 0]), cell('initial', 'molar', 'high', 1, [2, 1], [0, 0]), cell('initial', 'molar', 'low', 1, [3, 1], [0, 0]), cell('initial', 'anterior', 'high', 1, [4, 1], [0, 0])];
    expect(sortCells(cells).map((c) => `${c.procedure}/${c.toothGroup}/${c.level}`)).toEqual(['initial/anterior/high', 'initial/molar/low', 'initial/molar/high', 'surgery/anterior/low']);
    expect(chartData(cells, 'meanAbsoluteError')[0]).toEqual({ cell: 'Root canal therapy · anterior · high', before: 4, after: 1, visits: 1 });
  });

  it('signs a bias so the direction reads at a glance', () => {
    expect([signed(4.24), signed(-3), signed(0.04), signed(-0.04)]).toEqual(['+4.2', '−3.0', '0.0', '0.0']);
  });

  it('groups import errors per line in file order, file-level problems first', () => {
    expect(
      groupImportErrors([
        { field: 'line 12', message: 'b' },
        { field: 'line 3', message: 'a' },
        { field: 'file.columns.level', message: 'missing column' },
        { field: 'line 12', message: 'c' },
      ]),
    ).toEqual([
      { where: 'Column level', messages: ['missing column'] },
      { where: 'Line 3', messages: ['a'] },
      { where: 'Line 12', messages: ['b', 'c'] },
    ]);
  });
});
