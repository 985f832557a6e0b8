import { describe, expect, it } from 'vitest';
import { countSegments } from './segments.js';

// 3GPP TS 23.038 (GSM-7 default alphabet and extension table) and TS 23.040 concatenation: 160 septets
// or 70 UCS-2 units in one segment, 153 / 67 per part when split (common practice, no source for the split sizes).
describe('countSegments', () => {
  it('counts GSM-7 texts by septets', () => {
    expect(countSegments('')).toEqual({ encoding: 'GSM-7', segments: 0 });
    expect(countSegments('a'.repeat(160))).toEqual({ encoding: 'GSM-7', segments: 1 });
    expect(countSegments('a'.repeat(161))).toEqual({ encoding: 'GSM-7', segments: 2 });
    expect(countSegments('a'.repeat(306))).toEqual({ encoding: 'GSM-7', segments: 2 });
    expect(countSegments('a'.repeat(307))).toEqual({ encoding: 'GSM-7', segments: 3 });
  });

  it('counts extension characters (€ [ ] { } ~ ^ | \\) as two septets and keeps them whole', () => {
    expect(countSegments('€'.repeat(80))).toEqual({ encoding: 'GSM-7', segments: 1 });
    expect(countSegments('€'.repeat(81))).toEqual({ encoding: 'GSM-7', segments: 2 });
    // 152 plain + one € (2 septets) does not fit a 153-septet part: the € starts part two.
    expect(countSegments('a'.repeat(152) + '€' + 'a'.repeat(10)).segments).toBe(2);
    expect(countSegments('é à ü ñ Ø Δ').encoding).toBe('GSM-7');
  });

  it('falls back to UCS-2 for characters outside GSM-7 (a curly apostrophe, an emoji, Cyrillic)', () => {
    expect(countSegments('it’s').encoding).toBe('UCS-2');
    expect(countSegments('я'.repeat(70))).toEqual({ encoding: 'UCS-2', segments: 1 });
    expect(countSegments('я'.repeat(71))).toEqual({ encoding: 'UCS-2', segments: 2 });
    expect(countSegments('я'.repeat(134))).toEqual({ encoding: 'UCS-2', segments: 2 });
    expect(countSegments('я'.repeat(135))).toEqual({ encoding: 'UCS-2', segments: 3 });
    // An emoji is two UTF-16 units: 35 fill one segment, 36 need two.
    expect(countSegments('😀'.repeat(35)).segments).toBe(1);
    expect(countSegments('😀'.repeat(36)).segments).toBe(2);
  });
});
