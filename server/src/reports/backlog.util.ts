// Backlog forecast (REPORT_DEFINITIONS.backlog) and its what-if. The cases still to book are priced at
// the practice's average minutes for their level and divided by the capacity of the coming weeks: per
// location and day, free chair minutes, but no more than the endodontists' free minutes there that day
// (a chair nobody works is no capacity). Every step is monotone in the added capacity, so adding chair
// or operator days can never lengthen the backlog, and zero capacity says "no open time" instead of ÷ 0.
// Pure.
import { LEVELS, type BacklogReport, type BacklogRow, type EstimateTable, type Level } from '@ostium/shared';
import { DEFAULT_DAY_MINUTES, MIN_CASES_FOR_AVERAGE } from './report-constants.js';
import { roundMinutes } from './report-time.util.js';

export type BacklogLevel = Level | 'untriaged';
export const BACKLOG_LEVELS: readonly BacklogLevel[] = [...LEVELS, 'untriaged'];

/** One horizon day of one location, in minutes. */
export interface CapacityDay {
  /** Open chair minutes (all chairs) minus the chair minutes already booked. */
  chairFree: number;
  /** Working minutes of the endodontists at the location minus their booked clinical minutes. */
  operatorFree: number;
  chairOpen: number;
}

export interface LocationCapacity {
  locationId: number;
  locationName: string;
  /** One entry per horizon day, in order (the same days for every location). */
  days: readonly CapacityDay[];
  /** (chair, day) pairs with open time over the horizon, and their open minutes. */
  openChairDays: number;
  /** (operator, day) pairs with working time here over the horizon, and their working minutes. */
  operatorDays: number;
  workingMinutes: number;
}

export interface BacklogCases {
  locationId: number;
  level: BacklogLevel;
  cases: number;
}

export interface LevelAverage {
  level: BacklogLevel;
  minutes: number;
  basis: 'visits' | 'estimate_table';
}

export interface WhatIf {
  chairDaysPerWeek: number;
  operatorDaysPerWeek: number;
  locationId?: number;
}

export interface BacklogInput {
  locations: readonly LocationCapacity[];
  cases: readonly BacklogCases[];
  averages: readonly LevelAverage[];
  whatIf?: WhatIf;
}

export type BacklogFigures = Omit<BacklogReport, 'range' | 'horizon'> & { assumptions: { chairDayMinutes: number; operatorDayMinutes: number; horizonWeeks: number } };

const sum = (xs: readonly number[]) => xs.reduce((s, x) => s + x, 0);

/** Minutes one chair day and one operator day stand for: the horizon's averages (8 h without any). */
export function dayMinutes(locations: readonly LocationCapacity[]): { chairDayMinutes: number; operatorDayMinutes: number } {
  const openDays = sum(locations.map((l) => l.openChairDays));
  const opDays = sum(locations.map((l) => l.operatorDays));
  const open = sum(locations.flatMap((l) => l.days.map((d) => d.chairOpen)));
  const working = sum(locations.map((l) => l.workingMinutes));
  return {
    chairDayMinutes: openDays > 0 ? open / openDays : DEFAULT_DAY_MINUTES,
    operatorDayMinutes: opDays > 0 ? working / opDays : DEFAULT_DAY_MINUTES,
  };
}

interface Adjusted {
  capacity: number[];
  chairFree: number[];
  chairOpen: number[];
  operatorFree: number[];
}

/**
 * One location's days with the added days: a chair day (staffed) adds its minutes to chairs and
 * operators alike, spread over the seven days; an operator day adds operator minutes on the days the
 * location is open. Each day's capacity = max(0, min(chair free, operator free)). Monotone in both.
 */
function adjust(loc: LocationCapacity, chairDays: number, operatorDays: number, m: { chairDayMinutes: number; operatorDayMinutes: number }): Adjusted {
  const openDays = loc.days.filter((d) => d.chairOpen > 0).length;
  const weeks = loc.days.length / 7;
  const perOpenDay = openDays > 0 ? (operatorDays * m.operatorDayMinutes * weeks) / openDays : 0;
  const chairPerDay = (chairDays * m.chairDayMinutes) / 7;
  const out: Adjusted = { capacity: [], chairFree: [], chairOpen: [], operatorFree: [] };
  for (const d of loc.days) {
    const chairFree = Math.max(0, d.chairFree + chairPerDay);
    const opOnly = Math.max(0, d.operatorFree + (d.chairOpen > 0 ? perOpenDay : 0));
    out.chairFree.push(chairFree);
    out.chairOpen.push(Math.max(0, d.chairOpen + chairPerDay));
    out.operatorFree.push(Math.max(0, opOnly + chairPerDay));
    out.capacity.push(Math.max(0, Math.min(Math.max(0, d.chairFree), opOnly) + chairPerDay));
  }
  return out;
}

/** Weeks from tomorrow until the day-by-day capacity has served `minutes` (beyond the horizon at its average). */
export function leadTimeWeeks(daily: readonly number[], minutes: number): number | null {
  const total = sum(daily);
  if (!(total > 0)) return null;
  if (minutes <= 0) return 0;
  let cum = 0;
  for (let i = 0; i < daily.length; i++) {
    const c = daily[i]!;
    if (cum + c >= minutes) return (i + (minutes - cum) / c) / 7;
    cum += c;
  }
  return (daily.length + (minutes - cum) / (total / daily.length)) / 7;
}

export function backlogForecast(input: BacklogInput): BacklogFigures {
  const m = dayMinutes(input.locations);
  const horizonDays = input.locations[0]?.days.length ?? 0;
  const weeks = horizonDays / 7;
  const wi = input.whatIf ?? { chairDaysPerWeek: 0, operatorDaysPerWeek: 0 };
  // Added days go to the named location, or are shared by the locations in proportion to their open chair time.
  const openOf = (l: LocationCapacity) => sum(l.days.map((d) => d.chairOpen));
  const allOpen = sum(input.locations.map(openOf));
  const weight = (l: LocationCapacity) =>
    wi.locationId !== undefined ? (l.locationId === wi.locationId ? 1 : 0) : allOpen > 0 ? openOf(l) / allOpen : 1 / input.locations.length;
  const adjusted = new Map(input.locations.map((l) => [l.locationId, adjust(l, wi.chairDaysPerWeek * weight(l), wi.operatorDaysPerWeek * weight(l), m)]));
  const perWeek = (xs: readonly number[]) => (weeks > 0 ? sum(xs) / weeks : 0);

  const avg = new Map(input.averages.map((a) => [a.level, a.minutes]));
  const rows: BacklogRow[] = [];
  let totalMinutes = 0;
  for (const l of input.locations) {
    const capacity = perWeek(adjusted.get(l.locationId)!.capacity);
    for (const level of BACKLOG_LEVELS) {
      const cases = sum(input.cases.filter((c) => c.locationId === l.locationId && c.level === level).map((c) => c.cases));
      if (cases === 0) continue;
      const minutes = cases * (avg.get(level) ?? 0);
      totalMinutes += minutes;
      rows.push({ locationId: l.locationId, locationName: l.locationName, level, cases, minutes: roundMinutes(minutes), weeksOfBacklog: capacity > 0 ? minutes / capacity : null });
    }
  }
  const all = [...adjusted.values()];
  const daily = Array.from({ length: horizonDays }, (_, i) => sum(all.map((a) => a.capacity[i]!)));
  const capacityPerWeek = perWeek(daily);
  const totalCases = sum(rows.map((r) => r.cases));
  const chairFree = perWeek(all.flatMap((a) => a.chairFree));
  const operatorFree = perWeek(all.flatMap((a) => a.operatorFree));
  const noOpenTime = !(capacityPerWeek > 0);
  return {
    freeChairMinutesPerWeek: roundMinutes(chairFree),
    openChairMinutesPerWeek: roundMinutes(perWeek(all.flatMap((a) => a.chairOpen))),
    freeOperatorMinutesPerWeek: roundMinutes(operatorFree),
    capacityMinutesPerWeek: roundMinutes(capacityPerWeek),
    averageMinutesByLevel: BACKLOG_LEVELS.map((level) => {
      const a = input.averages.find((x) => x.level === level);
      return { level, minutes: roundMinutes(a?.minutes ?? 0), basis: a?.basis ?? 'estimate_table' };
    }),
    rows,
    totals: { cases: totalCases, minutes: roundMinutes(totalMinutes), weeksOfBacklog: noOpenTime ? null : totalMinutes / capacityPerWeek },
    leadTimeWeeks: noOpenTime ? null : leadTimeWeeks(daily, totalMinutes),
    noOpenTime,
    limitedBy: operatorFree < chairFree ? 'operators' : chairFree < operatorFree ? 'chairs' : 'none',
    assumptions: { chairDayMinutes: roundMinutes(m.chairDayMinutes), operatorDayMinutes: roundMinutes(m.operatorDayMinutes), horizonWeeks: roundMinutes(weeks) },
  };
}

/** One level's minutes from the estimate table alone: the mean low-tier initial treatment of the three tooth groups × the tier, plus turnover. */
export function tableMinutesForLevel(table: Pick<EstimateTable, 'base' | 'tierMultiplier' | 'turnoverMinutes'>, level: Level): number {
  const groups = Object.values(table.base.initial);
  return (sum(groups) / groups.length) * table.tierMultiplier[level] + table.turnoverMinutes;
}

export interface LevelSample {
  level: Level | null;
  /** Cases seen and their summed minutes (visits + turnover). */
  cases: number;
  minutes: number;
}

/**
 * The minutes each level is priced at: the practice's own booked cases (visits + turnover) when it has at
 * least MIN_CASES_FOR_AVERAGE of them, else its cases' stored estimates, else the table alone. Untriaged
 * cases are priced at the average over all booked cases (or the mean of the three levels).
 */
export function levelAverages(fromVisits: readonly LevelSample[], fromEstimates: readonly LevelSample[], table: Pick<EstimateTable, 'base' | 'tierMultiplier' | 'turnoverMinutes'>): LevelAverage[] {
  const pick = (list: readonly LevelSample[], level: Level) => list.find((s) => s.level === level);
  const out: LevelAverage[] = LEVELS.map((level) => {
    const v = pick(fromVisits, level);
    if (v && v.cases >= MIN_CASES_FOR_AVERAGE) return { level, minutes: v.minutes / v.cases, basis: 'visits' };
    const e = pick(fromEstimates, level);
    if (e && e.cases > 0) return { level, minutes: e.minutes / e.cases, basis: 'estimate_table' };
    return { level, minutes: tableMinutesForLevel(table, level), basis: 'estimate_table' };
  });
  const pooled = fromVisits.reduce((a, s) => ({ cases: a.cases + s.cases, minutes: a.minutes + s.minutes }), { cases: 0, minutes: 0 });
  out.push(
    pooled.cases >= MIN_CASES_FOR_AVERAGE
      ? { level: 'untriaged', minutes: pooled.minutes / pooled.cases, basis: 'visits' }
      : { level: 'untriaged', minutes: sum(out.map((a) => a.minutes)) / out.length, basis: 'estimate_table' },
  );
  return out;
}
