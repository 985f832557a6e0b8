// Counts a text the way the carrier bills it, so the desk sees the limit change the moment a character
// outside the GSM-7 alphabet is typed (the server counts again before it queues anything).

export type TextEncoding = 'GSM-7' | 'UCS-2';

export interface TextCount {
  encoding: TextEncoding;
  /** GSM-7 septets (extension characters take two) or UCS-2 code units (an emoji takes two). */
  used: number;
  /** What one segment holds in this encoding: 160 or 70. */
  limit: number;
  segments: number;
  /** The first character that forced UCS-2, to tell the desk what to change; null for GSM-7. */
  firstWide: string | null;
}

// 3GPP TS 23.038 §6.2.1, the default alphabet, row by row (0x1B is the escape to the extension table).
const DEFAULT_ALPHABET = [
  '@£$¥èéùìòÇ\nØø\rÅå',
  'Δ_ΦΓΛΩΠΨΣΘΞ\u001bÆæßÉ',
  ' !"#¤%&\'()*+,-./',
  '0123456789:;<=>?',
  '¡ABCDEFGHIJKLMNO',
  'PQRSTUVWXYZÄÖÑÜ§',
  '¿abcdefghijklmno',
  'pqrstuvwxyzäöñüà',
].join('');
// 3GPP TS 23.038 §6.2.1.1, the extension table: each is sent as escape + code.
const EXTENSION = '\f^{}\\[~]|€';

const SINGLE = new Set([...DEFAULT_ALPHABET].filter((c) => c !== '\u001b'));
const DOUBLE = new Set(EXTENSION);

// 3GPP TS 23.040: 140 octets of user data, less a 6-octet header once a text is split.
const SEGMENT = { 'GSM-7': { one: 160, each: 153 }, 'UCS-2': { one: 70, each: 67 } } as const;

export function countText(text: string): TextCount {
  const chars = Array.from(text);
  const firstWide = chars.find((c) => !SINGLE.has(c) && !DOUBLE.has(c)) ?? null;
  const encoding: TextEncoding = firstWide === null ? 'GSM-7' : 'UCS-2';
  // Per-character cost, kept whole: a segment boundary never falls inside an escape or a surrogate pair.
  const costs = chars.map((c) => (encoding === 'GSM-7' ? (DOUBLE.has(c) ? 2 : 1) : c.length));
  const used = costs.reduce((a, b) => a + b, 0);
  const { one, each } = SEGMENT[encoding];
  let segments = used === 0 ? 0 : 1;
  if (used > one) {
    segments = 1;
    let room = each;
    for (const cost of costs) {
      if (cost > room) {
        segments += 1;
        room = each;
      }
      room -= cost;
    }
  }
  return { encoding, used, limit: one, segments, firstWide };
}

/** "42 / 160 · GSM-7 · 1 segment" — the counter under a text box and beside a template preview. */
export function describeCount(c: Pick<TextCount, 'used' | 'limit' | 'encoding' | 'segments'>): string {
  return `${c.used} / ${c.limit} · ${c.encoding} · ${c.segments} ${c.segments === 1 ? 'segment' : 'segments'}`;
}
