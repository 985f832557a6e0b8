// Operator use (REPORT_DEFINITIONS.operatorUse): booked clinical minutes (visit lengths, no turnover) ÷
// working minutes (working rules minus breaks, time off and the location's closures), per endodontist
// and per ISO week. Pure.
import type { AppointmentState, OperatorUseReport } from '@ostium/shared';
import { normalizeIntervals } from '../scheduling/time-finder/interval.util.js';
import type { Interval } from '../scheduling/time-finder/time-finder.types.js';
import { RELEASED_STATES } from '../scheduling/appointment-state.util.js';
import {
  clockFor,
  closedDays,
  daySpan,
  formatLocalDate,
  mondayOf,
  MINUTE_MS,
  overlapWith,
  ratio,
  roundMinutes,
  workingByDay,
  type DaySpan,
  type LocalDay,
  type ReportLocation,
  type ReportWorkingRule,
  type ZoneClock,
} from './report-time.util.js';

export interface ReportOperator {
  id: number;
  name: string;
  rules: readonly ReportWorkingRule[];
  /** Time off as instants (epoch ms). */
  timeOff: readonly Interval[];
}

export interface OperatorBooking {
  operatorId: number;
  locationId: number;
  start: number;
  end: number;
  state: AppointmentState;
}

export interface OperatorUseInput {
  from: string;
  to: string;
  locations: readonly ReportLocation[];
  operators: readonly ReportOperator[];
  bookings: readonly OperatorBooking[];
  /** Only working rules and visits at this location. */
  locationId?: number;
}

export type OperatorUseFigures = Omit<OperatorUseReport, 'range'>;

const total = (list: readonly Interval[]) => list.reduce((s, iv) => s + iv.end - iv.start, 0);

export function locationClocks(locations: readonly ReportLocation[], span: DaySpan): Map<number, { clock: ZoneClock; closed: Set<LocalDay> }> {
  return new Map(locations.map((l) => [l.id, { clock: clockFor(l.timeZone, span), closed: closedDays(l) }]));
}

export interface OperatorDay {
  working: number;
  clinical: number;
}

/**
 * Per operator, location and local day: working ms and clinical ms, where a visit counts as clinical time
 * inside the operator's working time at the visit's own location.
 */
export function operatorDays(input: OperatorUseInput, span: DaySpan = daySpan(input.from, input.to)): Map<number, Map<number, Map<LocalDay, OperatorDay>>> {
  const clocks = locationClocks(input.locations, span);
  const byKey = new Map<string, OperatorBooking[]>();
  for (const b of input.bookings) {
    if (RELEASED_STATES.includes(b.state)) continue;
    const k = `${b.operatorId}|${b.locationId}`;
    (byKey.get(k) ?? byKey.set(k, []).get(k)!).push(b);
  }
  const out = new Map<number, Map<number, Map<LocalDay, OperatorDay>>>();
  for (const op of input.operators) {
    const perLocation = new Map<number, Map<LocalDay, OperatorDay>>();
    const locationIds = [...new Set(op.rules.map((r) => r.locationId))].filter((id) => clocks.has(id) && (input.locationId === undefined || id === input.locationId));
    for (const locationId of locationIds) {
      const work = workingByDay(op.rules.filter((r) => r.locationId === locationId), clocks, op.timeOff, span);
      const booked = normalizeIntervals((byKey.get(`${op.id}|${locationId}`) ?? []).map((b) => ({ start: b.start, end: b.end })));
      const days = new Map<LocalDay, OperatorDay>();
      for (const [day, pieces] of work) days.set(day, { working: total(pieces), clinical: total(overlapWith(pieces, booked)) });
      perLocation.set(locationId, days);
    }
    out.set(op.id, perLocation);
  }
  return out;
}

export function operatorUse(input: OperatorUseInput): OperatorUseFigures {
  const span = daySpan(input.from, input.to);
  const days = operatorDays(input, span);
  let working = 0;
  let clinical = 0;
  const byOperator: OperatorUseFigures['byOperator'] = [];
  const byWeek: OperatorUseFigures['byWeek'] = [];
  for (const op of input.operators) {
    let w = 0;
    let c = 0;
    const weeks = new Map<LocalDay, { w: number; c: number }>();
    for (const [day, v] of [...days.get(op.id)!.values()].flatMap((m) => [...m])) {
      w += v.working;
      c += v.clinical;
      const wk = weeks.get(mondayOf(day)) ?? weeks.set(mondayOf(day), { w: 0, c: 0 }).get(mondayOf(day))!;
      wk.w += v.working;
      wk.c += v.clinical;
    }
    working += w;
    clinical += c;
    byOperator.push({ operatorId: op.id, operatorName: op.name, workingMinutes: roundMinutes(w / MINUTE_MS), clinicalMinutes: roundMinutes(c / MINUTE_MS), share: ratio(c, w) });
    // Every ISO week of the range, so each operator's row has the same weeks (0 when not working).
    for (let m = mondayOf(span.first); m <= span.last; m += 7) {
      const wk = weeks.get(m) ?? { w: 0, c: 0 };
      byWeek.push({ weekStart: formatLocalDate(m), operatorId: op.id, operatorName: op.name, workingMinutes: roundMinutes(wk.w / MINUTE_MS), clinicalMinutes: roundMinutes(wk.c / MINUTE_MS), share: ratio(wk.c, wk.w) });
    }
  }
  return {
    totals: { workingMinutes: roundMinutes(working / MINUTE_MS), clinicalMinutes: roundMinutes(clinical / MINUTE_MS), share: ratio(clinical, working) },
    byOperator,
    byWeek,
  };
}
