import { describe, expect, it } from 'vitest';
import { cleanFacts, draftErrors, draftFromCase, factNote, overrideErrors, patchBody, previewRequest, rowState, toothName } from './case-sheet.util';
import { caseSheet, estimate, FACTORS } from './test/case-sheet.fixtures';

const def = (key: string) => FACTORS.find((f) => f.key === key)!;

describe('case sheet helpers', () => {
  it('leaves empty and "nothing found" facts out of the request', () => {
    expect(cleanFacts({ curvatureDegrees: 0, calcifiedCanals: 0, complications: [], sShapedCanal: false, acuteAbscess: false })).toEqual({ curvatureDegrees: 0 });
    // Complications keep the shared order whatever order they were ticked in.
    expect(cleanFacts({ complications: ['separated-instrument', 'ledge'], toothLengthMm: 26 })).toEqual({ toothLengthMm: 26, complications: ['ledge', 'separated-instrument'] });
  });

  it('names the tooth and leaves the canal count to the server when blank', () => {
    const d = draftFromCase(caseSheet({ assessment: { isolation: 'high' }, operatorId: 4 }));
    expect(previewRequest('36', d)).toEqual({ tooth: '36', notation: 'fdi', procedure: 'initial', assessment: { isolation: 'high' }, facts: {}, operatorId: 4 });
    expect(previewRequest('36', { ...d, canals: 4 }).canals).toBe(4);
  });

  it('sends the override only for someone who may adjust, and only when it changed', () => {
    const d = { ...draftFromCase(caseSheet()), override: { minutesPerVisit: [90, 60], reason: '  long roots  ' } };
    expect(patchBody(d, true).override).toEqual({ minutesPerVisit: [90, 60], reason: 'long roots' });
    expect('override' in patchBody(d, false)).toBe(false);
    expect('override' in patchBody({ ...d, override: undefined }, true)).toBe(false);
    expect(patchBody({ ...d, override: null }, true).override).toBeNull();
    expect(patchBody(d, true).markPlanned).toBe(true);
  });

  it('says which fact set a row', () => {
    expect(factNote('canalMorphology', { curvatureDegrees: 35 }, 'initial')).toBe('set by curvature 35°');
    expect(factNote('canalMorphology', { sShapedCanal: true }, 'initial')).toBe('set by S-shaped canal');
    expect(factNote('apicalOpening', { apicalOpeningMm: 1.6 }, 'initial')).toBe('set by apical opening 1.6 mm');
    expect(factNote('medicalHistory', { asaClass: 3 }, 'initial')).toBe('set by ASA class III');
    expect(factNote('canalVisibility', { calcifiedCanals: 0 }, 'initial')).toBeUndefined();
    expect(factNote('previousTreatment', { complications: ['ledge'] }, 'initial')).toBe('set by ledge');
    expect(factNote('previousTreatment', {}, 'retreatment')).toBe('set by the procedure (retreatment)');
    expect(factNote('isolation', { curvatureDegrees: 35 }, 'initial')).toBeUndefined();
  });

  it('shows the derived level in a fact row, the rating otherwise, and the tooth-derived position', () => {
    const d = { ...draftFromCase(caseSheet()), facts: { curvatureDegrees: 35 }, assessment: { canalMorphology: 'low' as const, isolation: 'moderate' as const } };
    const r = estimate({ assessment: { ...estimate().assessment, canalMorphology: 'high', isolation: 'moderate' } });
    expect(rowState(def('canalMorphology'), d, r, '19')).toEqual({ value: 'high', readOnly: true, note: 'set by curvature 35°' });
    expect(rowState(def('isolation'), d, r, '19')).toEqual({ value: 'moderate', readOnly: false, note: undefined });
    expect(rowState(def('archPosition'), d, r, '19')).toEqual({ value: 'moderate', readOnly: false, note: 'from tooth 19' });
  });

  it('catches inputs outside the plausible range before they are sent', () => {
    const d = draftFromCase(caseSheet());
    expect(draftErrors({ ...d, canals: 0, facts: { curvatureDegrees: 200, asaClass: 2.5 } })).toEqual({
      canals: 'From 1 to 8',
      'facts.curvatureDegrees': 'From 0 to 180',
      'facts.asaClass': 'A whole number',
    });
    expect(draftErrors({ ...d, facts: { calcifiedCanals: 4 } }, 3)).toEqual({ 'facts.calcifiedCanals': 'More than the 3 canals of the case' });
    expect(draftErrors(d, 3)).toEqual({});
  });

  it('requires a reason and whole minutes for an adjustment', () => {
    expect(overrideErrors([90, ''], ' ')).toEqual({ 'override.minutesPerVisit.1': 'Whole minutes from 5 to 600', 'override.reason': 'Give the reason for the change' });
    expect(overrideErrors([90, 60], 'long roots')).toEqual({});
  });

  it('names teeth as the chart does', () => {
    // FDI 36 is the lower left first molar, 55 the upper right primary second molar (ISO 3950).
    expect(toothName('36')).toBe('lower left first molar');
    expect(toothName('55')).toBe('upper right primary second molar');
  });
});
