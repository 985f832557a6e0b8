/**
 * Difficulty assessment and chair-time estimate: request/response shapes shared by server and client,
 * plus the practice-editable estimate table. The computation lives on the server
 * (server/src/estimates/estimator); design/estimator.md is the spec.
 */

export const PROCEDURES = ['initial', 'retreatment', 'surgery', 'consult', 'emergency'] as const;
/** initial = nonsurgical root canal therapy; surgery = apical surgery; consult = consultation. */
export type Procedure = (typeof PROCEDURES)[number];

export const LEVELS = ['low', 'moderate', 'high'] as const;
export type Level = (typeof LEVELS)[number];

export const TOOTH_GROUPS = ['anterior', 'premolar', 'molar'] as const;
export type ToothGroup = (typeof TOOTH_GROUPS)[number];

export const FACTOR_GROUPS = ['patient', 'tooth', 'additional'] as const;
export type FactorGroup = (typeof FACTOR_GROUPS)[number];

/** Every difficulty factor, in the order the case sheet shows them (patient, tooth, additional). */
export const FACTOR_KEYS = [
  // patient
  'medicalHistory',
  'anaesthesia',
  'disposition',
  'mouthOpening',
  'gagReflex',
  'emergency',
  // diagnosis and tooth
  'diagnosis',
  'radiographs',
  'archPosition',
  'isolation',
  'crownMorphology',
  'canalMorphology',
  'canalVisibility',
  'resorption',
  'apicalOpening',
  'toothLength',
  // additional
  'traumaHistory',
  'previousTreatment',
  'perioEndo',
] as const;
export type FactorKey = (typeof FACTOR_KEYS)[number];

export interface FactorDefinition {
  key: FactorKey;
  label: string;
  group: FactorGroup;
  /** What each level means for this factor, in the case sheet's words. */
  levels: { low: string; moderate: string; high: string };
  /** The numeric or recorded fact that sets this factor's level when given (see EstimateFacts). */
  setByFact?: keyof EstimateFacts;
  /** True when the server fills the level from the tooth number if the form leaves it out. */
  derivedFromTooth?: boolean;
}

/** Complications left by an earlier attempt that earn the ledge/perforation/separated-instrument add-on. */
export const COMPLICATIONS = ['ledge', 'perforation', 'separated-instrument'] as const;
export type Complication = (typeof COMPLICATIONS)[number];

/** Facts behind factors; a fact, when given, sets its factor's level (it overrides the form's rating). */
export interface EstimateFacts {
  /** Root curvature in degrees (sets canalMorphology). */
  curvatureDegrees?: number;
  /** S-shaped canal (sets canalMorphology high). */
  sShapedCanal?: boolean;
  /** Apical opening (diameter) in mm (sets apicalOpening). */
  apicalOpeningMm?: number;
  /** Tooth length in mm (sets toothLength). */
  toothLengthMm?: number;
  /** ASA physical status class 1–6 (sets medicalHistory; class II's level is a table value). */
  asaClass?: number;
  /** Number of calcified canals (1 or more sets canalVisibility high; +15 min each up to the cap). */
  calcifiedCanals?: number;
  /** Complications from an earlier attempt (any sets previousTreatment high; one +30 add-on). */
  complications?: Complication[];
  /** Necrotic pulp with acute abscess or swelling (a two-visit rule). */
  acuteAbscess?: boolean;
}

export interface EstimateRequest {
  tooth: string;
  /** Notation of `tooth`; default the practice's setting. The API converts to FDI before estimating. */
  notation?: 'fdi' | 'universal';
  procedure: Procedure;
  /** Canal count; when left out the usual count for the tooth type is used and flagged as assumed. */
  canals?: number;
  assessment?: Partial<Record<FactorKey, Level>>;
  facts?: EstimateFacts;
  /** Treating endodontist; selects the learned operator factor when calibration is on. */
  operatorId?: number;
}

export interface EstimateVisit {
  /** 1-based. */
  index: number;
  /** Chair time of the visit (multiple of the booking grid, at most the longest visit). */
  minutes: number;
  /** Chair blocked after the visit for cleaning and setup; the operator is free. Not in `minutes`. */
  turnoverMinutes: number;
  needsMicroscope: boolean;
  purpose: string;
  /** Days after the previous visit; only on the second and later visits. */
  earliestDaysAfterPrevious?: number;
  latestDaysAfterPrevious?: number;
}

export interface BreakdownLine {
  label: string;
  /** Whole minutes; the lines add up exactly to EstimateResult.totalMinutes. */
  minutes: number;
}

export interface TrayItem {
  label: string;
  /** ISO 3630-1 size: tip diameter in hundredths of a millimetre. */
  size?: number;
  /** Taper in mm per mm, e.g. 0.02. */
  taper?: number;
  /** ISO 3630-1 size colour name (filled by the server from `size`). */
  colour?: string;
}

export interface EstimateResult {
  level: Level;
  /** Factors that set the level: the high ones, or the moderate ones when none is high; none when low. */
  levelReasons: FactorKey[];
  /** Moderate and high cases are flagged for cone-beam CT consideration. */
  cbctSuggested: boolean;
  /** Every factor's level after tooth-derived defaults and facts were applied. */
  assessment: Record<FactorKey, Level>;
  toothFdi: string;
  toothGroup: ToothGroup;
  canals: number;
  /** True when `canals` is the usual count for the tooth type, to be confirmed. */
  canalsAssumed: boolean;
  visits: EstimateVisit[];
  /** Sum of visit minutes (turnover excluded; it is reported per visit). */
  totalMinutes: number;
  breakdown: BreakdownLine[];
  /** 80 % band of total chair time, once the calibration cell has enough visits. */
  band?: { low: number; high: number };
  tableVersion: number;
  trayList: TrayItem[];
  /** Recall reviews after completion, months. */
  recallMonths: number[];
  /** Things the planner should see, e.g. a one-sitting surgery longer than the longest visit. */
  notes: string[];
}

/** A tray template entry; the colour is derived from the size. */
export interface TrayTemplateItem {
  label: string;
  size?: number;
  taper?: number;
}

/** Every practice-editable number of the estimate (design/estimator.md); the admin edits a copy. */
export interface EstimateTable {
  version: number;
  /** Booking grid: every visit is a multiple of this. */
  gridMinutes: number;
  longestVisitMinutes: number;
  turnoverMinutes: number;
  base: {
    /** Nonsurgical treatment at low tier, by tooth group (covers `canalsIncluded` canals). */
    initial: Record<ToothGroup, number>;
    surgery: Record<ToothGroup, number>;
    consult: number;
    emergency: number;
  };
  /** Canals the group's base already covers; each further canal adds `extraCanalMinutes`. */
  canalsIncluded: Record<ToothGroup, number>;
  extraCanalMinutes: number;
  /** Procedures whose base grows with extra canals. */
  extraCanalProcedures: Procedure[];
  tierMultiplier: Record<Level, number>;
  /** Procedures whose base is scaled by the tier multiplier. */
  tierProcedures: Procedure[];
  addOns: {
    /** Removal of the earlier root filling, added once for retreatment. */
    retreatmentRemovalMinutes: number;
    calcifiedCanalMinutes: number;
    calcifiedCanalMaxMinutes: number;
    complicationMinutes: number;
    limitedOpeningMinutes: number;
    severeCurvatureMinutes: number;
    patientManagementMinutes: number;
    /** Procedures that get the canal add-ons (calcification, complication, curvature). */
    canalProcedures: Procedure[];
    /** Procedures that get the patient add-ons (limited opening, anxious or medically complex). */
    patientProcedures: Procedure[];
  };
  twoVisit: {
    /**
     * Procedures that may be split over visits. Others are one sitting even past the longest visit
     * (a surgical flap is not reopened next week); the estimate then adds a note.
     */
    splittableProcedures: Procedure[];
    /** Procedures always planned in two visits (when splittable). */
    procedures: Procedure[];
    /** Levels always planned in two visits (practice rule; empty by default). */
    levels: Level[];
    /** Acute abscess or swelling (fact, or the emergency factor high) splits these procedures. */
    acuteAbscessProcedures: Procedure[];
    /** Extra set-up minutes for each added visit (anaesthesia, isolation, removing the temporary). */
    addedVisitSetupMinutes: number;
  };
  interval: { minDays: number; maxDays: number };
  microscope: {
    levels: Level[];
    procedures: Procedure[];
    calcifiedCanals: boolean;
    maxillaryMolars: boolean;
    /** Procedures that never book a microscope (e.g. a consultation). */
    exemptProcedures: Procedure[];
  };
  recall: { months: number[]; procedures: Procedure[] };
  thresholds: {
    /** curvature < this → low */
    curvatureModerateFromDegrees: number;
    /** curvature > this → high */
    curvatureHighAboveDegrees: number;
    apicalOpeningModerateFromMm: number;
    apicalOpeningHighAboveMm: number;
    toothLengthHighAboveMm: number;
  };
  /** Level of ASA class II (the 2022 form may count it as low; a table value). */
  asaClassTwoLevel: Level;
  calibration: {
    /** Booked length at this quantile of the learned distribution (0.5 = median). */
    bookingQuantile: number;
    cellPseudoVisits: number;
    operatorPseudoVisits: number;
    minVisitsForBand: number;
    bandCoverage: number;
    /** Log ratios are clipped to ±ln(this) so one wild visit cannot drag a cell far. */
    ratioClip: number;
  };
  tray: {
    /** Procedures that get the canal instruments (glide path, flaring, shaping). */
    canalProcedures: Procedure[];
    glidePath: TrayTemplateItem[];
    coronalFlaring: TrayTemplateItem[];
    shaping: Record<Level, TrayTemplateItem[]>;
    /** For curved or high cases: heat-treated, more flexible files for the apical third. */
    flexibleApical: TrayTemplateItem[];
    /** Added when a canal procedure is planned in more than one visit (dressing and temporary seal). */
    betweenVisits: TrayTemplateItem[];
    byProcedure: Record<Procedure, TrayTemplateItem[]>;
  };
}

/** One completed visit as the learning sees it: table minutes (uncalibrated) vs seated→dismissed. */
export interface CompletedVisit {
  procedure: Procedure;
  toothGroup: ToothGroup;
  level: Level;
  operatorId?: number;
  /** The table's estimate for this visit, before calibration. */
  estimatedMinutes: number;
  actualMinutes: number;
}

export interface AccuracyStats {
  /** Mean |actual − estimate|, minutes. */
  meanAbsoluteError: number;
  /** Mean (actual − estimate), minutes: positive = visits run longer than estimated. */
  bias: number;
}

/** One row of the estimate-accuracy report (procedure × tooth group × level). */
export interface CellAccuracy {
  procedure: Procedure;
  toothGroup: ToothGroup;
  level: Level;
  count: number;
  before: AccuracyStats;
  after: AccuracyStats;
}
