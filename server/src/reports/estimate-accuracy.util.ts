// Estimate accuracy (REPORT_DEFINITIONS.estimateError, overrunDay). Before = the table's minutes; after =
// the calibrated prediction for the same visit learned from all the practice's other visits (leave one
// out, the estimator's own accuracyReport method), so no visit grades a model that has already seen it.
// Overrun days: a chair's day whose last done visit, with its turnover, ended after closing. Pure.
import { LEVELS, type CompletedVisit, type EstimateAccuracyReport, type Level } from '@ostium/shared';
import { predictLeavingOneOut, type CalibrationOptions } from '../estimates/estimator/index.js';
import type { ReportChair } from './chair-use.util.js';
import { clockFor, closedDays, daySpan, formatLocalDate, MINUTE_MS, monthOf, openOnDay, parseLocalDate, roundMinutes, type LocalDay, type ReportLocation } from './report-time.util.js';

export interface AccuracyVisit extends CompletedVisit {
  id: number;
  /** 'YYYY-MM-DD'. */
  visitDate: string;
  /** Where the visit took place, when it came from an appointment (imported visits have none). */
  locationId: number | null;
  chairId: number | null;
}

export interface VisitError {
  visit: AccuracyVisit;
  /** actual − table estimate, minutes. */
  before: number;
  /** actual − calibrated prediction without this visit, minutes. */
  after: number;
}

/**
 * Each visit's error before and after calibration. The leave-one-out prediction removes the visit from
 * its cell's shrunk mean and from its operator's: the estimator's own predictLeavingOneOut, as its accuracyReport uses.
 */
export function visitErrors(visits: readonly AccuracyVisit[], o: CalibrationOptions): VisitError[] {
  const predicted = predictLeavingOneOut(visits, o);
  return visits.map((v, i) => ({ visit: v, before: v.actualMinutes - v.estimatedMinutes, after: v.actualMinutes - predicted[i]! }));
}

const mae = (errs: readonly number[]) => (errs.length ? roundMinutes(errs.reduce((s, e) => s + Math.abs(e), 0) / errs.length) : null);

export interface DoneVisit {
  chairId: number;
  locationId: number;
  operatorId: number;
  start: number;
  turnoverMinutes: number;
  dismissedAt: number;
}

export interface AccuracyInput {
  from: string;
  to: string;
  options: CalibrationOptions;
  /** Every visit of the practice (the calibration learns from all of them). */
  visits: readonly AccuracyVisit[];
  /** Which of them the report is about (range, location, chair, operator). */
  include: (v: AccuracyVisit) => boolean;
  operators: readonly { id: number; name: string }[];
  locations: readonly ReportLocation[];
  chairs: readonly ReportChair[];
  /** Dismissed visits with seated and dismissed times, for overrun days. */
  done: readonly DoneVisit[];
}

export type AccuracyFigures = Omit<EstimateAccuracyReport, 'range'>;

/** A chair's day whose last done visit ended, with its turnover, after the location's closing time. */
export function overrunDays(input: Pick<AccuracyInput, 'from' | 'to' | 'locations' | 'chairs' | 'done'>): AccuracyFigures['overrunDays'] {
  const span = daySpan(input.from, input.to);
  const chairs = new Map(input.chairs.map((c) => [c.id, c]));
  const out: AccuracyFigures['overrunDays'] = [];
  for (const loc of input.locations) {
    const clock = clockFor(loc.timeZone, span);
    const closed = closedDays(loc);
    const last = new Map<string, { chairId: number; day: LocalDay; end: number }>();
    for (const v of input.done) {
      if (v.locationId !== loc.id) continue;
      const day = clock.day(v.start);
      if (day < span.first || day > span.last) continue;
      const end = v.dismissedAt + v.turnoverMinutes * MINUTE_MS;
      const k = `${v.chairId}|${day}`;
      const cur = last.get(k);
      if (!cur || end > cur.end) last.set(k, { chairId: v.chairId, day, end });
    }
    for (const { chairId, day, end } of last.values()) {
      const open = openOnDay(clock, loc, closed, day);
      // A day without opening hours has no closing time to run past.
      if (!open.length) continue;
      const closesAt = open[open.length - 1]!.end;
      if (end <= closesAt) continue;
      out.push({
        date: formatLocalDate(day),
        chairId,
        chairName: chairs.get(chairId)?.name ?? `Chair ${chairId}`,
        closesAt: new Date(closesAt).toISOString(),
        lastEndAt: new Date(end).toISOString(),
        overrunMinutes: roundMinutes((end - closesAt) / MINUTE_MS),
      });
    }
  }
  return out.sort((a, b) => a.date.localeCompare(b.date) || a.chairName.localeCompare(b.chairName));
}

export function estimateAccuracy(input: AccuracyInput): AccuracyFigures {
  const errors = visitErrors(input.visits, input.options).filter((e) => input.include(e.visit));
  const group = <K>(keyOf: (e: VisitError) => K) => {
    const m = new Map<K, VisitError[]>();
    for (const e of errors) {
      const k = keyOf(e);
      (m.get(k) ?? m.set(k, []).get(k)!).push(e);
    }
    return m;
  };
  const figures = (list: readonly VisitError[]) => ({ visits: list.length, beforeMae: mae(list.map((e) => e.before)), afterMae: mae(list.map((e) => e.after)) });
  const levels = group((e) => e.visit.level);
  const ops = group((e) => e.visit.operatorId ?? null);
  const months = group((e) => monthOf(parseLocalDate(e.visit.visitDate)));
  return {
    byLevel: LEVELS.map((level: Level) => ({ level, ...figures(levels.get(level) ?? []) })),
    byOperator: input.operators.filter((o) => ops.has(o.id)).map((o) => ({ operatorId: o.id, operatorName: o.name, ...figures(ops.get(o.id)!) })),
    totals: figures(errors),
    overrunDays: overrunDays(input),
    byMonth: [...months.keys()].sort().map((month) => ({ month, ...figures(months.get(month)!) })),
  };
}
