import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseReferralTeeth } from './referral-teeth.util.js';

// The 52-row ISO 3950 ⇄ Universal crosswalk (HL7 Dental Data Exchange IG, design/references.md), as
// kept beside the shared tooth-notation tests.
const rows = readFileSync(new URL('../../../shared/src/fixtures/tooth-crosswalk.csv', import.meta.url), 'utf8')
  .trim()
  .split('\n')
  .slice(1)
  .map((l) => l.split(','))
  .map(([universal, fdi]) => ({ universal: universal!, fdi: fdi! }));

describe('parseReferralTeeth', () => {
  it('reads every tooth of the crosswalk in Universal notation to its FDI form, in order, as one referral', () => {
    expect(rows).toHaveLength(52);
    const r = parseReferralTeeth(rows.map((x) => ({ tooth: x.universal })), 'universal', 'initial');
    expect(r.errors).toEqual([]);
    expect(r.teeth.map((t) => t.toothFdi)).toEqual(rows.map((x) => x.fdi));
  });

  it('keeps FDI input as it is', () => {
    const r = parseReferralTeeth(rows.map((x) => ({ tooth: x.fdi })), 'fdi', 'initial');
    expect(r.teeth.map((t) => t.toothFdi)).toEqual(rows.map((x) => x.fdi));
  });

  it('gives each case the tooth’s own procedure or the referral’s', () => {
    const r = parseReferralTeeth([{ tooth: '19' }, { tooth: '18', procedure: 'surgery' }], 'universal', 'retreatment');
    // references.md: Universal 19 → FDI 36 (verified check); 18 → 37 by the rule 17–24 → 3(25−U).
    expect(r.teeth).toEqual([
      { toothFdi: '36', procedure: 'retreatment' },
      { toothFdi: '37', procedure: 'surgery' },
    ]);
  });

  it('names each bad tooth by its position and reports every one', () => {
    const r = parseReferralTeeth([{ tooth: '19' }, { tooth: '33' }, { tooth: '' }, { tooth: 'U' }], 'universal', 'initial');
    expect(r.errors.map((e) => e.field)).toEqual(['teeth.1.tooth', 'teeth.2.tooth', 'teeth.3.tooth']);
    expect(r.teeth.map((t) => t.toothFdi)).toEqual(['36']);
    expect(parseReferralTeeth([{ tooth: '19' }], 'fdi', 'initial').errors).toEqual([{ field: 'teeth.0.tooth', message: expect.stringMatching(/not an FDI tooth number/) }]);
  });

  it('finds a tooth listed twice after conversion, naming the later one', () => {
    const r = parseReferralTeeth([{ tooth: '19' }, { tooth: '3' }, { tooth: ' #19 ' }, { tooth: '3' }], 'universal', 'initial');
    expect(r.errors).toEqual([
      { field: 'teeth.2.tooth', message: 'tooth #19 is listed twice (also teeth.0.tooth); each tooth is one case' },
      { field: 'teeth.3.tooth', message: 'tooth 3 is listed twice (also teeth.1.tooth); each tooth is one case' },
    ]);
  });
});
