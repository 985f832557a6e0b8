import {
  PROCEDURES,
  type BreakdownLine,
  type EstimateFacts,
  type EstimateResult,
  type EstimateTable,
  type EstimateVisit,
  type FactorKey,
  type Level,
  type Procedure,
  type ToothGroup,
  type TrayItem,
  type TrayTemplateItem,
} from '@ostium/shared';
import { isMaxillaryMolar, toothGroup, usualCanals } from './canals.util.js';
import { DEFAULT_ESTIMATE_TABLE } from '@ostium/shared';
import { combine } from './difficulty.util.js';
import { checkAssessment, checkFacts, MAX_CANALS, resolveAssessment } from './factors.util.js';
import { EstimateInputError } from './input-error.util.js';
import { isoColour } from './instruments.util.js';
import { parseFdi, type FdiTooth } from './tooth-fdi.util.js';

export interface EstimateInput {
  /** FDI two-digit code; the API converts Universal numbers first. */
  toothFdi: string;
  procedure: Procedure;
  canals?: number;
  assessment?: Partial<Record<FactorKey, Level>>;
  facts?: EstimateFacts;
}

/** A learned adjustment: minutes × multiplier; band factors are relative to the calibrated minutes. */
export interface Calibration {
  multiplier: number;
  band?: { lowFactor: number; highFactor: number };
}

/** The learning cell an estimate falls in (procedure × tooth group × level). */
export interface CalibrationCell {
  procedure: Procedure;
  toothGroup: ToothGroup;
  level: Level;
}

/** A fixed calibration, or a lookup by cell (the level is only known inside estimate()). */
export type CalibrationSource = Calibration | ((cell: CalibrationCell) => Calibration | undefined);

const PROCEDURE_NAMES: Record<Procedure, string> = {
  initial: 'root canal treatment',
  retreatment: 'retreatment',
  surgery: 'apical surgery',
  consult: 'consultation',
  emergency: 'emergency visit',
};

/** Highest visit count we plan before calling the input unreasonable (a sanity stop, not a rule). */
const MAX_VISITS = 50;
// Guards ceil() against binary noise such as 112.50000000000001 / 5.
const EPS = 1e-9;

/** Checks a (practice-edited) table; a bad table would otherwise give nonsense or loop. */
export function checkTable(table: EstimateTable): void {
  const bad = (path: string, why: string): never => {
    throw new EstimateInputError(`table.${path}`, why);
  };
  const nonNeg = (path: string, v: unknown) => {
    if (typeof v !== 'number' || !Number.isFinite(v) || v < 0) bad(path, 'must be a number ≥ 0');
  };
  if (!Number.isInteger(table.gridMinutes) || table.gridMinutes <= 0) bad('gridMinutes', 'must be a whole number > 0');
  if (!(table.longestVisitMinutes >= table.gridMinutes)) bad('longestVisitMinutes', 'must be at least one grid step');
  nonNeg('turnoverMinutes', table.turnoverMinutes);
  for (const g of ['anterior', 'premolar', 'molar'] as const) {
    nonNeg(`base.initial.${g}`, table.base.initial[g]);
    nonNeg(`base.surgery.${g}`, table.base.surgery[g]);
    if (!Number.isInteger(table.canalsIncluded[g]) || table.canalsIncluded[g] < 1) {
      bad(`canalsIncluded.${g}`, 'must be a whole number ≥ 1');
    }
  }
  nonNeg('base.consult', table.base.consult);
  nonNeg('base.emergency', table.base.emergency);
  nonNeg('extraCanalMinutes', table.extraCanalMinutes);
  for (const l of ['low', 'moderate', 'high'] as const) {
    const m = table.tierMultiplier[l];
    if (!(m > 0) || !Number.isFinite(m)) bad(`tierMultiplier.${l}`, 'must be > 0');
  }
  // Monotone tiers keep "a harder case never gets less time" true.
  if (!(table.tierMultiplier.low <= table.tierMultiplier.moderate && table.tierMultiplier.moderate <= table.tierMultiplier.high)) {
    bad('tierMultiplier', 'must not decrease from low to high');
  }
  for (const [k, v] of Object.entries(table.addOns)) {
    if (!Array.isArray(v)) nonNeg(`addOns.${k}`, v);
  }
  nonNeg('twoVisit.addedVisitSetupMinutes', table.twoVisit.addedVisitSetupMinutes);
  if (table.twoVisit.addedVisitSetupMinutes >= table.longestVisitMinutes / 2) {
    bad('twoVisit.addedVisitSetupMinutes', 'must be under half the longest visit');
  }
  if (!(table.interval.minDays >= 0 && table.interval.maxDays >= table.interval.minDays)) {
    bad('interval', 'needs 0 ≤ minDays ≤ maxDays');
  }
}

function ceilToGrid(minutes: number, grid: number): number {
  return Math.ceil(minutes / grid - EPS) * grid;
}

function floorToGrid(minutes: number, grid: number): number {
  return Math.floor(minutes / grid + EPS) * grid;
}

function formatFactor(x: number): string {
  return `×${Number(x.toFixed(3))}`;
}

function plural(n: number, one: string, many = `${one}s`): string {
  return `${n} ${n === 1 ? one : many}`;
}

function resolveCalibration(source: CalibrationSource | undefined, cell: CalibrationCell): Calibration | undefined {
  const cal = typeof source === 'function' ? source(cell) : source;
  if (!cal) return undefined;
  if (!(cal.multiplier > 0) || !Number.isFinite(cal.multiplier)) {
    throw new EstimateInputError('calibration.multiplier', 'must be a finite number > 0');
  }
  if (cal.band && !(cal.band.lowFactor > 0 && cal.band.highFactor >= cal.band.lowFactor && Number.isFinite(cal.band.highFactor))) {
    throw new EstimateInputError('calibration.band', 'needs 0 < lowFactor ≤ highFactor');
  }
  return cal;
}

function visitPurpose(procedure: Procedure, index: number, count: number): string {
  const canalWork = procedure === 'initial' || procedure === 'retreatment';
  if (canalWork) {
    const opening =
      procedure === 'retreatment' ? 'Removal of the earlier root filling, cleaning and shaping' : 'Access, cleaning and shaping';
    if (count === 1) return `${opening}, root canal filling`;
    if (index === 1) return `${opening}; calcium hydroxide dressing`;
    if (index === count) return 'Root canal filling (obturation)';
    return 'Shaping continued; dressing renewed';
  }
  const name =
    procedure === 'surgery'
      ? 'Apical surgery'
      : procedure === 'consult'
        ? 'Consultation and examination'
        : 'Emergency care: pain relief and canal debridement';
  return count === 1 ? name : `${name}, part ${index} of ${count}`;
}

function trayItem(t: TrayTemplateItem): TrayItem {
  const item: TrayItem = { label: t.label };
  if (t.size !== undefined) {
    item.size = t.size;
    const colour = isoColour(t.size);
    if (colour) item.colour = colour;
  }
  if (t.taper !== undefined) item.taper = t.taper;
  return item;
}

function trayList(
  table: EstimateTable,
  procedure: Procedure,
  level: Level,
  curved: boolean,
  visits: number,
): TrayItem[] {
  const t = table.tray;
  const parts: TrayTemplateItem[] = [...t.byProcedure[procedure]];
  if (t.canalProcedures.includes(procedure)) {
    parts.push(...t.glidePath, ...t.coronalFlaring, ...t.shaping[level]);
    // Curved or high cases get heat-treated, more flexible files for the apical third.
    if (curved || level === 'high') parts.push(...t.flexibleApical);
    if (visits > 1) parts.push(...t.betweenVisits);
  }
  const seen = new Set<string>();
  const out: TrayItem[] = [];
  for (const p of parts) {
    const key = `${p.label}|${p.size ?? ''}|${p.taper ?? ''}`;
    if (seen.has(key)) continue;
    seen.add(key);
    out.push(trayItem(p));
  }
  return out;
}

/**
 * Difficulty and chair-time estimate for one tooth (design/estimator.md).
 *
 * Work = base(procedure, group, canals) × tier multiplier + add-ons. A splittable (nonsurgical)
 * plan is split into as few visits as the longest-visit limit and the two-visit rules allow — past
 * two if even two would be too long; other procedures are one sitting, with a note when long. The
 * calibration multiplier (if any) scales the planned minutes; the total is rounded up to the booking
 * grid and shared out in whole grid steps, earlier visits taking any odd step (shaping runs longer).
 *
 * totalMinutes is the sum of the visits' chair time. Turnover is NOT in it: each visit reports its own
 * turnoverMinutes (the chair is blocked, the operator is free), so the breakdown lines — base, extra
 * canals, tier, each add-on, split, calibration, rounding — add up exactly to totalMinutes. Lines are
 * whole minutes rounded on the running total, so rounding never leaks between lines.
 */
export function estimate(
  input: EstimateInput,
  table: EstimateTable = DEFAULT_ESTIMATE_TABLE,
  calibration?: CalibrationSource,
): EstimateResult {
  checkTable(table);
  if (!input || typeof input !== 'object') throw new EstimateInputError('body', 'must be an object');
  const procedure = input.procedure;
  if (!(PROCEDURES as readonly unknown[]).includes(procedure)) {
    throw new EstimateInputError('procedure', `must be one of ${PROCEDURES.join(', ')}`);
  }
  const tooth: FdiTooth = parseFdi(input.toothFdi, 'tooth');
  const group = toothGroup(tooth);

  let canals: number;
  const canalsAssumed = input.canals === undefined || input.canals === null;
  if (canalsAssumed) {
    canals = usualCanals(tooth);
  } else {
    canals = input.canals as number;
    if (typeof canals !== 'number' || !Number.isInteger(canals) || canals < 1 || canals > MAX_CANALS) {
      throw new EstimateInputError('canals', `must be a whole number from 1 to ${MAX_CANALS}`);
    }
  }

  const assessment = checkAssessment(input.assessment);
  const facts = checkFacts(input.facts);
  if ((facts.calcifiedCanals ?? 0) > canals) {
    throw new EstimateInputError('facts.calcifiedCanals', `is more than the ${canals} canals of the case`);
  }
  const resolved = resolveAssessment(tooth, procedure, assessment, facts, table);
  const levels = resolved.levels;
  const difficulty = combine(levels);
  const level = difficulty.level;

  // ---- work (exact minutes, possibly fractional) ------------------------------------------------
  const lines: { label: string; exact: number }[] = [];
  const add = (label: string, exact: number) => lines.push({ label, exact });

  let base: number;
  let baseLabel: string;
  switch (procedure) {
    case 'initial':
    case 'retreatment':
      base = table.base.initial[group];
      baseLabel = `Base: ${PROCEDURE_NAMES[procedure]}, ${group} tooth, up to ${plural(table.canalsIncluded[group], 'canal')}`;
      break;
    case 'surgery':
      base = table.base.surgery[group];
      baseLabel = `Base: apical surgery, ${group} tooth`;
      break;
    case 'consult':
      base = table.base.consult;
      baseLabel = 'Base: consultation';
      break;
    default:
      base = table.base.emergency;
      baseLabel = 'Base: emergency visit';
  }
  add(baseLabel, base);

  let scaled = base;
  const extraCanals = table.extraCanalProcedures.includes(procedure)
    ? Math.max(0, canals - table.canalsIncluded[group])
    : 0;
  if (extraCanals > 0) {
    const m = extraCanals * table.extraCanalMinutes;
    add(`${plural(extraCanals, 'canal')} beyond the base (+${table.extraCanalMinutes} each)`, m);
    scaled += m;
  }
  if (table.tierProcedures.includes(procedure)) {
    const mult = table.tierMultiplier[level];
    add(`Difficulty ${level}: ${formatFactor(mult)}`, scaled * (mult - 1));
  }

  const a = table.addOns;
  if (procedure === 'retreatment') add('Removal of the earlier root filling', a.retreatmentRemovalMinutes);
  // Visibility rated high means at least one calcified canal even without a count.
  const calcified = Math.min(
    canals,
    Math.max(facts.calcifiedCanals ?? 0, levels.canalVisibility === 'high' ? 1 : 0),
  );
  if (a.canalProcedures.includes(procedure)) {
    if (calcified > 0) {
      const m = Math.min(calcified * a.calcifiedCanalMinutes, a.calcifiedCanalMaxMinutes);
      add(`${plural(calcified, 'calcified canal')} (+${a.calcifiedCanalMinutes} each, at most +${a.calcifiedCanalMaxMinutes})`, m);
    }
    if ((facts.complications?.length ?? 0) > 0) {
      const names = facts.complications!.map((c) => c.replace('-', ' ')).join(', ');
      add(`Complication from an earlier attempt: ${names}`, a.complicationMinutes);
    }
    if (levels.canalMorphology === 'high') add('Severe curvature (over 30° or S-shaped)', a.severeCurvatureMinutes);
  }
  if (a.patientProcedures.includes(procedure)) {
    if (levels.mouthOpening !== 'low') add('Limited mouth opening', a.limitedOpeningMinutes);
    const anxious = levels.disposition !== 'low';
    const complex = levels.medicalHistory === 'high';
    if (anxious || complex) {
      const who = anxious && complex ? 'Anxious and medically complex patient' : anxious ? 'Anxious or uncooperative patient' : 'Medically complex patient';
      add(who, a.patientManagementMinutes);
    }
  }
  const work = lines.reduce((s, l) => s + l.exact, 0);

  // ---- visits -----------------------------------------------------------------------------------
  const splittable = table.twoVisit.splittableProcedures.includes(procedure);
  const splitReasons: string[] = [];
  if (splittable) {
    if (table.twoVisit.procedures.includes(procedure)) splitReasons.push(`${PROCEDURE_NAMES[procedure]} rule`);
    if (table.twoVisit.levels.includes(level)) splitReasons.push(`${level} difficulty rule`);
    if (
      table.twoVisit.acuteAbscessProcedures.includes(procedure) &&
      (facts.acuteAbscess === true || levels.emergency === 'high')
    ) {
      splitReasons.push('acute abscess or swelling');
    }
  }
  const minVisits = splitReasons.length > 0 ? 2 : 1;
  const notes: string[] = [];

  const cell: CalibrationCell = { procedure, toothGroup: group, level };
  const cal = resolveCalibration(calibration, cell);
  const multiplier = cal?.multiplier ?? 1;
  const grid = table.gridMinutes;
  const capUnits = Math.floor(table.longestVisitMinutes / grid + EPS);
  const setup = table.twoVisit.addedVisitSetupMinutes;

  if (splittable && setup * multiplier >= capUnits * grid) {
    // Each added visit would eat a whole visit's length: no split can ever fit.
    throw new EstimateInputError('plan', 'the set-up per added visit (after calibration) fills a whole visit');
  }
  let visitCount = minVisits;
  let units = 0;
  for (;;) {
    const planned = (work + (visitCount - 1) * setup) * multiplier;
    // Every visit gets at least one grid step.
    units = Math.max(visitCount, Math.ceil(planned / grid - EPS));
    if (Math.ceil(units / visitCount) <= capUnits) break;
    if (!splittable) {
      notes.push(
        `${visitPurpose(procedure, 1, 1)} is booked in one sitting of ${units * grid} min, longer than the ${table.longestVisitMinutes}-minute longest visit`,
      );
      break;
    }
    visitCount += 1;
    if (visitCount > MAX_VISITS) {
      throw new EstimateInputError('plan', `needs more than ${MAX_VISITS} visits; check the input and the calibration`);
    }
  }
  if (visitCount > 1) {
    // Name the length as a reason too when one sitting would be too long, even if a rule split first.
    if (Math.ceil((work * multiplier) / grid - EPS) > capUnits) {
      splitReasons.push(`longer than the ${table.longestVisitMinutes}-minute longest visit`);
    }
    add(
      `Split into ${visitCount} visits (${splitReasons.join('; ')})${setup > 0 ? `, +${setup} set-up per added visit` : ''}`,
      (visitCount - 1) * setup,
    );
  }
  if (cal) {
    const planned = work + (visitCount - 1) * setup;
    add(`Calibration from completed visits: ${formatFactor(multiplier)}`, planned * (multiplier - 1));
  }
  const totalMinutes = units * grid;

  // Whole minutes on the running total, then one rounding line closes the gap to the grid total.
  const breakdown: BreakdownLine[] = [];
  let running = 0;
  let shown = 0;
  for (const l of lines) {
    running += l.exact;
    const upTo = Math.round(running + EPS);
    breakdown.push({ label: l.label, minutes: upTo - shown });
    shown = upTo;
  }
  if (totalMinutes !== shown) {
    breakdown.push({ label: `Rounded up to the ${grid}-minute booking grid`, minutes: totalMinutes - shown });
  }

  const needsMicroscope =
    !table.microscope.exemptProcedures.includes(procedure) &&
    (table.microscope.levels.includes(level) ||
      table.microscope.procedures.includes(procedure) ||
      (table.microscope.calcifiedCanals && calcified > 0) ||
      (table.microscope.maxillaryMolars && isMaxillaryMolar(tooth)));

  const perVisit = Math.floor(units / visitCount);
  const extra = units % visitCount;
  const visits: EstimateVisit[] = [];
  for (let i = 1; i <= visitCount; i++) {
    const v: EstimateVisit = {
      index: i,
      minutes: (perVisit + (i <= extra ? 1 : 0)) * grid,
      turnoverMinutes: table.turnoverMinutes,
      needsMicroscope,
      purpose: visitPurpose(procedure, i, visitCount),
    };
    if (i > 1) {
      v.earliestDaysAfterPrevious = table.interval.minDays;
      v.latestDaysAfterPrevious = table.interval.maxDays;
    }
    visits.push(v);
  }

  const result: EstimateResult = {
    level,
    levelReasons: difficulty.levelReasons,
    cbctSuggested: difficulty.cbctSuggested,
    assessment: levels,
    toothFdi: tooth.fdi,
    toothGroup: group,
    canals,
    canalsAssumed,
    visits,
    totalMinutes,
    breakdown,
    tableVersion: table.version,
    trayList: trayList(table, procedure, level, levels.canalMorphology !== 'low', visitCount),
    recallMonths: table.recall.procedures.includes(procedure) ? [...table.recall.months] : [],
    notes,
  };
  if (cal?.band) {
    result.band = {
      low: floorToGrid(totalMinutes * cal.band.lowFactor, grid),
      high: ceilToGrid(totalMinutes * cal.band.highFactor, grid),
    };
  }
  return result;
}
