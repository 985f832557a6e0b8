import { describe, expect, it } from 'vitest';
import { FACTOR_KEYS, type EstimateFacts } from '@ostium/shared';
import { DEFAULT_ESTIMATE_TABLE as T } from '@ostium/shared';
import {
  apicalOpeningLevel,
  asaClassLevel,
  checkFacts,
  curvatureLevel,
  factorCatalogue,
  resolveAssessment,
  toothLengthLevel,
} from './factors.util.js';
import { EstimateInputError } from './input-error.util.js';
import { parseFdi } from './tooth-fdi.util.js';

const th = T.thresholds;

describe('numeric facts → levels', () => {
  it('root curvature: < 10° low, 10–30° moderate, > 30° high', () => {
    // AAE case difficulty grid (older edition, from memory per references.md): < 10° low,
    // 10–30° moderate, > 30° high. Boundaries 9/10/30/31°.
    expect(curvatureLevel(9, th)).toBe('low');
    expect(curvatureLevel(10, th)).toBe('moderate');
    expect(curvatureLevel(30, th)).toBe('moderate');
    expect(curvatureLevel(31, th)).toBe('high');
    // Schneider 1971 "straight ≤ 5°" and "severe 25–70°" (verified via a textbook copy) land on the
    // grid as low and (from 31°) high; the 5–10° and 20–25° gaps get the grid's rule.
    expect(curvatureLevel(5, th)).toBe('low');
    expect(curvatureLevel(7, th)).toBe('low');
    expect(curvatureLevel(22, th)).toBe('moderate');
    expect(curvatureLevel(70, th)).toBe('high');
  });

  it('apical opening: < 1 mm low, 1–1.5 mm moderate, > 1.5 mm high', () => {
    // AAE grid (from memory per references.md): open apex > 1.5 mm high; 1.5 moderate, 1.6 high.
    expect(apicalOpeningLevel(0.9, th)).toBe('low');
    expect(apicalOpeningLevel(1, th)).toBe('moderate');
    expect(apicalOpeningLevel(1.5, th)).toBe('moderate');
    expect(apicalOpeningLevel(1.6, th)).toBe('high');
  });

  it('tooth length: over 25 mm high', () => {
    // AAE grid (from memory per references.md): "very long tooth (> 25 mm)" high; 25 not, 26 is.
    expect(toothLengthLevel(25, th)).toBe('low');
    expect(toothLengthLevel(26, th)).toBe('high');
  });

  it('ASA class: I low, II the table value, III and above high', () => {
    // AAE grid (from memory): ASA I / II / III–V; the 2022 grid may count II as low (table value).
    expect(asaClassLevel(1, 'moderate')).toBe('low');
    expect(asaClassLevel(2, 'moderate')).toBe('moderate');
    expect(asaClassLevel(2, 'low')).toBe('low');
    expect(asaClassLevel(3, 'moderate')).toBe('high');
    expect(asaClassLevel(5, 'low')).toBe('high');
  });
});

describe('resolveAssessment', () => {
  const resolve = (fdi: string, facts: EstimateFacts = {}, assessment = {}, procedure: 'initial' | 'retreatment' = 'initial') =>
    resolveAssessment(parseFdi(fdi), procedure, assessment, facts, T);

  it('derives position in the arch from the tooth when the form leaves it out', () => {
    // AAE grid (from memory): anterior/premolar low, first molar moderate, second/third molar high.
    expect(resolve('11').levels.archPosition).toBe('low');
    expect(resolve('24').levels.archPosition).toBe('low');
    expect(resolve('36').levels.archPosition).toBe('moderate');
    expect(resolve('47').levels.archPosition).toBe('high');
    expect(resolve('18').levels.archPosition).toBe('high');
    expect(resolve('47').sources.archPosition).toBe('tooth');
    // The form's rating wins when given.
    expect(resolve('47', {}, { archPosition: 'moderate' }).levels.archPosition).toBe('moderate');
  });

  it('a numeric fact sets its factor, overriding the form', () => {
    const r = resolve('11', { curvatureDegrees: 35, apicalOpeningMm: 0.5, toothLengthMm: 27 }, {
      canalMorphology: 'low',
      apicalOpening: 'high',
    });
    expect(r.levels.canalMorphology).toBe('high');
    expect(r.levels.apicalOpening).toBe('low');
    expect(r.levels.toothLength).toBe('high');
    expect(r.sources.canalMorphology).toBe('fact');
  });

  it('an S-shaped canal is high whatever the measured angle', () => {
    expect(resolve('35', { curvatureDegrees: 8, sShapedCanal: true }).levels.canalMorphology).toBe('high');
    // "Not S-shaped" alone keeps the form's rating.
    expect(resolve('35', { sShapedCanal: false }, { canalMorphology: 'moderate' }).levels.canalMorphology).toBe('moderate');
  });

  it('calcified canals, complications and retreatment raise their factors', () => {
    expect(resolve('36', { calcifiedCanals: 1 }).levels.canalVisibility).toBe('high');
    expect(resolve('36', { calcifiedCanals: 0 }, { canalVisibility: 'moderate' }).levels.canalVisibility).toBe('moderate');
    expect(resolve('36', { complications: ['ledge'] }).levels.previousTreatment).toBe('high');
    // AAE form: completed earlier treatment rates previous treatment high.
    expect(resolve('36', {}, {}, 'retreatment').levels.previousTreatment).toBe('high');
  });

  it('ASA fact follows the table value for class II', () => {
    expect(resolve('11', { asaClass: 2 }).levels.medicalHistory).toBe('moderate');
    const r = resolveAssessment(parseFdi('11'), 'initial', {}, { asaClass: 2 }, { ...T, asaClassTwoLevel: 'low' });
    expect(r.levels.medicalHistory).toBe('low');
  });
});

describe('checkFacts', () => {
  const field = (facts: unknown) => {
    try {
      checkFacts(facts);
    } catch (e) {
      expect(e).toBeInstanceOf(EstimateInputError);
      return (e as EstimateInputError).field;
    }
    return undefined;
  };

  it('names the bad fact', () => {
    expect(field({ curvatureDegrees: -1 })).toBe('facts.curvatureDegrees');
    expect(field({ curvatureDegrees: Number.NaN })).toBe('facts.curvatureDegrees');
    expect(field({ apicalOpeningMm: '1.2' })).toBe('facts.apicalOpeningMm');
    expect(field({ asaClass: 2.5 })).toBe('facts.asaClass');
    expect(field({ complications: ['crack'] })).toBe('facts.complications');
    expect(field({ acuteAbscess: 'yes' })).toBe('facts.acuteAbscess');
    expect(field({ colour: 'A2' })).toBe('facts.colour');
    expect(field({ curvatureDegrees: 12, toothLengthMm: 22 })).toBeUndefined();
  });

  it('drops repeated complications', () => {
    expect(checkFacts({ complications: ['ledge', 'ledge', 'perforation'] }).complications).toEqual(['ledge', 'perforation']);
  });
});

describe('factorCatalogue', () => {
  it('lists every factor once, in the three published groups', () => {
    const list = factorCatalogue(T);
    expect(list.map((f) => f.key)).toEqual([...FACTOR_KEYS]);
    expect(new Set(list.map((f) => f.group))).toEqual(new Set(['patient', 'tooth', 'additional']));
    expect(list.filter((f) => f.group === 'patient').map((f) => f.key)).toEqual([
      'medicalHistory', 'anaesthesia', 'disposition', 'mouthOpening', 'gagReflex', 'emergency',
    ]);
    expect(list.filter((f) => f.group === 'additional').map((f) => f.key)).toEqual([
      'traumaHistory', 'previousTreatment', 'perioEndo',
    ]);
    for (const f of list) {
      expect(f.label.length).toBeGreaterThan(2);
      expect(new Set([f.levels.low, f.levels.moderate, f.levels.high]).size).toBe(3);
    }
  });

  it('words medical history after the table value for ASA II', () => {
    const low = factorCatalogue({ asaClassTwoLevel: 'low' }).find((f) => f.key === 'medicalHistory')!;
    expect(low.levels.low).toMatch(/ASA I–II/);
    const mod = factorCatalogue(T).find((f) => f.key === 'medicalHistory')!;
    expect(mod.levels.moderate).toMatch(/ASA II/);
  });
});
