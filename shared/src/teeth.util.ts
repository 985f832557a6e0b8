/**
 * Tooth numbering. ISO 3950 (FDI two-digit) is the stored form; a practice may show FDI or
 * Universal (1–32 permanent, A–T primary). Everything is derived from the FDI quadrant/position
 * scheme and the Universal ↔ FDI rules in design/references.md ("Tooth numbering").
 */

export type ToothNotation = 'fdi' | 'universal';

export interface ToothInfo {
  fdi: string;
  universal: string;
  dentition: 'permanent' | 'primary';
  jaw: 'maxillary' | 'mandibular';
  side: 'right' | 'left';
  /** Tooth type within its quadrant, e.g. 'first molar'. */
  tooth: string;
  group: 'anterior' | 'premolar' | 'molar';
}

/** Thrown for any input that is not a tooth number in the given notation. */
export class ToothNumberError extends Error {
  constructor(
    message: string,
    readonly input: string,
    readonly notation: ToothNotation,
  ) {
    super(message);
    this.name = 'ToothNumberError';
  }
}

const PERMANENT_TYPES = [
  'central incisor',
  'lateral incisor',
  'canine',
  'first premolar',
  'second premolar',
  'first molar',
  'second molar',
  'third molar',
] as const;

// Primary dentition has no premolars: positions 4 and 5 are the primary molars.
const PRIMARY_TYPES = ['central incisor', 'lateral incisor', 'canine', 'first molar', 'second molar'] as const;

const LETTERS = 'ABCDEFGHIJKLMNOPQRST';

function isPrimaryQuadrant(q: number): boolean {
  return q >= 5;
}

/** Universal designation of FDI quadrant q (1–8), position p (1–8 or 1–5); references.md rules inverted. */
function universalOf(q: number, p: number): string {
  switch (q) {
    case 1: return String(9 - p);
    case 2: return String(8 + p);
    case 3: return String(25 - p);
    case 4: return String(24 + p);
    case 5: return LETTERS[6 - p - 1]!;
    case 6: return LETTERS[5 + p - 1]!;
    case 7: return LETTERS[16 - p - 1]!;
    default: return LETTERS[15 + p - 1]!;
  }
}

function buildInfo(q: number, p: number): Readonly<ToothInfo> {
  const primary = isPrimaryQuadrant(q);
  // Quadrants run clockwise from the patient's upper right: 1/5 UR, 2/6 UL, 3/7 LL, 4/8 LR.
  const base = primary ? q - 4 : q;
  const group: ToothInfo['group'] = p <= 3 ? 'anterior' : !primary && p <= 5 ? 'premolar' : 'molar';
  return Object.freeze({
    fdi: `${q}${p}`,
    universal: universalOf(q, p),
    dentition: primary ? 'primary' : 'permanent',
    jaw: base <= 2 ? 'maxillary' : 'mandibular',
    side: base === 1 || base === 4 ? 'right' : 'left',
    tooth: (primary ? PRIMARY_TYPES : PERMANENT_TYPES)[p - 1]!,
    group,
  });
}

/** Positions of one quadrant in chart order: upper right and lower left run distal → midline. */
function chartPositions(q: number): number[] {
  const count = isPrimaryQuadrant(q) ? 5 : 8;
  const up = Array.from({ length: count }, (_, i) => i + 1);
  const base = isPrimaryQuadrant(q) ? q - 4 : q;
  return base === 1 || base === 3 ? up.reverse() : up;
}

/**
 * All 52 teeth in chart order: permanent upper right → upper left, lower left → lower right,
 * then primary in the same order (i.e. Universal 1–32, then A–T).
 */
export const ALL_TEETH: readonly Readonly<ToothInfo>[] = Object.freeze(
  [1, 2, 3, 4, 5, 6, 7, 8].flatMap((q) => chartPositions(q).map((p) => buildInfo(q, p))),
);

const BY_FDI = new Map(ALL_TEETH.map((t) => [t.fdi, t]));
const BY_UNIVERSAL = new Map(ALL_TEETH.map((t) => [t.universal, t]));

function shown(raw: string): string {
  // Keep error messages readable even if someone pastes a paragraph into the field.
  return raw.length > 20 ? `${raw.slice(0, 20)}…` : raw;
}

function lookup(input: string, notation: ToothNotation): Readonly<ToothInfo> {
  if (typeof input !== 'string') {
    throw new ToothNumberError(`a tooth number must be text, got ${typeof input}`, String(input), notation);
  }
  const raw = input.trim();
  if (raw === '') {
    throw new ToothNumberError('a tooth number is required', input, notation);
  }
  if (notation === 'fdi') {
    // Strict two digits: '1', '011' or '1.6' are not stored forms.
    const hit = /^\d\d$/.test(raw) ? BY_FDI.get(raw) : undefined;
    if (!hit) {
      throw new ToothNumberError(
        `tooth ${shown(raw)} is not an FDI tooth number (quadrant 1–4 with position 1–8, or primary quadrant 5–8 with position 1–5)`,
        input,
        notation,
      );
    }
    return hit;
  }
  if (notation === 'universal') {
    // US charts often write "#19"; no leading zeros, so "03" is not read as 3.
    const key = raw.replace(/^#\s*/, '').toUpperCase();
    const hit = /^(?:[1-9]\d?|[A-Z])$/.test(key) ? BY_UNIVERSAL.get(key) : undefined;
    if (!hit) {
      throw new ToothNumberError(
        `tooth ${shown(raw)} is not a Universal tooth number (1–32 or A–T)`,
        input,
        notation,
      );
    }
    return hit;
  }
  throw new ToothNumberError(`unknown tooth notation ${String(notation)} (use 'fdi' or 'universal')`, input, notation);
}

/** Reads a tooth number written in `notation`; throws ToothNumberError for anything else. */
export function parseTooth(input: string, notation: ToothNotation): ToothInfo {
  return { ...lookup(input, notation) };
}

export function isValidTooth(input: string, notation: ToothNotation): boolean {
  try {
    lookup(input, notation);
    return true;
  } catch (e) {
    if (e instanceof ToothNumberError) return false;
    throw e;
  }
}

/** Facts about a stored (FDI) tooth number. */
export function toothInfo(fdi: string): ToothInfo {
  return parseTooth(fdi, 'fdi');
}

export function universalToFdi(u: string): string {
  return lookup(u, 'universal').fdi;
}

export function fdiToUniversal(f: string): string {
  return lookup(f, 'fdi').universal;
}

/** Display form of a stored (FDI) tooth number in the practice's notation. */
export function formatTooth(fdi: string, notation: ToothNotation): string {
  const t = lookup(fdi, 'fdi');
  if (notation === 'fdi') return t.fdi;
  if (notation === 'universal') return t.universal;
  throw new ToothNumberError(`unknown tooth notation ${String(notation)} (use 'fdi' or 'universal')`, fdi, notation);
}
