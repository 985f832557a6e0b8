import { describe, expect, it } from 'vitest';
import { FACTOR_KEYS, type FactorKey, type Level } from '@ostium/shared';
import { combine } from './difficulty.util.js';
import { EstimateInputError } from './input-error.util.js';

function allLow(): Record<FactorKey, Level> {
  return Object.fromEntries(FACTOR_KEYS.map((k) => [k, 'low'])) as Record<FactorKey, Level>;
}

// Combination rule checks: AAE Endodontic Case Difficulty Assessment Form and Guidelines, 2022 edition
// (references.md, "verified"): low = only low factors; moderate = one or two moderate factors;
// high = three or more moderate factors, or at least one high factor.
describe('combine (AAE 2022 case difficulty rule)', () => {
  it('no moderate or high factor → low, no CBCT flag', () => {
    // AAE 2022 form: all criteria low → low difficulty.
    expect(combine(allLow())).toEqual({ level: 'low', levelReasons: [], cbctSuggested: false });
    expect(combine({})).toEqual({ level: 'low', levelReasons: [], cbctSuggested: false });
    expect(combine(undefined).level).toBe('low');
  });

  it('one moderate factor → moderate, CBCT suggested', () => {
    // AAE 2022 form: one or two moderate → moderate; the form suggests CBCT for moderate cases.
    const r = combine({ ...allLow(), mouthOpening: 'moderate' });
    expect(r).toEqual({ level: 'moderate', levelReasons: ['mouthOpening'], cbctSuggested: true });
  });

  it('two moderate factors → moderate', () => {
    // AAE 2022 form: one or two moderate → moderate.
    const r = combine({ gagReflex: 'moderate', canalMorphology: 'moderate' });
    expect(r.level).toBe('moderate');
    expect(r.levelReasons).toEqual(['gagReflex', 'canalMorphology']);
  });

  it('three moderate factors → high, the three listed', () => {
    // AAE 2022 form: three or more moderate → high.
    const r = combine({ disposition: 'moderate', archPosition: 'moderate', perioEndo: 'moderate' });
    expect(r).toEqual({
      level: 'high',
      levelReasons: ['disposition', 'archPosition', 'perioEndo'],
      cbctSuggested: true,
    });
  });

  it('one high factor → high, listing only the high factor(s) as the reason', () => {
    // AAE 2022 form: at least one high → high; CBCT suggested for high cases.
    const r = combine({ ...allLow(), resorption: 'high', gagReflex: 'moderate' });
    expect(r).toEqual({ level: 'high', levelReasons: ['resorption'], cbctSuggested: true });
  });

  it('counts every factor the same: any single key raised to moderate gives moderate', () => {
    for (const key of FACTOR_KEYS) {
      expect(combine({ [key]: 'moderate' }).level).toBe('moderate');
      expect(combine({ [key]: 'high' }).level).toBe('high');
    }
  });

  it('rejects an unknown factor with a typed error naming assessment.<key>', () => {
    const attempt = () => combine({ toothColour: 'low' } as unknown as Record<FactorKey, Level>);
    expect(attempt).toThrow(EstimateInputError);
    try {
      attempt();
      expect.unreachable();
    } catch (e) {
      expect((e as EstimateInputError).field).toBe('assessment.toothColour');
    }
  });

  it('rejects an invalid level naming the field', () => {
    try {
      combine({ gagReflex: 'severe' as Level });
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(EstimateInputError);
      expect((e as EstimateInputError).field).toBe('assessment.gagReflex');
    }
  });

  it('rejects a non-object assessment', () => {
    expect(() => combine(['low'] as unknown as Record<FactorKey, Level>)).toThrow(/assessment/);
  });
});
