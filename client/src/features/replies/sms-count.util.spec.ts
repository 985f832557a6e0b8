// Sources: the GSM-7 default alphabet and its extension table are 3GPP TS 23.038 §6.2.1 and §6.2.1.1;
// 160/153 septets and 70/67 UCS-2 units per segment follow from 140 user-data octets less the 6-octet
// concatenation header (3GPP TS 23.040 §9.2.3.24.1).
import { describe, expect, it } from 'vitest';
import { countText, describeCount } from './sms-count.util';

describe('countText', () => {
  it('counts a plain reminder in GSM-7 against 160', () => {
    const text = 'Quillfern Endodontics: visit Thu 3 Dec 09:30 at Riverside. Reply C to confirm, R to reschedule. STOP to opt out.';
    expect(countText(text)).toEqual({ encoding: 'GSM-7', used: text.length, limit: 160, segments: 1, firstWide: null });
  });

  it('keeps the accented letters of the default alphabet in GSM-7 (3GPP TS 23.038 §6.2.1)', () => {
    // é (0x05), ü (0x7E), Ñ (0x5D), à (0x7F), £ (0x01), ¿ (0x60), § (0x5F), Δ (0x10) are all in the table.
    expect(countText('é ü Ñ à £ ¿ § Δ')).toMatchObject({ encoding: 'GSM-7', used: 15, limit: 160 });
  });

  it('switches to UCS-2 with limit 70 at an accented letter outside the table, and names it', () => {
    // á, í, ó, ú, ç are not in 3GPP TS 23.038 §6.2.1 (only the capital Ç at 0x09 is).
    for (const wide of ['á', 'í', 'ó', 'ú', 'ç', 'ã']) {
      expect(countText(`See you soon, Jos${wide}`), wide).toMatchObject({ encoding: 'UCS-2', limit: 70, firstWide: wide });
    }
    expect(countText('Ç')).toMatchObject({ encoding: 'GSM-7' });
  });

  it('switches to UCS-2 at an emoji and counts it as two units (a UTF-16 surrogate pair)', () => {
    expect(countText('Thanks 🙂')).toEqual({ encoding: 'UCS-2', used: 9, limit: 70, segments: 1, firstWide: '🙂' });
  });

  it('treats typographic quotes and backticks as outside GSM-7 (3GPP TS 23.038 §6.2.1 has only the straight ones)', () => {
    expect(countText('We’ll call')).toMatchObject({ encoding: 'UCS-2', firstWide: '’' });
    expect(countText("We'll call")).toMatchObject({ encoding: 'GSM-7' });
    expect(countText('`')).toMatchObject({ encoding: 'UCS-2' });
  });

  it('counts extension characters as two septets (3GPP TS 23.038 §6.2.1.1: escape + code)', () => {
    expect(countText('€5 [ok] ~ ^ | \\ { }')).toMatchObject({ encoding: 'GSM-7', used: 19 + 9 });
    expect(countText('€'.repeat(80))).toMatchObject({ used: 160, segments: 1 });
    expect(countText('€'.repeat(80) + '.')).toMatchObject({ used: 161, segments: 2 });
  });

  it('splits GSM-7 after 160 septets into segments of 153 (3GPP TS 23.040)', () => {
    expect(countText('a'.repeat(160)).segments).toBe(1);
    expect(countText('a'.repeat(161)).segments).toBe(2);
    expect(countText('a'.repeat(306)).segments).toBe(2);
    expect(countText('a'.repeat(307)).segments).toBe(3);
  });

  it('splits UCS-2 after 70 units into segments of 67 (3GPP TS 23.040)', () => {
    expect(countText('ж'.repeat(70))).toMatchObject({ used: 70, segments: 1 });
    expect(countText('ж'.repeat(71)).segments).toBe(2);
    expect(countText('ж'.repeat(134)).segments).toBe(2);
    expect(countText('ж'.repeat(135)).segments).toBe(3);
  });

  it('never splits an escape or a surrogate pair between segments (common practice, no source)', () => {
    // 152 + 2 + 152 = 306 septets: two segments of 153 only if the € could be cut in half.
    expect(countText('a'.repeat(152) + '€' + 'a'.repeat(152))).toMatchObject({ used: 306, segments: 3 });
    expect(countText('ж'.repeat(66) + '🙂' + 'ж'.repeat(66))).toMatchObject({ used: 134, segments: 3 });
  });

  it('gives an empty text no segment', () => {
    expect(countText('')).toEqual({ encoding: 'GSM-7', used: 0, limit: 160, segments: 0, firstWide: null });
  });

  it('reads ASCII letters, digits and the usual punctuation as GSM-7, but not the bare escape code (3GPP TS 23.038 §6.2.1)', () => {
    for (const c of 'AZaz09 @$_!?#%&*+-/:;<=>') expect(countText(c).encoding, c).toBe('GSM-7');
    expect(countText('\u001b').encoding).toBe('UCS-2');
  });
});

describe('describeCount', () => {
  it('reads like the counter in the brief', () => {
    expect(describeCount({ used: 132, limit: 160, encoding: 'GSM-7', segments: 1 })).toBe('132 / 160 · GSM-7 · 1 segment');
    expect(describeCount({ used: 75, limit: 70, encoding: 'UCS-2', segments: 2 })).toBe('75 / 70 · UCS-2 · 2 segments');
  });
});
