/**
 * ISO 3630-1 root canal instrument sizes: size = tip diameter in hundredths of a millimetre; the
 * colour code repeats every six sizes from 15 (design/references.md, "Instruments").
 */

export type IsoColour = 'pink' | 'grey' | 'purple' | 'white' | 'yellow' | 'red' | 'blue' | 'green' | 'black';

const SMALL: Record<number, IsoColour> = { 6: 'pink', 8: 'grey', 10: 'purple' };
const CYCLE: readonly IsoColour[] = ['white', 'yellow', 'red', 'blue', 'green', 'black'];

/** Standard sizes: 06, 08, 10, 15–60 in steps of 5, 70–140 in steps of 10. */
export const ISO_SIZES: readonly number[] = Object.freeze([
  6, 8, 10,
  ...Array.from({ length: 10 }, (_, i) => 15 + 5 * i),
  ...Array.from({ length: 8 }, (_, i) => 70 + 10 * i),
]);

export function isIsoSize(size: number): boolean {
  return ISO_SIZES.includes(size);
}

/** Colour of a standard size, undefined for a size outside ISO 3630-1's series. */
export function isoColour(size: number): IsoColour | undefined {
  if (!isIsoSize(size)) return undefined;
  if (size in SMALL) return SMALL[size];
  // 15..60 step 5 and 70..140 step 10 each run the six-colour cycle from white (15/45/90).
  const rank = size <= 60 ? (size - 15) / 5 : 10 + (size - 70) / 10;
  return CYCLE[rank % CYCLE.length];
}

/**
 * Diameter (mm) at `mm` from the tip of a file of `size` and `taper` (mm per mm); the usual check
 * point is 16 mm, the end of the cutting part: tip + 16 × taper.
 */
export function diameterAt(size: number, taper: number, mm = 16): number {
  if (!(size > 0) || !(taper >= 0) || !(mm >= 0)) {
    throw new RangeError('size must be > 0, taper and distance ≥ 0');
  }
  // Rounded to 0.1 µm so 0.30 + 0.64 prints as 0.94, not 0.9400000000000001.
  return Math.round((size / 100 + mm * taper) * 10_000) / 10_000;
}
