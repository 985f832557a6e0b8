// SMS length by encoding: GSM-7 when every character is in the 3GPP TS 23.038 default alphabet (or its
// extension table), otherwise UCS-2 — carriers bill by segment, so string length is the wrong measure.

export type SmsEncoding = 'GSM-7' | 'UCS-2';

export interface SmsLength {
  encoding: SmsEncoding;
  /** Septets for GSM-7 (extension characters count 2), UTF-16 code units for UCS-2. */
  units: number;
  /** Segments the carrier sends; 0 for an empty text. */
  segments: number;
  /** The single-segment limit for this encoding (160 or 70). */
  limit: number;
}

/** 3GPP TS 23.038 §6.2.1 default alphabet, in table order 0x00–0x7F (0x1B, the escape, left out). */
const GSM7_BASIC =
  '@£$¥èéùìòÇ\nØø\rÅåΔ_ΦΓΛΩΠΨΣΘΞ' + 'ÆæßÉ' + ' !"#¤%&\'()*+,-./0123456789:;<=>?' +
  '¡ABCDEFGHIJKLMNOPQRSTUVWXYZÄÖÑÜ§¿abcdefghijklmnopqrstuvwxyzäöñüà';
/** 3GPP TS 23.038 §6.2.1.1 extension table: sent as ESC + code, so two septets each. */
const GSM7_EXTENSION = '\f^{}\\[~]|€';

const BASIC = new Set(GSM7_BASIC);
const EXTENSION = new Set(GSM7_EXTENSION);

export const SMS_LIMITS = {
  'GSM-7': { single: 160, perConcatenated: 153 },
  'UCS-2': { single: 70, perConcatenated: 67 },
} as const;

export function isGsm7Char(ch: string): boolean {
  return BASIC.has(ch) || EXTENSION.has(ch);
}

export function detectEncoding(text: string): SmsEncoding {
  for (const ch of text) if (!isGsm7Char(ch)) return 'UCS-2';
  return 'GSM-7';
}

/** Unit cost of each character, kept whole so a segment never splits an escape or a surrogate pair. */
function charCosts(text: string, encoding: SmsEncoding): number[] {
  const costs: number[] = [];
  for (const ch of text) costs.push(encoding === 'GSM-7' ? (EXTENSION.has(ch) ? 2 : 1) : ch.length);
  return costs;
}

export function smsLength(text: string): SmsLength {
  const encoding = detectEncoding(text);
  const { single, perConcatenated } = SMS_LIMITS[encoding];
  const costs = charCosts(text, encoding);
  const units = costs.reduce((a, b) => a + b, 0);
  let segments = 0;
  if (units > 0 && units <= single) segments = 1;
  else if (units > single) {
    // Greedy fill: a character that does not fit whole starts the next segment (as handsets do).
    let used: number = perConcatenated;
    for (const cost of costs) {
      if (used + cost > perConcatenated) {
        segments += 1;
        used = 0;
      }
      used += cost;
    }
  }
  return { encoding, units, segments, limit: single };
}
