import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  COMPLICATIONS,
  FACTOR_KEYS,
  LEVELS,
  PROCEDURES,
  type EstimateFacts,
  type EstimateTable,
  type FactorKey,
  type Level,
  type Procedure,
} from '@ostium/shared';
import { DEFAULT_ESTIMATE_TABLE as T } from '@ostium/shared';
import { estimate, type EstimateInput } from './estimate.util.js';
import { EstimateInputError } from './input-error.util.js';
import { ALL_FDI_CODES } from './tooth-fdi.util.js';

const sum = (xs: { minutes: number }[]) => xs.reduce((s, x) => s + x.minutes, 0);

function fieldOf(fn: () => unknown): string | undefined {
  try {
    fn();
  } catch (e) {
    if (e instanceof EstimateInputError) return e.field;
    throw e;
  }
  return undefined;
}

function table(patch: (t: EstimateTable) => void): EstimateTable {
  const t = structuredClone(T) as EstimateTable;
  patch(t);
  return t;
}

describe("issue 4's done-when cases", () => {
  // A sharply curved (35°), calcified lower second molar with a ledge left by an earlier attempt.
  const hardMolar = (procedure: Procedure): EstimateInput => ({
    toothFdi: '37',
    procedure,
    assessment: { canalVisibility: 'high' },
    facts: { curvatureDegrees: 35, complications: ['ledge'] },
  });

  it('initial: high, two visits with a microscope, every minute in the breakdown', () => {
    const r = estimate(hardMolar('initial'));
    expect(r.level).toBe('high');
    expect(r.levelReasons).toEqual(['archPosition', 'canalMorphology', 'canalVisibility', 'previousTreatment']);
    expect(r.cbctSuggested).toBe(true);
    expect(r.canals).toBe(3);
    expect(r.canalsAssumed).toBe(true);
    // 90 base × 1.5 = 135, + calcified 15 + ledge 30 + curvature 15 = 195 > 120 → two visits.
    expect(r.breakdown.map((l) => l.minutes)).toEqual([90, 45, 15, 30, 15, 0]);
    expect(r.breakdown[5]!.label).toMatch(/Split into 2 visits/);
    expect(r.totalMinutes).toBe(195);
    expect(sum(r.breakdown)).toBe(r.totalMinutes);
    expect(r.visits.map((v) => v.minutes)).toEqual([100, 95]);
    expect(r.visits.every((v) => v.needsMicroscope)).toBe(true);
    expect(r.visits[0]!.purpose).toMatch(/shaping; calcium hydroxide/);
    expect(r.visits[1]!.purpose).toMatch(/filling/);
    // Sjögren et al. 1991 (references.md): at least 7 days of calcium hydroxide between visits.
    expect(r.visits[1]!.earliestDaysAfterPrevious).toBe(7);
    expect(r.visits[1]!.latestDaysAfterPrevious).toBe(21);
    expect(r.visits.map((v) => v.turnoverMinutes)).toEqual([10, 10]);
    expect(r.recallMonths).toEqual([6, 12]);
    expect(r.tableVersion).toBe(1);
  });

  it('retreatment: high, two visits with a microscope, every minute in the breakdown', () => {
    const r = estimate(hardMolar('retreatment'));
    expect(r.level).toBe('high');
    // 135 + removal 40 + calcified 15 + ledge 30 + curvature 15 = 235 → 120 + 115.
    expect(r.breakdown.map((l) => [l.label.split(':')[0], l.minutes])).toEqual([
      ['Base', 90],
      ['Difficulty high', 45],
      ['Removal of the earlier root filling', 40],
      ['1 calcified canal (+15 each, at most +45)', 15],
      ['Complication from an earlier attempt', 30],
      ['Severe curvature (over 30° or S-shaped)', 15],
      [expect.stringMatching(/^Split into 2 visits \(retreatment rule; longer than/), 0],
    ]);
    expect(r.totalMinutes).toBe(235);
    expect(sum(r.breakdown)).toBe(235);
    expect(r.visits.map((v) => v.minutes)).toEqual([120, 115]);
    expect(r.visits.every((v) => v.needsMicroscope)).toBe(true);
    expect(r.trayList.map((t) => t.label)).toContain('Root-filling removal files');
  });

  it('a straight upper central incisor, initial: low, one visit, no microscope', () => {
    const r = estimate({ toothFdi: '11', procedure: 'initial', facts: { curvatureDegrees: 3 } });
    expect(r.level).toBe('low');
    expect(r.levelReasons).toEqual([]);
    expect(r.cbctSuggested).toBe(false);
    expect(r.canals).toBe(1);
    expect(r.visits).toHaveLength(1);
    expect(r.visits[0]).toMatchObject({ index: 1, minutes: 60, needsMicroscope: false, turnoverMinutes: 10 });
    expect(r.visits[0]!.earliestDaysAfterPrevious).toBeUndefined();
    expect(r.totalMinutes).toBe(60);
    expect(r.breakdown).toEqual([
      { label: 'Base: root canal treatment, anterior tooth, up to 1 canal', minutes: 60 },
      { label: 'Difficulty low: ×1', minutes: 0 },
    ]);
    expect(r.notes).toEqual([]);
  });
});

describe('estimate: base, canals, tiers, add-ons', () => {
  it('adds 15 per canal beyond the group base and rounds on the grid (upper first molar, MB2)', () => {
    const r = estimate({ toothFdi: '16', procedure: 'initial' });
    // 16: usual 4 canals (Vertucci 1984 / Martins 2018), moderate by position; (90 + 15) × 1.25 = 131.25.
    expect(r.canals).toBe(4);
    expect(r.level).toBe('moderate');
    expect(r.breakdown.map((l) => l.minutes)).toEqual([90, 15, 26, 0, 4]);
    expect(r.breakdown[4]!.label).toBe('Rounded up to the 5-minute booking grid');
    expect(r.totalMinutes).toBe(135);
    expect(r.visits.map((v) => v.minutes)).toEqual([70, 65]);
    // Any maxillary molar gets the microscope (practice rule).
    expect(r.visits[0]!.needsMicroscope).toBe(true);
  });

  it('uses an entered canal count and says it is not assumed', () => {
    const r = estimate({ toothFdi: '36', procedure: 'initial', canals: 4 });
    expect(r.canalsAssumed).toBe(false);
    expect(r.breakdown[1]).toEqual({ label: '1 canal beyond the base (+15 each)', minutes: 15 });
  });

  it('caps the calcified-canal add-on at +45', () => {
    const r = estimate({ toothFdi: '36', procedure: 'initial', canals: 4, facts: { calcifiedCanals: 4 } });
    expect(r.breakdown.find((l) => l.label.startsWith('4 calcified canals'))!.minutes).toBe(45);
  });

  it('adds limited opening and patient management once each', () => {
    const r = estimate({
      toothFdi: '21',
      procedure: 'initial',
      assessment: { mouthOpening: 'moderate', disposition: 'moderate' },
      facts: { asaClass: 3 },
    });
    const labels = r.breakdown.map((l) => l.label);
    expect(labels).toContain('Limited mouth opening');
    expect(labels).toContain('Anxious and medically complex patient');
    // 60 × 1.5 (ASA III is high) + 10 + 10 = 110.
    expect(r.totalMinutes).toBe(110);
  });

  it('prices surgery, consultation and emergency from their own bases', () => {
    expect(estimate({ toothFdi: '12', procedure: 'surgery' }).totalMinutes).toBe(90);
    expect(estimate({ toothFdi: '12', procedure: 'consult', assessment: { resorption: 'high' } }).totalMinutes).toBe(30);
    expect(estimate({ toothFdi: '12', procedure: 'emergency' }).totalMinutes).toBe(45);
    const surgery = estimate({ toothFdi: '47', procedure: 'surgery' });
    // 120 × 1.5: one sitting past the longest visit, with a note, never split.
    expect(surgery.visits).toHaveLength(1);
    expect(surgery.totalMinutes).toBe(180);
    expect(surgery.notes[0]).toMatch(/one sitting of 180 min/);
    expect(surgery.trayList.map((t) => t.label)).toContain('Micro-mirrors');
  });

  it('plans three visits when even two would pass the longest visit', () => {
    const r = estimate({
      toothFdi: '17',
      procedure: 'retreatment',
      canals: 5,
      assessment: { mouthOpening: 'high', disposition: 'high', canalVisibility: 'high' },
      facts: { curvatureDegrees: 40, complications: ['perforation'], calcifiedCanals: 3 },
    });
    // (90 + 30) × 1.5 = 180 + 40 + 45 + 30 + 15 + 10 + 10 = 330.
    expect(r.totalMinutes).toBe(330);
    expect(r.visits.map((v) => v.minutes)).toEqual([110, 110, 110]);
    expect(r.visits[1]!.purpose).toMatch(/continued/);
  });
});

describe('estimate: visit rules', () => {
  it('splits an acute abscess case (fact or severe swelling) into two visits', () => {
    const fact = estimate({ toothFdi: '21', procedure: 'initial', facts: { acuteAbscess: true } });
    expect(fact.visits.map((v) => v.minutes)).toEqual([30, 30]);
    expect(fact.breakdown.at(-1)!.label).toMatch(/acute abscess/);
    const swelling = estimate({ toothFdi: '21', procedure: 'initial', assessment: { emergency: 'high' } });
    expect(swelling.visits.map((v) => v.minutes)).toEqual([45, 45]);
    // An emergency visit itself stays one visit.
    expect(estimate({ toothFdi: '21', procedure: 'emergency', facts: { acuteAbscess: true } }).visits).toHaveLength(1);
  });

  it('honours a practice rule by level', () => {
    const t = table((x) => {
      x.twoVisit.levels = ['moderate'];
    });
    expect(estimate({ toothFdi: '36', procedure: 'initial' }, t).visits).toHaveLength(2);
    expect(estimate({ toothFdi: '34', procedure: 'initial' }, t).visits).toHaveLength(1);
  });

  it('adds set-up minutes per added visit when the practice sets them', () => {
    const t = table((x) => {
      x.twoVisit.addedVisitSetupMinutes = 15;
    });
    const r = estimate({ toothFdi: '21', procedure: 'retreatment' }, t);
    // 60 × 1.5 (retreatment: previous treatment high) + 40 = 130, + 15 set-up = 145.
    expect(r.totalMinutes).toBe(145);
    expect(r.breakdown.at(-1)).toEqual({ label: expect.stringMatching(/\+15 set-up/), minutes: 15 });
  });

  it('microscope rules: level, procedure, calcified canals, maxillary molars; never for a consultation', () => {
    expect(estimate({ toothFdi: '14', procedure: 'initial' }).visits[0]!.needsMicroscope).toBe(false);
    expect(estimate({ toothFdi: '26', procedure: 'initial' }).visits[0]!.needsMicroscope).toBe(true);
    expect(estimate({ toothFdi: '26', procedure: 'consult' }).visits[0]!.needsMicroscope).toBe(false);
    expect(estimate({ toothFdi: '12', procedure: 'surgery' }).visits[0]!.needsMicroscope).toBe(true);
    const noLevels = table((x) => {
      x.microscope.levels = [];
    });
    expect(estimate({ toothFdi: '31', procedure: 'initial', facts: { calcifiedCanals: 1 } }, noLevels).visits[0]!.needsMicroscope).toBe(true);
    expect(estimate({ toothFdi: '31', procedure: 'initial', assessment: { resorption: 'high' } }, noLevels).visits[0]!.needsMicroscope).toBe(false);
  });

  it('gives no recall after a consultation or an emergency visit', () => {
    expect(estimate({ toothFdi: '11', procedure: 'consult' }).recallMonths).toEqual([]);
    expect(estimate({ toothFdi: '11', procedure: 'emergency' }).recallMonths).toEqual([]);
    // ESE 2006 quality guidelines: review at one year at least.
    expect(estimate({ toothFdi: '11', procedure: 'surgery' }).recallMonths).toContain(12);
  });
});

describe('estimate: tray list', () => {
  it('low case: glide-path files 08/10/15 with ISO colours, low shaping set, no flexible files', () => {
    const r = estimate({ toothFdi: '11', procedure: 'initial' });
    const glide = r.trayList.filter((t) => t.label.startsWith('Stainless steel hand file'));
    // ISO 3630-1 colours (Qualtrough et al. 2005, references.md): 08 grey, 10 purple, 15 white.
    expect(glide).toEqual([
      { label: 'Stainless steel hand file (glide path)', size: 8, taper: 0.02, colour: 'grey' },
      { label: 'Stainless steel hand file (glide path)', size: 10, taper: 0.02, colour: 'purple' },
      { label: 'Stainless steel hand file (glide path)', size: 15, taper: 0.02, colour: 'white' },
    ]);
    expect(r.trayList.filter((t) => t.label === 'Shaping file').map((t) => t.size)).toEqual([20, 25, 30, 35]);
    expect(r.trayList.some((t) => t.label.startsWith('Heat-treated'))).toBe(false);
    expect(r.trayList.some((t) => t.label === 'Calcium hydroxide dressing')).toBe(false);
  });

  it('curved or high case gets heat-treated apical files; a two-visit plan the dressing', () => {
    const r = estimate({ toothFdi: '37', procedure: 'initial', facts: { curvatureDegrees: 35 } });
    const flex = r.trayList.filter((t) => t.label.startsWith('Heat-treated'));
    expect(flex.map((t) => [t.size, t.colour])).toEqual([[20, 'yellow'], [25, 'red']]);
    expect(r.visits.length).toBe(2);
    expect(r.trayList.some((t) => t.label === 'Calcium hydroxide dressing')).toBe(true);
    const curvedOnly = estimate({ toothFdi: '34', procedure: 'initial', facts: { curvatureDegrees: 20 } });
    expect(curvedOnly.trayList.some((t) => t.label.startsWith('Heat-treated'))).toBe(true);
  });

  it('consultation tray has no files', () => {
    const r = estimate({ toothFdi: '46', procedure: 'consult' });
    expect(r.trayList.every((t) => t.size === undefined)).toBe(true);
  });
});

describe('estimate: calibration', () => {
  it('applies a fixed multiplier as its own breakdown line, then rounds', () => {
    const r = estimate({ toothFdi: '11', procedure: 'initial' }, T, { multiplier: 1.2, band: { lowFactor: 0.8, highFactor: 1.3 } });
    expect(r.breakdown.map((l) => l.minutes)).toEqual([60, 0, 12, 3]);
    expect(r.breakdown[2]!.label).toBe('Calibration from completed visits: ×1.2');
    expect(r.totalMinutes).toBe(75);
    expect(r.band).toEqual({ low: 60, high: 100 });
  });

  it('looks the calibration up by the cell the estimate falls in', () => {
    const seen: unknown[] = [];
    const r = estimate({ toothFdi: '47', procedure: 'initial' }, T, (cell) => {
      seen.push(cell);
      return { multiplier: 0.8 };
    });
    expect(seen).toEqual([{ procedure: 'initial', toothGroup: 'molar', level: 'high' }]);
    // 90 × 1.5 = 135 × 0.8 = 108 → 110, one visit now.
    expect(r.totalMinutes).toBe(110);
    expect(r.visits).toHaveLength(1);
    expect(r.band).toBeUndefined();
  });

  it('rejects a non-positive multiplier', () => {
    expect(fieldOf(() => estimate({ toothFdi: '11', procedure: 'initial' }, T, { multiplier: 0 }))).toBe('calibration.multiplier');
  });
});

describe('estimate: input errors name the field', () => {
  it.each([
    [{ toothFdi: '19', procedure: 'initial' }, 'tooth'],
    [{ toothFdi: '11', procedure: 'whitening' }, 'procedure'],
    [{ toothFdi: '11', procedure: 'initial', canals: 0 }, 'canals'],
    [{ toothFdi: '11', procedure: 'initial', canals: 2.5 }, 'canals'],
    [{ toothFdi: '11', procedure: 'initial', canals: 9 }, 'canals'],
    [{ toothFdi: '11', procedure: 'initial', assessment: { gagReflex: 'extreme' } }, 'assessment.gagReflex'],
    [{ toothFdi: '11', procedure: 'initial', assessment: { shade: 'low' } }, 'assessment.shade'],
    [{ toothFdi: '11', procedure: 'initial', facts: { calcifiedCanals: 2 } }, 'facts.calcifiedCanals'],
    [{ toothFdi: '11', procedure: 'initial', facts: { toothLengthMm: 0 } }, 'facts.toothLengthMm'],
  ])('%o → %s', (input, field) => {
    expect(fieldOf(() => estimate(input as unknown as EstimateInput))).toBe(field);
  });

  it('rejects a broken table', () => {
    expect(fieldOf(() => estimate({ toothFdi: '11', procedure: 'initial' }, table((t) => { t.gridMinutes = 0; })))).toBe('table.gridMinutes');
    expect(fieldOf(() => estimate({ toothFdi: '11', procedure: 'initial' }, table((t) => { t.tierMultiplier.high = 1.1; })))).toBe('table.tierMultiplier');
  });
});

// ---- properties ------------------------------------------------------------------------------------

const levelArb = fc.constantFrom<Level>(...LEVELS);
const assessmentArb = fc.record(
  Object.fromEntries(FACTOR_KEYS.map((k) => [k, levelArb])) as Record<FactorKey, fc.Arbitrary<Level>>,
  { requiredKeys: [] },
);
const factsArb: fc.Arbitrary<EstimateFacts> = fc.record(
  {
    curvatureDegrees: fc.double({ min: 0, max: 80, noNaN: true }),
    sShapedCanal: fc.boolean(),
    apicalOpeningMm: fc.double({ min: 0, max: 3, noNaN: true }),
    toothLengthMm: fc.double({ min: 15, max: 35, noNaN: true }),
    asaClass: fc.integer({ min: 1, max: 5 }),
    // At most 1 so it never exceeds the canal count of any tooth.
    calcifiedCanals: fc.integer({ min: 0, max: 1 }),
    complications: fc.subarray([...COMPLICATIONS]),
    acuteAbscess: fc.boolean(),
  },
  { requiredKeys: [] },
);
const caseArb: fc.Arbitrary<EstimateInput> = fc.record(
  {
    toothFdi: fc.constantFrom(...ALL_FDI_CODES),
    procedure: fc.constantFrom<Procedure>(...PROCEDURES),
    canals: fc.integer({ min: 1, max: 6 }),
    assessment: assessmentArb,
    facts: factsArb,
  },
  { requiredKeys: ['toothFdi', 'procedure'] },
);
const tableArb: fc.Arbitrary<EstimateTable> = fc
  .record({
    grid: fc.constantFrom(5, 10, 15),
    longest: fc.constantFrom(60, 90, 100, 120, 150, 180),
    setup: fc.constantFrom(0, 5, 10, 15),
    split: fc.subarray(['initial', 'retreatment', 'surgery', 'consult', 'emergency'] as Procedure[]),
  })
  .map(({ grid, longest, setup, split }) =>
    table((t) => {
      t.gridMinutes = grid;
      t.longestVisitMinutes = longest;
      t.twoVisit.addedVisitSetupMinutes = Math.min(setup, longest / 2 - 1);
      t.twoVisit.splittableProcedures = split;
    }),
  );
const multiplierArb = fc.option(fc.double({ min: 0.5, max: 2, noNaN: true }), { nil: undefined });
const RUNS = { numRuns: 500 };

describe('estimate: properties (fast-check)', () => {
  it('raising any factor one level never shortens the estimate', () => {
    fc.assert(
      fc.property(caseArb, fc.constantFrom(...FACTOR_KEYS), multiplierArb, (input, key, m) => {
        const cal = m === undefined ? undefined : { multiplier: m };
        const a = estimate(input, T, cal);
        // Raise from the level in force (a tooth-derived position may already be above the form's).
        const current = a.assessment[key];
        fc.pre(current !== 'high');
        const raised: EstimateInput = {
          ...input,
          assessment: { ...input.assessment, [key]: current === 'low' ? 'moderate' : 'high' },
        };
        const b = estimate(raised, T, cal);
        expect(b.totalMinutes).toBeGreaterThanOrEqual(a.totalMinutes);
        expect(LEVELS.indexOf(b.level)).toBeGreaterThanOrEqual(LEVELS.indexOf(a.level));
        expect(b.visits.length).toBeGreaterThanOrEqual(a.visits.length);
      }),
      RUNS,
    );
  });

  it('the breakdown adds up exactly to totalMinutes, which is the sum of the visits', () => {
    fc.assert(
      fc.property(caseArb, tableArb, multiplierArb, (input, t, m) => {
        const r = estimate(input, t, m === undefined ? undefined : { multiplier: m });
        expect(r.breakdown.every((l) => Number.isInteger(l.minutes))).toBe(true);
        expect(sum(r.breakdown)).toBe(r.totalMinutes);
        expect(sum(r.visits)).toBe(r.totalMinutes);
      }),
      RUNS,
    );
  });

  it('every visit is a positive multiple of the grid and at most the longest visit (one-sitting procedures excepted)', () => {
    fc.assert(
      fc.property(caseArb, tableArb, multiplierArb, (input, t, m) => {
        const r = estimate(input, t, m === undefined ? undefined : { multiplier: m });
        for (const v of r.visits) {
          expect(v.minutes).toBeGreaterThan(0);
          expect(v.minutes % t.gridMinutes).toBe(0);
          expect(v.turnoverMinutes).toBe(t.turnoverMinutes);
        }
        if (t.twoVisit.splittableProcedures.includes(input.procedure)) {
          for (const v of r.visits) expect(v.minutes).toBeLessThanOrEqual(t.longestVisitMinutes);
        } else {
          expect(r.visits).toHaveLength(1);
          expect(r.notes.length > 0).toBe(r.totalMinutes > t.longestVisitMinutes);
        }
      }),
      RUNS,
    );
  });

  it('later visits come at least 7 days after the previous one', () => {
    fc.assert(
      fc.property(caseArb, tableArb, (input, t) => {
        const r = estimate(input, t);
        r.visits.forEach((v, i) => {
          expect(v.index).toBe(i + 1);
          if (i === 0) {
            expect(v.earliestDaysAfterPrevious).toBeUndefined();
          } else {
            // Sjögren et al., Int Endod J 1991 (references.md): 7-day calcium hydroxide dressing.
            expect(v.earliestDaysAfterPrevious).toBeGreaterThanOrEqual(7);
            expect(v.latestDaysAfterPrevious).toBeGreaterThanOrEqual(v.earliestDaysAfterPrevious!);
          }
        });
        if (input.procedure === 'retreatment' && t.twoVisit.splittableProcedures.includes('retreatment')) {
          expect(r.visits.length).toBeGreaterThanOrEqual(2);
        }
      }),
      RUNS,
    );
  });
});
