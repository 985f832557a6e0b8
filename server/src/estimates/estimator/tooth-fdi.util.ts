import { EstimateInputError } from './input-error.util.js';

/**
 * Minimal ISO 3950 (FDI two-digit) reader for the estimator; the API converts Universal numbers to
 * FDI before calling estimate(). Quadrants 1–4 permanent (positions 1–8), 5–8 primary (1–5);
 * 1/5 upper right, 2/6 upper left, 3/7 lower left, 4/8 lower right (references.md, "Tooth numbering").
 */
export interface FdiTooth {
  fdi: string;
  quadrant: number;
  /** 1 = central incisor … 8 = third molar (primary: 4 = first molar, 5 = second molar). */
  position: number;
  dentition: 'permanent' | 'primary';
  jaw: 'maxillary' | 'mandibular';
  side: 'right' | 'left';
}

/** Parses a stored FDI code such as "36" or "85"; throws EstimateInputError(field) otherwise. */
export function parseFdi(code: string, field = 'tooth'): FdiTooth {
  if (typeof code !== 'string') {
    throw new EstimateInputError(field, 'a tooth number must be text');
  }
  const raw = code.trim();
  // Exactly two digits: the stored form, no "#", no leading zero tricks.
  const m = /^([1-8])([1-8])$/.exec(raw);
  if (!m) {
    throw new EstimateInputError(field, `"${raw.slice(0, 20)}" is not an FDI two-digit tooth number`);
  }
  const quadrant = Number(m[1]);
  const position = Number(m[2]);
  const primary = quadrant >= 5;
  if (primary && position > 5) {
    throw new EstimateInputError(field, `primary quadrant ${quadrant} has positions 1–5 only`);
  }
  const base = primary ? quadrant - 4 : quadrant;
  return {
    fdi: raw,
    quadrant,
    position,
    dentition: primary ? 'primary' : 'permanent',
    jaw: base <= 2 ? 'maxillary' : 'mandibular',
    side: base === 1 || base === 4 ? 'right' : 'left',
  };
}

export function isFdi(code: string): boolean {
  try {
    parseFdi(code);
    return true;
  } catch {
    return false;
  }
}

/** All 52 FDI codes (32 permanent, 20 primary), quadrant by quadrant. */
export const ALL_FDI_CODES: readonly string[] = Object.freeze(
  [1, 2, 3, 4, 5, 6, 7, 8].flatMap((q) =>
    Array.from({ length: q >= 5 ? 5 : 8 }, (_, i) => `${q}${i + 1}`),
  ),
);
