import type { Level, ToothGroup } from '@ostium/shared';
import type { FdiTooth } from './tooth-fdi.util.js';

/**
 * Usual canal counts per tooth type, index = FDI position − 1. Permanent figures follow Vertucci FJ,
 * Oral Surg 1984;58:589–599 (2,400 teeth) as summarised in design/references.md; the maxillary first
 * molar counts its second mesiobuccal canal (55 % Vertucci, 73.8 % by CBCT, Martins et al., J Endod
 * 2018), so 4. Where the study gives a minority second canal (mandibular incisors 25–30 %, mandibular
 * first premolar ~26 %) the usual count stays at the majority, 1.
 */
const PERMANENT_MAXILLARY = [1, 1, 1, 2, 1, 4, 3, 3] as const;
const PERMANENT_MANDIBULAR = [1, 1, 1, 1, 1, 3, 3, 3] as const;
// Third molars (position 8) vary most; we assume the second molar's count (from memory, no source).
// Primary teeth (from memory, no source in references.md): incisors and canines one canal; primary
// molars three (maxillary MB, DB, palatal; mandibular two mesial, one distal; a fourth is common in
// the mandibular second primary molar but is not the usual count we book on).
const PRIMARY_MAXILLARY = [1, 1, 1, 3, 3] as const;
const PRIMARY_MANDIBULAR = [1, 1, 1, 3, 3] as const;

export function usualCanals(tooth: FdiTooth): number {
  const row =
    tooth.dentition === 'permanent'
      ? tooth.jaw === 'maxillary'
        ? PERMANENT_MAXILLARY
        : PERMANENT_MANDIBULAR
      : tooth.jaw === 'maxillary'
        ? PRIMARY_MAXILLARY
        : PRIMARY_MANDIBULAR;
  return row[tooth.position - 1]!;
}

/** Incisors and canines are anterior; the primary dentition has no premolars (positions 4–5 are molars). */
export function toothGroup(tooth: FdiTooth): ToothGroup {
  if (tooth.position <= 3) return 'anterior';
  if (tooth.dentition === 'permanent' && tooth.position <= 5) return 'premolar';
  return 'molar';
}

/**
 * Position-in-the-arch level when the form leaves it out: anterior/premolar low, first molar moderate,
 * second/third molar high (AAE Case Difficulty Assessment grid, from memory per references.md).
 * Primary molars stand where the premolars will erupt, so they are rated like premolars (our rule).
 */
export function archPositionLevel(tooth: FdiTooth): Level {
  if (tooth.dentition === 'primary' || tooth.position <= 5) return 'low';
  return tooth.position === 6 ? 'moderate' : 'high';
}

export function isMaxillaryMolar(tooth: FdiTooth): boolean {
  return tooth.jaw === 'maxillary' && toothGroup(tooth) === 'molar';
}
