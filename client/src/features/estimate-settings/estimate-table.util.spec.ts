import { describe, expect, it } from 'vitest';
import { serverFieldErrors, validateTable } from './estimate-table.util';
import { table } from './test/estimate-table.fixtures';

describe('validateTable', () => {
  it('accepts the default table', () => {
    expect(validateTable(table())).toEqual({});
  });

  it('names each bad number by its path, with the server’s bounds', () => {
    const t = table();
    t.gridMinutes = 0;
    t.base.surgery.molar = -1;
    t.canalsIncluded.anterior = 1.5;
    t.calibration.bookingQuantile = 1;
    t.calibration.ratioClip = 1;
    t.interval.maxDays = 5;
    expect(validateTable(t)).toEqual({
      gridMinutes: 'A whole number > 0',
      'base.surgery.molar': 'A number ≥ 0',
      'canalsIncluded.anterior': 'A whole number ≥ 1',
      'calibration.bookingQuantile': 'A number > 0 and < 1',
      'calibration.ratioClip': 'A number > 1',
      'interval.maxDays': 'At least the earliest day',
    });
  });

  it('keeps the cross-field rules: monotone tiers, set-up under half a visit, thresholds in order', () => {
    const t = table();
    t.tierMultiplier.moderate = 1.6;
    t.twoVisit.addedVisitSetupMinutes = 60;
    t.thresholds.curvatureHighAboveDegrees = 5;
    t.recall.months = [0];
    expect(Object.keys(validateTable(t)).sort()).toEqual(['recall.months', 'thresholds.curvatureHighAboveDegrees', 'tierMultiplier', 'twoVisit.addedVisitSetupMinutes']);
  });

  it('strips the table. prefix of server errors and joins two on one field', () => {
    expect(serverFieldErrors([
      { field: 'table.gridMinutes', message: 'a' },
      { field: 'table.gridMinutes', message: 'b' },
      { field: 'tierMultiplier', message: 'c' },
    ])).toEqual({ gridMinutes: 'a; b', tierMultiplier: 'c' });
  });
});
