import { FACTOR_KEYS, type FactorKey, type Level } from '@ostium/shared';
import { checkAssessment } from './factors.util.js';

export interface Difficulty {
  level: Level;
  /** The factors that set the level (catalogue order). */
  levelReasons: FactorKey[];
  cbctSuggested: boolean;
}

/**
 * The 2022 combination rule (AAE Endodontic Case Difficulty Assessment Form and Guidelines, 2022):
 * low when every factor is low; moderate with one or two moderate factors; high with three or more
 * moderate factors or any high factor. Moderate and high cases are flagged for cone-beam CT.
 * Factors left out count as low. Throws EstimateInputError naming `assessment.<key>` on bad input.
 */
export function combine(assessment: Partial<Record<FactorKey, Level>> | undefined): Difficulty {
  const checked = checkAssessment(assessment);
  const high: FactorKey[] = [];
  const moderate: FactorKey[] = [];
  for (const key of FACTOR_KEYS) {
    const level = checked[key];
    if (level === 'high') high.push(key);
    else if (level === 'moderate') moderate.push(key);
  }
  if (high.length > 0) {
    return { level: 'high', levelReasons: high, cbctSuggested: true };
  }
  if (moderate.length >= 3) {
    return { level: 'high', levelReasons: moderate, cbctSuggested: true };
  }
  if (moderate.length > 0) {
    return { level: 'moderate', levelReasons: moderate, cbctSuggested: true };
  }
  return { level: 'low', levelReasons: [], cbctSuggested: false };
}
