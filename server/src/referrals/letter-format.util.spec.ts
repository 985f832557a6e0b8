import { describe, expect, it } from 'vitest';
import { contactPhrase, longDate, toothWords } from './letter-format.util.js';

describe('letter wording', () => {
  it('names the tooth by Universal number, FDI beside it, and in words', () => {
    // ISO 3950 / HL7 crosswalk checks (references.md): 19 → 36, 30 → 46, 8 → 11, A → 55.
    expect(toothWords('36')).toBe('#19 (FDI 36), mandibular left first molar');
    expect(toothWords('46')).toBe('#30 (FDI 46), mandibular right first molar');
    expect(toothWords('11')).toBe('#8 (FDI 11), maxillary right central incisor');
    expect(toothWords('55')).toBe('#A (FDI 55), maxillary right primary second molar');
  });

  it('writes dates with the weekday and the practice contact as a phrase', () => {
    expect(longDate('2026-12-14')).toBe('Monday 14 December 2026');
    expect(contactPhrase({ phone: '+12025550100', email: 'desk@quillfern-endo.test' }, { phone: null })).toBe('phone (202) 555-0100, e-mail desk@quillfern-endo.test');
    expect(contactPhrase({ phone: null, email: null }, { phone: null })).toBe('');
  });
});
