// Chair use (REPORT_DEFINITIONS.chairUse / actualChairUse): booked chair minutes ÷ open chair minutes per
// chair, location, local day, ISO week and weekday × hour, and actual use over the days whose visits are
// done. Pure: the service reads the rows, this adds them up.
import type { AppointmentState, ChairUseReport, UseFigure } from '@ostium/shared';
import { RELEASED_STATES } from '../scheduling/appointment-state.util.js';
import { normalizeIntervals } from '../scheduling/time-finder/interval.util.js';
import type { Interval } from '../scheduling/time-finder/time-finder.types.js';
import { HEATMAP_FIRST_HOUR, HEATMAP_LAST_HOUR } from './report-constants.js';
import {
  clockFor,
  closedDays,
  daySpan,
  formatLocalDate,
  mondayOf,
  MINUTE_MS,
  openOnDay,
  overlapWith,
  ratio,
  roundMinutes,
  splitByLocalHour,
  weekdayOfDay,
  type LocalDay,
  type ReportLocation,
} from './report-time.util.js';


export interface ReportChair {
  id: number;
  name: string;
  locationId: number;
}

export interface ChairBooking {
  chairId: number;
  /** Epoch ms. */
  start: number;
  end: number;
  turnoverMinutes: number;
  state: AppointmentState;
  seatedAt: number | null;
  dismissedAt: number | null;
}

export interface ChairUseInput {
  from: string;
  to: string;
  /** The moment of the report: actual use counts local days before the location's today. */
  now: number;
  locations: readonly ReportLocation[];
  chairs: readonly ReportChair[];
  bookings: readonly ChairBooking[];
}

export type ChairUseFigures = Omit<ChairUseReport, 'range'>;

/** A visit is done when it was dismissed with both its seated and dismissed times recorded. */
export const isDone = (b: Pick<ChairBooking, 'state' | 'seatedAt' | 'dismissedAt'>) => b.state === 'dismissed' && b.seatedAt !== null && b.dismissedAt !== null;

class Acc {
  open = 0;
  booked = 0;
  actualOpen = 0;
  actual = 0;
  add(o: { open: number; booked: number; actualOpen: number; actual: number }) {
    this.open += o.open;
    this.booked += o.booked;
    this.actualOpen += o.actualOpen;
    this.actual += o.actual;
  }
  figure(): UseFigure {
    return {
      openMinutes: roundMinutes(this.open / MINUTE_MS),
      bookedMinutes: roundMinutes(this.booked / MINUTE_MS),
      share: ratio(this.booked, this.open),
      actualOpenMinutes: roundMinutes(this.actualOpen / MINUTE_MS),
      actualMinutes: roundMinutes(this.actual / MINUTE_MS),
      actualShare: ratio(this.actual, this.actualOpen),
    };
  }
}

const total = (list: readonly Interval[]) => list.reduce((s, iv) => s + iv.end - iv.start, 0);

function getAcc<K>(map: Map<K, Acc>, key: K): Acc {
  let a = map.get(key);
  if (!a) map.set(key, (a = new Acc()));
  return a;
}

/**
 * Per chair and local day: open = opening hours − closures; booked = ∪ [start, end + turnover) of the
 * visits still holding the chair, clipped to the open time (so turnover past closing and visits outside
 * hours are not use); actual = ∪ [seated, dismissed + turnover) clipped the same way, counted only on
 * days before today whose every visit is done.
 */
export function chairUse(input: ChairUseInput): ChairUseFigures {
  const span = daySpan(input.from, input.to);
  const locations = new Map(input.locations.map((l) => [l.id, l]));
  const byChairBookings = new Map<number, ChairBooking[]>();
  for (const b of input.bookings) {
    if (RELEASED_STATES.includes(b.state)) continue;
    (byChairBookings.get(b.chairId) ?? byChairBookings.set(b.chairId, []).get(b.chairId)!).push(b);
  }

  const chairAcc = new Map<number, Acc>();
  const locationAcc = new Map<number, Acc>();
  const dayAcc = new Map<LocalDay, Acc>();
  const weekAcc = new Map<LocalDay, Acc>();
  const heat = new Map<number, { open: number; booked: number }>();
  const heatCell = (weekday: number, hour: number) => {
    const k = weekday * 24 + hour;
    let c = heat.get(k);
    if (!c) heat.set(k, (c = { open: 0, booked: 0 }));
    return c;
  };
  for (let d = span.first; d <= span.last; d++) {
    getAcc(dayAcc, d);
    getAcc(weekAcc, mondayOf(d));
  }

  const clocks = new Map<number, { clock: ReturnType<typeof clockFor>; today: LocalDay; open: Interval[][] }>();
  for (const chair of input.chairs) {
    const loc = locations.get(chair.locationId);
    if (!loc) continue;
    let lc = clocks.get(loc.id);
    if (!lc) {
      const clock = clockFor(loc.timeZone, span);
      const closed = closedDays(loc);
      const open: Interval[][] = [];
      for (let day = span.first; day <= span.last; day++) open.push(openOnDay(clock, loc, closed, day));
      lc = { clock, today: clock.day(input.now), open };
      clocks.set(loc.id, lc);
    }
    const { clock, today } = lc;
    const bookings = (byChairBookings.get(chair.id) ?? []).sort((a, b) => a.start - b.start);
    const bookedUnion = normalizeIntervals(bookings.map((b) => ({ start: b.start, end: b.end + b.turnoverMinutes * MINUTE_MS })));
    // A chair-day is done when no visit starting that local day is still open.
    const notDone = new Set<LocalDay>();
    const actualPieces: Interval[] = [];
    for (const b of bookings) {
      if (isDone(b)) actualPieces.push({ start: b.seatedAt!, end: b.dismissedAt! + b.turnoverMinutes * MINUTE_MS });
      else notDone.add(clock.day(b.start));
    }
    const actualUnion = normalizeIntervals(actualPieces);
    const ca = getAcc(chairAcc, chair.id);
    const la = getAcc(locationAcc, loc.id);
    for (let day = span.first; day <= span.last; day++) {
      const open = lc.open[day - span.first]!;
      if (open.length === 0) continue;
      const booked = overlapWith(open, bookedUnion);
      const counted = day < today && !notDone.has(day);
      const actual = counted ? overlapWith(open, actualUnion) : [];
      const part = { open: total(open), booked: total(booked), actualOpen: counted ? total(open) : 0, actual: total(actual) };
      ca.add(part);
      la.add(part);
      getAcc(dayAcc, day).add(part);
      getAcc(weekAcc, mondayOf(day)).add(part);
      for (const iv of open) splitByLocalHour(clock, iv, (d, h, ms) => (heatCell(weekdayOfDay(d), h).open += ms));
      for (const iv of booked) splitByLocalHour(clock, iv, (d, h, ms) => (heatCell(weekdayOfDay(d), h).booked += ms));
    }
  }

  const totals = new Acc();
  for (const a of chairAcc.values()) totals.add(a);
  const chairList = input.chairs.filter((c) => locations.has(c.locationId));
  const usedLocations = input.locations.filter((l) => chairList.some((c) => c.locationId === l.id));
  const heatmap = [...heat.entries()]
    .map(([k, c]) => ({ weekday: Math.floor(k / 24), hour: k % 24, openMinutes: roundMinutes(c.open / MINUTE_MS), bookedMinutes: roundMinutes(c.booked / MINUTE_MS), share: ratio(c.booked, c.open) }))
    .filter((c) => c.openMinutes > 0 && c.hour >= HEATMAP_FIRST_HOUR && c.hour <= HEATMAP_LAST_HOUR)
    .sort((a, b) => a.weekday - b.weekday || a.hour - b.hour);
  return {
    totals: totals.figure(),
    byChair: chairList.map((c) => {
      const loc = locations.get(c.locationId)!;
      return { chairId: c.id, chairName: c.name, locationId: loc.id, locationName: loc.name, ...getAcc(chairAcc, c.id).figure() };
    }),
    byLocation: usedLocations.map((l) => ({ locationId: l.id, locationName: l.name, ...getAcc(locationAcc, l.id).figure() })),
    byDay: [...dayAcc.entries()].sort((a, b) => a[0] - b[0]).map(([d, a]) => ({ date: formatLocalDate(d), ...a.figure() })),
    byWeek: [...weekAcc.entries()].sort((a, b) => a[0] - b[0]).map(([d, a]) => ({ weekStart: formatLocalDate(d), ...a.figure() })),
    heatmap,
  };
}

/** The last open instant of a location's day (its closing time), or null when it is not open. */
export function closingOf(open: readonly Interval[]): number | null {
  return open.length ? open[open.length - 1]!.end : null;
}
