import { TOOTH_GROUPS, type EstimateTable } from '@ostium/shared';

/** Reads a dotted path ("base.initial.molar") of the table. */
export function getPath(obj: unknown, path: string): unknown {
  return path.split('.').reduce<unknown>((o, k) => (o !== null && typeof o === 'object' ? (o as Record<string, unknown>)[k] : undefined), obj);
}

interface NumberRule {
  /** Smallest allowed value; `exclusive` makes it a strict bound. */
  min?: number;
  minExclusive?: boolean;
  max?: number;
  maxExclusive?: boolean;
  integer?: boolean;
}

/**
 * Every number the settings grid edits, with its rule; the bounds mirror the server's checks
 * (server/src/estimates/estimator/estimate.util.ts checkTable and calibration.util.ts checkOptions)
 * so most mistakes are caught before the round trip.
 */
export const NUMBER_RULES: Record<string, NumberRule> = {
  gridMinutes: { min: 0, minExclusive: true, integer: true },
  longestVisitMinutes: { min: 0, minExclusive: true },
  turnoverMinutes: { min: 0 },
  ...Object.fromEntries(TOOTH_GROUPS.flatMap((g) => [[`base.initial.${g}`, { min: 0 }], [`base.surgery.${g}`, { min: 0 }], [`canalsIncluded.${g}`, { min: 1, integer: true }]])),
  'base.consult': { min: 0 },
  'base.emergency': { min: 0 },
  extraCanalMinutes: { min: 0 },
  'tierMultiplier.low': { min: 0, minExclusive: true },
  'tierMultiplier.moderate': { min: 0, minExclusive: true },
  'tierMultiplier.high': { min: 0, minExclusive: true },
  'addOns.retreatmentRemovalMinutes': { min: 0 },
  'addOns.calcifiedCanalMinutes': { min: 0 },
  'addOns.calcifiedCanalMaxMinutes': { min: 0 },
  'addOns.complicationMinutes': { min: 0 },
  'addOns.limitedOpeningMinutes': { min: 0 },
  'addOns.severeCurvatureMinutes': { min: 0 },
  'addOns.patientManagementMinutes': { min: 0 },
  'twoVisit.addedVisitSetupMinutes': { min: 0 },
  'interval.minDays': { min: 0, integer: true },
  'interval.maxDays': { min: 0, integer: true },
  'thresholds.curvatureModerateFromDegrees': { min: 0, max: 180 },
  'thresholds.curvatureHighAboveDegrees': { min: 0, max: 180 },
  'thresholds.apicalOpeningModerateFromMm': { min: 0, max: 10 },
  'thresholds.apicalOpeningHighAboveMm': { min: 0, max: 10 },
  'thresholds.toothLengthHighAboveMm': { min: 0, max: 60 },
  'calibration.bookingQuantile': { min: 0, minExclusive: true, max: 1, maxExclusive: true },
  'calibration.cellPseudoVisits': { min: 0 },
  'calibration.operatorPseudoVisits': { min: 0 },
  'calibration.minVisitsForBand': { min: 2, integer: true },
  'calibration.bandCoverage': { min: 0, minExclusive: true, max: 1, maxExclusive: true },
  'calibration.ratioClip': { min: 1, minExclusive: true },
};

function ruleMessage(r: NumberRule): string {
  const parts: string[] = [];
  if (r.min !== undefined) parts.push(`${r.minExclusive ? '>' : '≥'} ${r.min}`);
  if (r.max !== undefined) parts.push(`${r.maxExclusive ? '<' : '≤'} ${r.max}`);
  return `${r.integer ? 'A whole number' : 'A number'}${parts.length ? ` ${parts.join(' and ')}` : ''}`;
}

function checkNumber(v: unknown, r: NumberRule): string | null {
  if (typeof v !== 'number' || !Number.isFinite(v)) return 'Enter a number';
  const bad =
    (r.min !== undefined && (r.minExclusive ? v <= r.min : v < r.min)) ||
    (r.max !== undefined && (r.maxExclusive ? v >= r.max : v > r.max)) ||
    (r.integer && !Number.isInteger(v));
  return bad ? ruleMessage(r) : null;
}

/** Problems of an edited table, keyed by its dotted path (the server's `table.<path>` without the prefix). */
export function validateTable(t: EstimateTable): Record<string, string> {
  const errors: Record<string, string> = {};
  for (const [path, rule] of Object.entries(NUMBER_RULES)) {
    const e = checkNumber(getPath(t, path), rule);
    if (e) errors[path] = e;
  }
  const ok = (p: string) => !errors[p];
  if (ok('longestVisitMinutes') && ok('gridMinutes') && t.longestVisitMinutes < t.gridMinutes) errors.longestVisitMinutes = 'At least one grid step';
  // Monotone tiers keep "a harder case never gets less time" true (the server refuses otherwise).
  const m = t.tierMultiplier;
  if (ok('tierMultiplier.low') && ok('tierMultiplier.moderate') && ok('tierMultiplier.high') && !(m.low <= m.moderate && m.moderate <= m.high)) {
    errors.tierMultiplier = 'Multipliers must not decrease from low to high';
  }
  if (ok('twoVisit.addedVisitSetupMinutes') && ok('longestVisitMinutes') && t.twoVisit.addedVisitSetupMinutes >= t.longestVisitMinutes / 2) {
    errors['twoVisit.addedVisitSetupMinutes'] = 'Under half the longest visit';
  }
  if (ok('interval.minDays') && ok('interval.maxDays') && t.interval.maxDays < t.interval.minDays) errors['interval.maxDays'] = 'At least the earliest day';
  const th = t.thresholds;
  if (ok('thresholds.curvatureModerateFromDegrees') && ok('thresholds.curvatureHighAboveDegrees') && th.curvatureHighAboveDegrees < th.curvatureModerateFromDegrees) {
    errors['thresholds.curvatureHighAboveDegrees'] = 'At least the moderate threshold';
  }
  if (ok('thresholds.apicalOpeningModerateFromMm') && ok('thresholds.apicalOpeningHighAboveMm') && th.apicalOpeningHighAboveMm < th.apicalOpeningModerateFromMm) {
    errors['thresholds.apicalOpeningHighAboveMm'] = 'At least the moderate threshold';
  }
  if (!Array.isArray(t.recall.months) || t.recall.months.some((x) => !Number.isInteger(x) || x < 1 || x > 120)) {
    errors['recall.months'] = 'Whole months from 1 to 120';
  }
  return errors;
}

/** Server errors name `table.<path>`; the form names `<path>`. */
export function serverFieldErrors(errors: { field: string; message: string }[]): Record<string, string> {
  const out: Record<string, string> = {};
  for (const e of errors) {
    const path = e.field.startsWith('table.') ? e.field.slice('table.'.length) : e.field;
    out[path] = out[path] ? `${out[path]}; ${e.message}` : e.message;
  }
  return out;
}
