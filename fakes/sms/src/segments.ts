// How many segments a carrier sends for a text, the way the provider reports num_segments: GSM-7 when
// every character is in the 3GPP TS 23.038 default alphabet or its extension table (an extension
// character costs two septets), otherwise UCS-2 counted in UTF-16 code units. One segment holds 160
// septets / 70 units; a longer text is split into parts of 153 / 67 because each part carries a
// concatenation header (3GPP TS 23.040 user data header, common practice, no source for the figures).
// The fake keeps its own small counter so it does not depend on the app's code.

const GSM7 = new Set(
  '@£$¥èéùìòÇ\nØø\rÅåΔ_ΦΓΛΩΠΨΣΘΞÆæßÉ !"#¤%&\'()*+,-./0123456789:;<=>?' +
    '¡ABCDEFGHIJKLMNOPQRSTUVWXYZÄÖÑÜ§¿abcdefghijklmnopqrstuvwxyzäöñüà',
);
const GSM7_EXTENSION = new Set('\f^{}\\[~]|€');

export interface SegmentCount {
  encoding: 'GSM-7' | 'UCS-2';
  segments: number;
}

export function countSegments(text: string): SegmentCount {
  const chars = [...text];
  const gsm = chars.every((c) => GSM7.has(c) || GSM7_EXTENSION.has(c));
  const cost = (c: string): number => (gsm ? (GSM7_EXTENSION.has(c) ? 2 : 1) : c.length);
  const [single, part] = gsm ? [160, 153] : [70, 67];
  const total = chars.reduce((n, c) => n + cost(c), 0);
  const encoding = gsm ? 'GSM-7' : 'UCS-2';
  if (total === 0) return { encoding, segments: 0 };
  if (total <= single) return { encoding, segments: 1 };
  // A character never straddles two parts (an escape pair or a surrogate pair stays whole).
  let segments = 1;
  let used = 0;
  for (const c of chars) {
    if (used + cost(c) > part) {
      segments += 1;
      used = 0;
    }
    used += cost(c);
  }
  return { encoding, segments };
}
