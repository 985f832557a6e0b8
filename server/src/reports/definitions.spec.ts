// docs/reports.md must say what the code does: every REPORT_DEFINITIONS text verbatim, and every constant
// of report-constants.ts with the value the code uses.
import { DEFAULT_LATE_CANCEL_NOTICE_HOURS, REPORT_DEFINITIONS } from '@ostium/shared';
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { DEFAULT_PRACTICE_SETTINGS } from '../practices/practices.service.js';
import { nearestRank } from './percentile.util.js';
import * as constants from './report-constants.js';

const doc = readFileSync(join(dirname(fileURLToPath(import.meta.url)), '..', '..', '..', 'docs', 'reports.md'), 'utf8');

/** The constants table: rows "| `NAME` | value | meaning |". */
function documentedConstants(): Map<string, string> {
  const out = new Map<string, string>();
  for (const m of doc.matchAll(/^\| `([A-Z_]+)` \| ([^|]+) \|/gm)) out.set(m[1]!, m[2]!.trim());
  return out;
}

const asDocumented = (v: unknown) => (Array.isArray(v) ? v.join(', ') : String(v));

describe('docs/reports.md', () => {
  it('quotes every definition word for word', () => {
    for (const [key, text] of Object.entries(REPORT_DEFINITIONS)) {
      expect(doc.includes(`> ${text}`), `REPORT_DEFINITIONS.${key} is not quoted in docs/reports.md`).toBe(true);
    }
  });

  it('states every constant of the reports with the value the code uses, and no other', () => {
    const documented = documentedConstants();
    const code = Object.entries(constants).filter(([, v]) => typeof v !== 'function');
    expect([...documented.keys()].sort()).toEqual(code.map(([k]) => k).sort());
    for (const [k, v] of code) expect(documented.get(k), k).toBe(asDocumented(v));
  });

  it('the late-cancellation default is one number everywhere: shared, the practice settings, the doc', () => {
    expect(constants.DEFAULT_LATE_CANCEL_NOTICE_HOURS).toBe(DEFAULT_LATE_CANCEL_NOTICE_HOURS);
    expect(DEFAULT_PRACTICE_SETTINGS.lateCancellationHours).toBe(DEFAULT_LATE_CANCEL_NOTICE_HOURS);
    expect(REPORT_DEFINITIONS.lateCancellation).toContain(`default ${DEFAULT_LATE_CANCEL_NOTICE_HOURS} hours`);
  });

  it('the percentile method the doc names is the one the code runs (rank ⌈P·N/100⌉)', () => {
    expect(constants.PERCENTILE_METHOD).toBe('nearest-rank');
    expect(REPORT_DEFINITIONS.leadTime).toContain('nearest rank');
    // 1..10: P90 → rank 9; median → rank 5; interpolation would give 9.1 and 5.5.
    const v = Array.from({ length: 10 }, (_, i) => i + 1);
    expect([nearestRank(v, 90), nearestRank(v, 50)]).toEqual([9, 5]);
  });
});
