import {
  COMPLICATIONS,
  FACTOR_GROUPS,
  toothInfo,
  type BreakdownLine,
  type CaseSheet,
  type Complication,
  type EstimateFacts,
  type EstimateRequest,
  type EstimateResult,
  type FactorDefinition,
  type FactorGroup,
  type FactorKey,
  type Level,
  type Procedure,
  type UpdateCaseSheetRequest,
} from '@ostium/shared';

export const PROCEDURE_LABELS: Record<Procedure, string> = {
  initial: 'Root canal therapy',
  retreatment: 'Retreatment',
  surgery: 'Apical surgery',
  consult: 'Consultation',
  emergency: 'Emergency',
};

export const GROUP_LABELS: Record<FactorGroup, string> = {
  patient: 'Patient',
  tooth: 'Diagnosis and tooth',
  additional: 'Additional',
};

export const LEVEL_LABELS: Record<Level, string> = { low: 'Low', moderate: 'Moderate', high: 'High' };

export const COMPLICATION_LABELS: Record<Complication, string> = {
  ledge: 'Ledge',
  perforation: 'Perforation',
  'separated-instrument': 'Separated instrument',
};

/** The override as the sheet edits it: `undefined` leaves the stored one alone, `null` removes it. */
export type DraftOverride = { minutesPerVisit: number[]; reason: string } | null | undefined;

/** What the case sheet edits before it is saved. */
export interface SheetDraft {
  procedure: Procedure;
  canals: number | null;
  assessment: Partial<Record<FactorKey, Level>>;
  facts: EstimateFacts;
  operatorId: number | null;
  override: DraftOverride;
}

export function draftFromCase(c: CaseSheet): SheetDraft {
  return {
    procedure: c.procedure,
    canals: c.canals,
    assessment: { ...c.assessment },
    facts: { ...c.facts, complications: c.facts.complications ? [...c.facts.complications] : undefined },
    operatorId: c.operatorId,
    override: undefined,
  };
}

/**
 * Facts as the API wants them: empty inputs left out, and the "nothing found" values too, since
 * 0 calcified canals, no complications or an unticked S-shape measure nothing.
 */
export function cleanFacts(f: EstimateFacts): EstimateFacts {
  const out: EstimateFacts = {};
  const num = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);
  if (num(f.curvatureDegrees)) out.curvatureDegrees = f.curvatureDegrees;
  if (f.sShapedCanal) out.sShapedCanal = true;
  if (num(f.apicalOpeningMm)) out.apicalOpeningMm = f.apicalOpeningMm;
  if (num(f.toothLengthMm)) out.toothLengthMm = f.toothLengthMm;
  if (num(f.asaClass)) out.asaClass = f.asaClass;
  if (num(f.calcifiedCanals) && f.calcifiedCanals > 0) out.calcifiedCanals = f.calcifiedCanals;
  if (f.complications?.length) out.complications = COMPLICATIONS.filter((c) => f.complications!.includes(c));
  if (f.acuteAbscess) out.acuteAbscess = true;
  return out;
}

/** Plausibility limits of the inputs, the same as the server's (server/src/estimates/estimator/factors.util.ts). */
export const INPUT_LIMITS = {
  canals: { min: 1, max: 8, integer: true },
  curvatureDegrees: { min: 0, max: 180, integer: false },
  apicalOpeningMm: { min: 0, max: 10, integer: false },
  toothLengthMm: { min: 1, max: 60, integer: false },
  asaClass: { min: 1, max: 6, integer: true },
  calcifiedCanals: { min: 0, max: 8, integer: true },
} as const;

/** Field problems of a draft, keyed like the server's error fields (`canals`, `facts.curvatureDegrees`). */
export function draftErrors(d: SheetDraft, usualCanals?: number): Record<string, string> {
  const errors: Record<string, string> = {};
  const check = (field: string, v: number | null | undefined, lim: { min: number; max: number; integer: boolean }) => {
    if (v === undefined || v === null) return;
    if (!Number.isFinite(v) || v < lim.min || v > lim.max) errors[field] = `From ${lim.min} to ${lim.max}`;
    else if (lim.integer && !Number.isInteger(v)) errors[field] = 'A whole number';
  };
  check('canals', d.canals, INPUT_LIMITS.canals);
  for (const k of ['curvatureDegrees', 'apicalOpeningMm', 'toothLengthMm', 'asaClass', 'calcifiedCanals'] as const) {
    check(`facts.${k}`, d.facts[k], INPUT_LIMITS[k]);
  }
  const canals = d.canals ?? usualCanals;
  if (!errors['facts.calcifiedCanals'] && canals !== undefined && (d.facts.calcifiedCanals ?? 0) > canals) {
    errors['facts.calcifiedCanals'] = `More than the ${canals} canals of the case`;
  }
  return errors;
}

/** The live-preview request for the case's tooth (stored in FDI, so the notation is named). */
export function previewRequest(toothFdi: string, d: SheetDraft): EstimateRequest {
  const req: EstimateRequest = { tooth: toothFdi, notation: 'fdi', procedure: d.procedure, assessment: { ...d.assessment }, facts: cleanFacts(d.facts) };
  if (d.canals !== null) req.canals = d.canals;
  if (d.operatorId !== null) req.operatorId = d.operatorId;
  return req;
}

/** The PATCH body of Save; only an endodontist's sheet may carry the override. */
export function patchBody(d: SheetDraft, mayAdjust: boolean): UpdateCaseSheetRequest {
  const body: UpdateCaseSheetRequest = {
    procedure: d.procedure,
    canals: d.canals,
    assessment: { ...d.assessment },
    facts: cleanFacts(d.facts),
    operatorId: d.operatorId,
    markPlanned: true,
  };
  if (mayAdjust && d.override !== undefined) {
    body.override = d.override === null ? null : { minutesPerVisit: [...d.override.minutesPerVisit], reason: d.override.reason.trim() };
  }
  return body;
}

export function groupFactors(defs: FactorDefinition[]): { group: FactorGroup; label: string; factors: FactorDefinition[] }[] {
  return FACTOR_GROUPS.map((g) => ({ group: g, label: GROUP_LABELS[g], factors: defs.filter((f) => f.group === g) })).filter((g) => g.factors.length > 0);
}

const ROMAN = ['', 'I', 'II', 'III', 'IV', 'V', 'VI'];

const trimNumber = (n: number) => String(Number(n.toFixed(2)));

/** Why a fact locks its row, e.g. "set by curvature 35°"; undefined when no fact sets the row. */
export function factNote(key: FactorKey, f: EstimateFacts, procedure: Procedure): string | undefined {
  switch (key) {
    case 'canalMorphology': {
      const parts: string[] = [];
      if (typeof f.curvatureDegrees === 'number') parts.push(`curvature ${trimNumber(f.curvatureDegrees)}°`);
      if (f.sShapedCanal) parts.push('S-shaped canal');
      return parts.length ? `set by ${parts.join(' and ')}` : undefined;
    }
    case 'apicalOpening':
      return typeof f.apicalOpeningMm === 'number' ? `set by apical opening ${trimNumber(f.apicalOpeningMm)} mm` : undefined;
    case 'toothLength':
      return typeof f.toothLengthMm === 'number' ? `set by tooth length ${trimNumber(f.toothLengthMm)} mm` : undefined;
    case 'medicalHistory':
      return typeof f.asaClass === 'number' ? `set by ASA class ${ROMAN[f.asaClass] ?? f.asaClass}` : undefined;
    case 'canalVisibility':
      return (f.calcifiedCanals ?? 0) > 0 ? `set by ${f.calcifiedCanals} calcified canal${f.calcifiedCanals === 1 ? '' : 's'}` : undefined;
    case 'previousTreatment':
      if (f.complications?.length) return `set by ${f.complications.map((c) => COMPLICATION_LABELS[c].toLowerCase()).join(', ')}`;
      // A retreatment always follows an earlier treatment; the server rates it high.
      return procedure === 'retreatment' ? 'set by the procedure (retreatment)' : undefined;
    default:
      return undefined;
  }
}

export interface RowState {
  value: Level;
  /** A fact or the procedure fixes the level; the three choices are read-only. */
  readOnly: boolean;
  note?: string;
}

/** What one assessment row shows: the form's rating, or the level a fact, the tooth or the procedure set. */
export function rowState(def: FactorDefinition, d: SheetDraft, result: EstimateResult | null | undefined, toothShown: string): RowState {
  const resolved = result?.assessment[def.key];
  const note = factNote(def.key, d.facts, d.procedure);
  if (note) return { value: resolved ?? d.assessment[def.key] ?? 'low', readOnly: true, note };
  const given = d.assessment[def.key];
  if (given) return { value: given, readOnly: false, note: resolved && resolved !== given ? `counted as ${resolved}` : undefined };
  if (def.derivedFromTooth) return { value: resolved ?? 'low', readOnly: false, note: `from tooth ${toothShown}` };
  return { value: resolved ?? 'low', readOnly: false };
}

export const breakdownSum = (lines: BreakdownLine[]) => lines.reduce((s, l) => s + l.minutes, 0);

/** "lower left first molar" */
export function toothName(fdi: string): string {
  const t = toothInfo(fdi);
  return `${t.jaw === 'maxillary' ? 'upper' : 'lower'} ${t.side} ${t.dentition === 'primary' ? 'primary ' : ''}${t.tooth}`;
}

/** Screen colours of the ISO 3630-1 size colour names the server sends (our own shades). */
export const ISO_SWATCH: Record<string, string> = {
  pink: '#f1a9c4',
  grey: '#9c9a97',
  purple: '#7d4fa3',
  white: '#ffffff',
  yellow: '#f3d23a',
  red: '#d63a2f',
  blue: '#2e6bcf',
  green: '#2f9650',
  black: '#26231f',
};

/** Minutes of a plan as "1 h 45 min". */
export function formatMinutes(m: number): string {
  if (m < 60) return `${m} min`;
  const h = Math.floor(m / 60);
  const r = m % 60;
  return r ? `${h} h ${r} min` : `${h} h`;
}

/** Checks an endodontist's adjustment; keys like the server's (`override.reason`, `override.minutesPerVisit.0`). */
export function overrideErrors(minutes: (number | string)[], reason: string): Record<string, string> {
  const errors: Record<string, string> = {};
  minutes.forEach((m, i) => {
    if (typeof m !== 'number' || !Number.isInteger(m) || m < 5 || m > 600) errors[`override.minutesPerVisit.${i}`] = 'Whole minutes from 5 to 600';
  });
  if (!reason.trim()) errors['override.reason'] = 'Give the reason for the change';
  return errors;
}
