// SMS length: alphabet from 3GPP TS 23.038 §6.2.1 (default alphabet) and §6.2.1.1 (extension table);
// 160/70 single and 153/67 concatenated from 140 user-data octets less the 6-octet concatenation header
// (3GPP TS 23.040 §9.2.3.24.1).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { detectEncoding, isGsm7Char, smsLength } from './sms-encoding.util.js';

describe('detectEncoding (3GPP TS 23.038 default alphabet)', () => {
  it('accepts the whole default table and the extension table as GSM-7', () => {
    // 3GPP TS 23.038 §6.2.1: 0x00 @, 0x01 £, 0x10 Δ, 0x1F É, 0x24 ¤, 0x40 ¡, 0x5F §, 0x60 ¿, 0x7F à.
    for (const ch of '@£$¥èéùìòÇØøÅåΔ_ΦΓΛΩΠΨΣΘΞÆæßÉ¤¡§¿äöñüàÄÖÑÜ') expect(isGsm7Char(ch), ch).toBe(true);
    // 3GPP TS 23.038 §6.2.1.1 extension table.
    for (const ch of '^{}\\[~]|€') expect(isGsm7Char(ch), ch).toBe(true);
    expect(detectEncoding('Reply C to confirm, STOP to opt out. 555-0142 @ 9:30 £€')).toBe('GSM-7');
  });

  it('sends characters outside the table as UCS-2', () => {
    // Not in 3GPP TS 23.038: á, ç (only capital Ç is at 0x09), backtick, ’ (curly apostrophe), emoji.
    for (const s of ['á', 'ç', '`', '’', '😀', 'ж']) expect(detectEncoding(`ok ${s}`), s).toBe('UCS-2');
  });
});

describe('smsLength', () => {
  it('counts 160 GSM-7 septets as one segment and 161 as two (3GPP TS 23.040)', () => {
    expect(smsLength('a'.repeat(160))).toEqual({ encoding: 'GSM-7', units: 160, segments: 1, limit: 160 });
    expect(smsLength('a'.repeat(161))).toEqual({ encoding: 'GSM-7', units: 161, segments: 2, limit: 160 });
    expect(smsLength('a'.repeat(306)).segments).toBe(2);
    expect(smsLength('a'.repeat(307)).segments).toBe(3);
  });

  it('counts extension characters as two septets (3GPP TS 23.038 §6.2.1.1: ESC + code)', () => {
    expect(smsLength('€'.repeat(80))).toMatchObject({ units: 160, segments: 1 });
    expect(smsLength('€'.repeat(80) + 'a')).toMatchObject({ units: 161, segments: 2 });
    expect(smsLength('{x}')).toMatchObject({ encoding: 'GSM-7', units: 5 });
  });

  it('counts 70 UCS-2 units as one segment, then 67 per segment (3GPP TS 23.040)', () => {
    expect(smsLength('ж'.repeat(70))).toEqual({ encoding: 'UCS-2', units: 70, segments: 1, limit: 70 });
    expect(smsLength('ж'.repeat(71)).segments).toBe(2);
    expect(smsLength('ж'.repeat(134)).segments).toBe(2);
    expect(smsLength('ж'.repeat(135)).segments).toBe(3);
  });

  it('counts a surrogate pair as two UCS-2 units', () => {
    expect(smsLength('😀'.repeat(35))).toMatchObject({ encoding: 'UCS-2', units: 70, segments: 1 });
    expect(smsLength('😀'.repeat(35) + 'a')).toMatchObject({ units: 71, segments: 2 });
  });

  it('never splits an escape or a surrogate pair across segments (common practice, no source)', () => {
    // 306 septets would fit two segments of 153 if the € could be split; kept whole it needs three.
    expect(smsLength('a'.repeat(152) + '€' + 'a'.repeat(152))).toMatchObject({ units: 306, segments: 3 });
    expect(smsLength('ж'.repeat(66) + '😀' + 'ж'.repeat(66))).toMatchObject({ units: 134, segments: 3 });
  });

  it('one accented letter outside GSM-7 turns a 100-character text into two segments', () => {
    const text = 'a'.repeat(99) + 'á';
    expect(text.length).toBe(100);
    expect(smsLength(text)).toEqual({ encoding: 'UCS-2', units: 100, segments: 2, limit: 70 });
  });

  it('gives an empty text no segments', () => {
    expect(smsLength('')).toEqual({ encoding: 'GSM-7', units: 0, segments: 0, limit: 160 });
  });

  const basic = fc.constantFrom(...'abcXYZ019 .,!?@£$éÅΔ\n'.split(''));
  const ext = fc.constantFrom(...'^{}\\[~]|€'.split(''));

  it('property: GSM-7 units are the characters plus one per extension character', () => {
    fc.assert(
      fc.property(fc.array(fc.oneof(basic, ext), { maxLength: 400 }), (chars) => {
        const r = smsLength(chars.join(''));
        const extCount = chars.filter((c) => '^{}\\[~]|€'.includes(c)).length;
        expect(r.encoding).toBe('GSM-7');
        expect(r.units).toBe(chars.length + extCount);
      }),
    );
  });

  it('property: plain GSM-7 text needs ceil(n/153) segments above 160', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 2000 }), (n) => {
        const expected = n <= 160 ? 1 : Math.ceil(n / 153);
        expect(smsLength('x'.repeat(n)).segments).toBe(expected);
      }),
    );
  });

  it('property: UCS-2 units are UTF-16 code units and segments hold at most 67 each', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'grapheme', minLength: 1, maxLength: 200 }), (s) => {
        const text = `ж${s}`;
        const r = smsLength(text);
        expect(r.encoding).toBe('UCS-2');
        expect(r.units).toBe(text.length);
        if (r.units > 70) expect(r.segments).toBeGreaterThanOrEqual(Math.ceil(r.units / 67));
        else expect(r.segments).toBe(1);
      }),
    );
  });
});
