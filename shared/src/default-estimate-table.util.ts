import type { EstimateTable } from './estimates.types.js';

/**
 * Version 1 of the estimate table: every number is a practice-editable default from
 * design/estimator.md (common practice, from memory) unless its comment names a source.
 */
export const DEFAULT_ESTIMATE_TABLE: EstimateTable = deepFreeze({
  version: 1,
  gridMinutes: 5,
  longestVisitMinutes: 120,
  turnoverMinutes: 10,
  base: {
    initial: { anterior: 60, premolar: 75, molar: 90 },
    surgery: { anterior: 90, premolar: 90, molar: 120 },
    consult: 30,
    emergency: 45,
  },
  // anterior 1 canal, premolar 1–2, molar 3: the base covers up to these.
  canalsIncluded: { anterior: 1, premolar: 2, molar: 3 },
  extraCanalMinutes: 15,
  extraCanalProcedures: ['initial', 'retreatment'],
  tierMultiplier: { low: 1.0, moderate: 1.25, high: 1.5 },
  // A consultation takes as long whatever the tooth's difficulty (our reading of the table).
  tierProcedures: ['initial', 'retreatment', 'surgery', 'emergency'],
  addOns: {
    retreatmentRemovalMinutes: 40,
    calcifiedCanalMinutes: 15,
    calcifiedCanalMaxMinutes: 45,
    complicationMinutes: 30,
    limitedOpeningMinutes: 10,
    severeCurvatureMinutes: 15,
    patientManagementMinutes: 10,
    canalProcedures: ['initial', 'retreatment'],
    patientProcedures: ['initial', 'retreatment', 'surgery', 'emergency'],
  },
  twoVisit: {
    // Splitting means shaping + medication, then filling: nonsurgical canal treatment only.
    splittableProcedures: ['initial', 'retreatment'],
    procedures: ['retreatment'],
    levels: [],
    acuteAbscessProcedures: ['initial', 'retreatment'],
    // The design adds no set-up time for the second visit; a practice may (Wong et al., BMC Oral
    // Health 2015 measured 92.9 vs 62.0 min total chair time for multiple vs single visit).
    addedVisitSetupMinutes: 0,
  },
  // At least 7 days: a 7-day calcium hydroxide dressing killed the surviving bacteria, 10 minutes
  // did not (Sjögren et al., Int Endod J 1991;24:119–125). 21 days at most is common practice.
  interval: { minDays: 7, maxDays: 21 },
  microscope: {
    levels: ['high'],
    procedures: ['retreatment', 'surgery'],
    calcifiedCanals: true,
    maxillaryMolars: true,
    exemptProcedures: ['consult'],
  },
  // Review at least at one year (European Society of Endodontology quality guidelines, Int Endod J
  // 2006;39:921–930); the 6-month look is common practice.
  recall: { months: [6, 12], procedures: ['initial', 'retreatment', 'surgery'] },
  // AAE case difficulty grid (older edition, from memory per references.md).
  thresholds: {
    curvatureModerateFromDegrees: 10,
    curvatureHighAboveDegrees: 30,
    apicalOpeningModerateFromMm: 1,
    apicalOpeningHighAboveMm: 1.5,
    toothLengthHighAboveMm: 25,
  },
  // The older grid rates ASA II moderate; the 2022 grid may count it low (references.md).
  asaClassTwoLevel: 'moderate',
  calibration: {
    bookingQuantile: 0.5,
    cellPseudoVisits: 5,
    operatorPseudoVisits: 10,
    minVisitsForBand: 20,
    bandCoverage: 0.8,
    ratioClip: 3,
  },
  // Template contents are common practice, no source; sizes are ISO 3630-1 (tip in 1/100 mm).
  tray: {
    canalProcedures: ['initial', 'retreatment', 'emergency'],
    glidePath: [
      { label: 'Stainless steel hand file (glide path)', size: 8, taper: 0.02 },
      { label: 'Stainless steel hand file (glide path)', size: 10, taper: 0.02 },
      { label: 'Stainless steel hand file (glide path)', size: 15, taper: 0.02 },
    ],
    coronalFlaring: [{ label: 'Coronal flaring instrument', size: 25, taper: 0.08 }],
    shaping: {
      low: [
        { label: 'Shaping file', size: 20, taper: 0.04 },
        { label: 'Shaping file', size: 25, taper: 0.04 },
        { label: 'Shaping file', size: 30, taper: 0.04 },
        { label: 'Shaping file', size: 35, taper: 0.04 },
      ],
      moderate: [
        { label: 'Shaping file', size: 15, taper: 0.04 },
        { label: 'Shaping file', size: 20, taper: 0.04 },
        { label: 'Shaping file', size: 25, taper: 0.04 },
        { label: 'Shaping file', size: 30, taper: 0.04 },
      ],
      high: [
        { label: 'Shaping file', size: 15, taper: 0.04 },
        { label: 'Shaping file', size: 20, taper: 0.04 },
        { label: 'Shaping file', size: 25, taper: 0.04 },
      ],
    },
    flexibleApical: [
      { label: 'Heat-treated flexible file (apical third)', size: 20, taper: 0.04 },
      { label: 'Heat-treated flexible file (apical third)', size: 25, taper: 0.04 },
    ],
    betweenVisits: [
      { label: 'Calcium hydroxide dressing' },
      { label: 'Temporary filling material' },
    ],
    byProcedure: {
      initial: [
        { label: 'Rubber dam kit' },
        { label: 'Irrigation syringe with side-vented needle' },
        { label: 'Electronic apex locator' },
        { label: 'Paper points' },
        { label: 'Gutta-percha points and sealer' },
      ],
      retreatment: [
        { label: 'Rubber dam kit' },
        { label: 'Ultrasonic tips for post and filling removal' },
        { label: 'Root-filling removal files' },
        { label: 'Irrigation syringe with side-vented needle' },
        { label: 'Electronic apex locator' },
        { label: 'Paper points' },
        { label: 'Gutta-percha points and sealer' },
      ],
      surgery: [
        { label: 'Flap kit: scalpel, periosteal elevator, retractors' },
        { label: 'Micro-mirrors' },
        { label: 'Ultrasonic root-end preparation tips' },
        { label: 'Root-end filling material and carrier' },
        { label: 'Sutures' },
      ],
      consult: [
        { label: 'Cold test spray' },
        { label: 'Periodontal probe' },
        { label: 'Bite test instrument' },
        { label: 'Transillumination light' },
      ],
      emergency: [
        { label: 'Rubber dam kit' },
        { label: 'Irrigation syringe with side-vented needle' },
        { label: 'Electronic apex locator' },
        { label: 'Calcium hydroxide dressing' },
        { label: 'Temporary filling material' },
      ],
    },
  },
});

function deepFreeze<T>(value: T): T {
  if (value && typeof value === 'object') {
    for (const v of Object.values(value)) deepFreeze(v);
    Object.freeze(value);
  }
  return value;
}
