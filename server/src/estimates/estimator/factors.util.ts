import {
  COMPLICATIONS,
  FACTOR_KEYS,
  type Complication,
  LEVELS,
  type EstimateFacts,
  type EstimateTable,
  type FactorDefinition,
  type FactorKey,
  type Level,
  type Procedure,
} from '@ostium/shared';
import { archPositionLevel } from './canals.util.js';
import { EstimateInputError } from './input-error.util.js';
import type { FdiTooth } from './tooth-fdi.util.js';

/**
 * The difficulty factors, grouped as the trade's published assessment groups them (AAE Endodontic
 * Case Difficulty Assessment Form, 2022: patient, diagnosis and tooth, additional). The wording of
 * labels and level descriptions is our own.
 */
const CATALOGUE: Record<FactorKey, Omit<FactorDefinition, 'key'>> = {
  medicalHistory: {
    label: 'Medical history',
    group: 'patient',
    levels: {
      low: 'Healthy (ASA I)',
      moderate: 'Mild systemic condition (ASA II)',
      high: 'Serious systemic condition (ASA III or above)',
    },
    setByFact: 'asaClass',
  },
  anaesthesia: {
    label: 'Local anaesthesia',
    group: 'patient',
    levels: {
      low: 'No trouble in the past',
      moderate: 'Cannot take vasoconstrictor',
      high: 'Numbness hard to obtain in the past',
    },
  },
  disposition: {
    label: 'Patient disposition',
    group: 'patient',
    levels: { low: 'Cooperative', moderate: 'Anxious but manageable', high: 'Uncooperative' },
  },
  mouthOpening: {
    label: 'Mouth opening',
    group: 'patient',
    levels: { low: 'Opens fully', moderate: 'Slightly limited', high: 'Markedly limited' },
  },
  gagReflex: {
    label: 'Gag reflex',
    group: 'patient',
    levels: { low: 'None', moderate: 'Gags now and then', high: 'Strong gag that limits care' },
  },
  emergency: {
    label: 'Pain and swelling',
    group: 'patient',
    levels: { low: 'None or mild', moderate: 'Moderate', high: 'Severe' },
  },
  diagnosis: {
    label: 'Diagnostic complexity',
    group: 'tooth',
    levels: {
      low: 'Findings agree on one diagnosis',
      moderate: 'Several diagnoses to rule out',
      high: 'Conflicting findings or long-standing unexplained pain',
    },
  },
  radiographs: {
    label: 'Radiographic difficulty',
    group: 'tooth',
    levels: {
      low: 'Images easy to take and read',
      moderate: 'Images hard to take or read',
      high: 'Key structures hidden by overlap',
    },
  },
  archPosition: {
    label: 'Position in the arch',
    group: 'tooth',
    levels: { low: 'Front tooth or premolar', moderate: 'First molar', high: 'Second or third molar' },
    derivedFromTooth: true,
  },
  isolation: {
    label: 'Isolation',
    group: 'tooth',
    levels: {
      low: 'Rubber dam as usual',
      moderate: 'Small build-up needed for the dam',
      high: 'Major build-up needed for the dam',
    },
  },
  crownMorphology: {
    label: 'Crown',
    group: 'tooth',
    levels: {
      low: 'Usual shape',
      moderate: 'Full-coverage crown, bridge abutment or rotated tooth',
      high: 'Far from the usual shape',
    },
  },
  canalMorphology: {
    label: 'Canal and root shape',
    group: 'tooth',
    levels: { low: 'Curved under 10°', moderate: 'Curved 10° to 30°', high: 'Curved over 30°, or S-shaped' },
    setByFact: 'curvatureDegrees',
  },
  canalVisibility: {
    label: 'Canal visibility',
    group: 'tooth',
    levels: {
      low: 'Canals clearly visible',
      moderate: 'Narrowed canal space or pulp stones',
      high: 'Canals not visible or calcified',
    },
    setByFact: 'calcifiedCanals',
  },
  resorption: {
    label: 'Resorption',
    group: 'tooth',
    levels: { low: 'None', moderate: 'Slight apical resorption', high: 'Extensive resorption' },
  },
  apicalOpening: {
    label: 'Apical opening',
    group: 'tooth',
    levels: { low: 'Under 1 mm', moderate: '1 mm to 1.5 mm', high: 'Over 1.5 mm' },
    setByFact: 'apicalOpeningMm',
  },
  toothLength: {
    label: 'Tooth length',
    group: 'tooth',
    // The published grid only marks a very long tooth; moderate is left to the clinician's judgement.
    levels: { low: 'Usual length', moderate: 'Long for its type, 25 mm or less', high: 'Over 25 mm' },
    setByFact: 'toothLengthMm',
  },
  traumaHistory: {
    label: 'Trauma history',
    group: 'additional',
    levels: {
      low: 'None',
      moderate: 'Simple crown fracture of a mature tooth',
      high: 'Complicated fracture, immature tooth, luxation or avulsion',
    },
  },
  previousTreatment: {
    label: 'Earlier endodontic treatment',
    group: 'additional',
    levels: {
      low: 'None',
      moderate: 'Opened earlier without complication',
      high: 'Ledge, perforation, separated instrument, blocked canal, or treatment completed earlier',
    },
    setByFact: 'complications',
  },
  perioEndo: {
    label: 'Periodontal–endodontic condition',
    group: 'additional',
    levels: {
      low: 'No or mild periodontal disease',
      moderate: 'Moderate periodontal disease',
      high: 'Severe periodontal disease, cracked tooth with deep pocket, or root resection planned',
    },
  },
};

const ASA_LABELS: Record<Level, string> = {
  low: 'Healthy (ASA I)',
  moderate: 'Mild systemic condition (ASA II)',
  high: 'Serious systemic condition (ASA III or above)',
};

/** The factor list for the case sheet; medical-history wording follows the table's ASA II level. */
export function factorCatalogue(table?: Pick<EstimateTable, 'asaClassTwoLevel'>): FactorDefinition[] {
  return FACTOR_KEYS.map((key) => {
    const def = CATALOGUE[key];
    const levels = { ...def.levels };
    if (key === 'medicalHistory' && table) {
      levels.low = ASA_LABELS.low;
      levels.moderate = ASA_LABELS.moderate;
      levels.high = ASA_LABELS.high;
      if (table.asaClassTwoLevel === 'low') {
        levels.low = 'Healthy or mild systemic condition (ASA I–II)';
        levels.moderate = 'Condition that needs care planning, short of ASA III';
      } else if (table.asaClassTwoLevel === 'high') {
        levels.high = 'Systemic condition (ASA II or above)';
      }
    }
    return { key, ...def, levels };
  });
}

const LEVEL_RANK: Record<Level, number> = { low: 0, moderate: 1, high: 2 };

export function levelRank(level: Level): number {
  return LEVEL_RANK[level];
}

export function maxLevel(a: Level, b: Level): Level {
  return LEVEL_RANK[a] >= LEVEL_RANK[b] ? a : b;
}

export function isLevel(value: unknown): value is Level {
  return typeof value === 'string' && (LEVELS as readonly string[]).includes(value);
}

export function isFactorKey(value: unknown): value is FactorKey {
  return typeof value === 'string' && (FACTOR_KEYS as readonly string[]).includes(value);
}

type Thresholds = EstimateTable['thresholds'];

/** Root curvature: < 10° low, 10–30° moderate, > 30° high (AAE grid, from memory per references.md). */
export function curvatureLevel(degrees: number, t: Thresholds): Level {
  // Schneider's bands (straight ≤ 5°, moderate 10–20°, severe 25–70°) leave gaps; the form's grid closes them.
  if (degrees < t.curvatureModerateFromDegrees) return 'low';
  return degrees > t.curvatureHighAboveDegrees ? 'high' : 'moderate';
}

/** Apical opening: < 1 mm low, 1–1.5 mm moderate, > 1.5 mm high (AAE grid, from memory). */
export function apicalOpeningLevel(mm: number, t: Thresholds): Level {
  if (mm < t.apicalOpeningModerateFromMm) return 'low';
  return mm > t.apicalOpeningHighAboveMm ? 'high' : 'moderate';
}

/** A tooth longer than 25 mm is high (AAE grid, from memory); the grid has no moderate length. */
export function toothLengthLevel(mm: number, t: Thresholds): Level {
  return mm > t.toothLengthHighAboveMm ? 'high' : 'low';
}

/** ASA I low, II a table value, III and above high. */
export function asaClassLevel(asaClass: number, asaClassTwoLevel: Level): Level {
  if (asaClass <= 1) return 'low';
  return asaClass === 2 ? asaClassTwoLevel : 'high';
}

/** Checks the form's ratings; throws EstimateInputError naming `assessment.<key>`. */
export function checkAssessment(assessment: unknown): Partial<Record<FactorKey, Level>> {
  if (assessment === undefined || assessment === null) return {};
  if (typeof assessment !== 'object' || Array.isArray(assessment)) {
    throw new EstimateInputError('assessment', 'must be an object of factor → level');
  }
  const out: Partial<Record<FactorKey, Level>> = {};
  for (const [key, value] of Object.entries(assessment)) {
    if (!isFactorKey(key)) {
      throw new EstimateInputError(`assessment.${key}`, 'is not a difficulty factor');
    }
    if (value === undefined) continue;
    if (!isLevel(value)) {
      throw new EstimateInputError(`assessment.${key}`, `must be one of ${LEVELS.join(', ')}`);
    }
    out[key] = value;
  }
  return out;
}

const FACT_KEYS: readonly (keyof EstimateFacts)[] = [
  'curvatureDegrees',
  'sShapedCanal',
  'apicalOpeningMm',
  'toothLengthMm',
  'asaClass',
  'calcifiedCanals',
  'complications',
  'acuteAbscess',
];

function numberIn(field: string, value: unknown, min: number, max: number, integer = false): number {
  if (typeof value !== 'number' || !Number.isFinite(value) || value < min || value > max) {
    throw new EstimateInputError(field, `must be a number from ${min} to ${max}`);
  }
  if (integer && !Number.isInteger(value)) {
    throw new EstimateInputError(field, 'must be a whole number');
  }
  return value;
}

function booleanField(field: string, value: unknown): boolean {
  if (typeof value !== 'boolean') throw new EstimateInputError(field, 'must be true or false');
  return value;
}

/** Checks the facts; ranges are plausibility limits, not clinical ones. */
export function checkFacts(facts: unknown): EstimateFacts {
  if (facts === undefined || facts === null) return {};
  if (typeof facts !== 'object' || Array.isArray(facts)) {
    throw new EstimateInputError('facts', 'must be an object');
  }
  const out: EstimateFacts = {};
  for (const [key, value] of Object.entries(facts)) {
    if (!(FACT_KEYS as readonly string[]).includes(key)) {
      throw new EstimateInputError(`facts.${key}`, 'is not a known fact');
    }
    if (value === undefined) continue;
    const field = `facts.${key}`;
    switch (key as keyof EstimateFacts) {
      case 'curvatureDegrees':
        out.curvatureDegrees = numberIn(field, value, 0, 180);
        break;
      case 'apicalOpeningMm':
        out.apicalOpeningMm = numberIn(field, value, 0, 10);
        break;
      case 'toothLengthMm':
        out.toothLengthMm = numberIn(field, value, 1, 60);
        break;
      case 'asaClass':
        out.asaClass = numberIn(field, value, 1, 6, true);
        break;
      case 'calcifiedCanals':
        out.calcifiedCanals = numberIn(field, value, 0, MAX_CANALS, true);
        break;
      case 'sShapedCanal':
        out.sShapedCanal = booleanField(field, value);
        break;
      case 'acuteAbscess':
        out.acuteAbscess = booleanField(field, value);
        break;
      case 'complications': {
        if (!Array.isArray(value)) throw new EstimateInputError(field, 'must be a list');
        for (const c of value) {
          if (!(COMPLICATIONS as readonly unknown[]).includes(c)) {
            throw new EstimateInputError(field, `must contain only ${COMPLICATIONS.join(', ')}`);
          }
        }
        out.complications = [...new Set(value as Complication[])];
        break;
      }
    }
  }
  return out;
}

/** Most canals a single tooth is booked for; more is a data-entry error. */
export const MAX_CANALS = 8;

export type LevelSource = 'form' | 'fact' | 'tooth' | 'procedure' | 'default';

export interface ResolvedAssessment {
  levels: Record<FactorKey, Level>;
  /** Where each level came from, for the case sheet. */
  sources: Record<FactorKey, LevelSource>;
}

/**
 * Full assessment: the form's ratings, the tooth-derived position when the form leaves it out, then
 * the facts, which set their factor's level (a measurement beats a rating). Missing factors are low.
 */
export function resolveAssessment(
  tooth: FdiTooth,
  procedure: Procedure,
  assessment: Partial<Record<FactorKey, Level>>,
  facts: EstimateFacts,
  table: Pick<EstimateTable, 'thresholds' | 'asaClassTwoLevel'>,
): ResolvedAssessment {
  const levels = {} as Record<FactorKey, Level>;
  const sources = {} as Record<FactorKey, LevelSource>;
  for (const key of FACTOR_KEYS) {
    const given = assessment[key];
    levels[key] = given ?? 'low';
    sources[key] = given ? 'form' : 'default';
  }
  const set = (key: FactorKey, level: Level, source: LevelSource) => {
    levels[key] = level;
    sources[key] = source;
  };
  if (!assessment.archPosition) set('archPosition', archPositionLevel(tooth), 'tooth');
  // A completed earlier treatment is high on the form, and retreatment means there is one.
  if (procedure === 'retreatment') set('previousTreatment', 'high', 'procedure');

  const t = table.thresholds;
  if (facts.curvatureDegrees !== undefined || facts.sShapedCanal !== undefined) {
    let level: Level = facts.curvatureDegrees !== undefined ? curvatureLevel(facts.curvatureDegrees, t) : 'low';
    if (facts.sShapedCanal) level = 'high';
    // "sShapedCanal: false" alone says nothing about curvature; keep the form's rating then.
    if (facts.curvatureDegrees !== undefined || facts.sShapedCanal) set('canalMorphology', level, 'fact');
  }
  if (facts.apicalOpeningMm !== undefined) set('apicalOpening', apicalOpeningLevel(facts.apicalOpeningMm, t), 'fact');
  if (facts.toothLengthMm !== undefined) set('toothLength', toothLengthLevel(facts.toothLengthMm, t), 'fact');
  if (facts.asaClass !== undefined) set('medicalHistory', asaClassLevel(facts.asaClass, table.asaClassTwoLevel), 'fact');
  // Calcified canals and complications only ever raise their factor: "0" or "[]" is no measurement.
  if ((facts.calcifiedCanals ?? 0) > 0) set('canalVisibility', 'high', 'fact');
  if ((facts.complications?.length ?? 0) > 0) set('previousTreatment', 'high', 'fact');
  return { levels, sources };
}
