import { BadRequestException, Injectable } from '@nestjs/common';
import type { CaseOverride, EstimateResult, ProposedVisitSlot, TimeFinderApiRequest, TimeFinderApiResponse, TimeFinderPlanVisit } from '@ostium/shared';
import { QueryTypes } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import { DEFAULT_PRACTICE_SETTINGS } from '../practices/practices.service.js';
import { ReferralsService } from '../referrals/referrals.service.js';
import type {
  BusyIntervals,
  Chair,
  Hold,
  Interval,
  IsoWeekday,
  LocalRange,
  Location,
  Microscope,
  OpeningHours,
  Operator,
  SchedulingResources,
  TimeFinderRequest,
  WorkingRule,
} from './time-finder/time-finder.types.js';
import { DEFAULT_TURNOVER_MINUTES, findTimes } from './time-finder/time-finder.util.js';

const WEEK_MS = 7 * 86_400_000;
const DEFAULT_WEEKS = 12;
// Busy intervals are read from this long before the horizon so a chair's turnover reaching into it counts.
const TURNOVER_MARGIN_MS = 4 * 3_600_000;

type Json<T> = T | string;
const json = <T>(v: Json<T> | null): T | null => (v === null ? null : typeof v === 'string' ? (JSON.parse(v) as T) : v);
interface NativeConnection {
  query(options: { sql: string; rowsAsArray: true; typeCast: undefined }, params: unknown[]): Promise<unknown[][]>;
}
const ms = (d: Date | string) => (d instanceof Date ? d.getTime() : Date.parse(`${d.replace(' ', 'T')}Z`));

/** The finder's input for one practice: resources with string ids (the ids of our rows, as text). */
export interface FinderInput {
  resources: SchedulingResources;
  gridMinutes: number;
}

export interface SearchOptions {
  /** The moment of the search (default now); benchmarks replay a fixed moment. */
  now?: number;
  previousOperatorId?: number;
  turnoverMinutes?: number;
}

/** A plan with what booking needs to know about its case. */
export interface ResolvedPlan {
  visits: TimeFinderPlanVisit[];
  turnoverMinutes: number;
  urgent: boolean;
  previousOperatorId?: number;
}

/** The plan of a case: the stored estimate's visits, the endodontist's minutes when adjusted. */
export function planOfCase(estimate: EstimateResult | null, override: CaseOverride | null): { visits: TimeFinderPlanVisit[]; turnoverMinutes: number } | null {
  if (!estimate || !estimate.visits?.length) return null;
  const visits = estimate.visits.map((v, i) => ({
    minutes: override?.minutesPerVisit?.[i] ?? v.minutes,
    needsMicroscope: v.needsMicroscope,
    ...(i > 0 && v.earliestDaysAfterPrevious !== undefined ? { earliestDaysAfterPrevious: v.earliestDaysAfterPrevious } : {}),
    ...(i > 0 && v.latestDaysAfterPrevious !== undefined ? { latestDaysAfterPrevious: v.latestDaysAfterPrevious } : {}),
  }));
  return { visits, turnoverMinutes: estimate.visits[0]?.turnoverMinutes ?? DEFAULT_TURNOVER_MINUTES };
}

/**
 * POST /api/time-finder: reads every resource and every busy interval of the practice in a fixed number of
 * queries (run side by side), then runs the pure finder. The number of queries does not depend on the
 * horizon nor on the number of chairs, operators or microscopes.
 */
@Injectable()
export class TimeFinderService {
  constructor(
    private readonly sequelize: Sequelize,
    private readonly referrals: ReferralsService,
  ) {}

  private select<T extends object>(sql: string, replacements: Record<string, unknown>) {
    return this.sequelize.query<T>(sql, { replacements, type: QueryTypes.SELECT });
  }

  /** Locations (hours, closures in the horizon), chairs, microscopes, operators (rules, time off), holds: 7 queries. */
  async loadResources(practiceId: number, from: number, to: number): Promise<FinderInput> {
    const p = { practiceId, from: new Date(from), to: new Date(to) };
    const [practice, locations, closures, chairs, microscopes, operators, rules, timeOff, holds] = await Promise.all([
      this.select<{ settings: Json<{ bookingGridMinutes?: number }> }>('SELECT settings FROM practices WHERE id = :practiceId', p),
      this.select<{ id: number; time_zone: string; opening_hours: Json<{ weekday: number; open: string; close: string }[]> }>(
        'SELECT id, time_zone, opening_hours FROM locations WHERE practice_id = :practiceId',
        p,
      ),
      // Local dates: a day's margin on each side covers every zone offset.
      this.select<{ location_id: number; date: string; reason: string }>(
        'SELECT location_id, DATE_FORMAT(date, "%Y-%m-%d") AS date, reason FROM location_closures WHERE practice_id = :practiceId AND date BETWEEN DATE(:from) - INTERVAL 1 DAY AND DATE(:to) + INTERVAL 1 DAY',
        p,
      ),
      this.select<{ id: number; name: string; location_id: number; fixed_microscope_id: number | null }>(
        'SELECT id, name, location_id, fixed_microscope_id FROM chairs WHERE practice_id = :practiceId AND active = 1',
        p,
      ),
      this.select<{ id: number; name: string; location_id: number; mobile: number | boolean }>('SELECT id, name, location_id, mobile FROM microscopes WHERE practice_id = :practiceId AND active = 1', p),
      this.select<{ id: number; name: string }>("SELECT id, name FROM users WHERE practice_id = :practiceId AND role = 'endodontist' AND active = 1", p),
      this.select<{ operator_id: number; location_id: number; rrule: string; start_local: string; end_local: string; breaks: Json<{ start: string; end: string }[]> | null }>(
        'SELECT operator_id, location_id, rrule, start_local, end_local, breaks FROM working_rules WHERE practice_id = :practiceId',
        p,
      ),
      this.select<{ operator_id: number; start: Date; end: Date }>('SELECT operator_id, start, end FROM time_off WHERE practice_id = :practiceId AND start < :to AND end > :from', p),
      this.select<{ operator_id: number; location_id: number; rrule: string; start_local: string; end_local: string; opens_evening_before_at: string | null }>(
        'SELECT operator_id, location_id, rrule, start_local, end_local, opens_evening_before_at FROM holds WHERE practice_id = :practiceId',
        p,
      ),
    ]);
    const settings = { ...DEFAULT_PRACTICE_SETTINGS, ...(json(practice[0]?.settings ?? null) ?? {}) };
    const fixedChairOf = new Map<number, number>();
    for (const c of chairs) if (c.fixed_microscope_id !== null) fixedChairOf.set(c.fixed_microscope_id, c.id);
    const finderLocations: Location[] = locations.map((l) => {
      const hours: Partial<Record<IsoWeekday, LocalRange[]>> = {};
      for (const d of json(l.opening_hours) ?? []) (hours[d.weekday as IsoWeekday] ??= []).push({ startLocal: d.open, endLocal: d.close });
      return {
        id: String(l.id),
        timeZone: l.time_zone,
        openingHours: hours as OpeningHours,
        closures: closures.filter((c) => c.location_id === l.id).map((c) => ({ date: c.date, reason: c.reason })),
      };
    });
    const finderChairs: Chair[] = chairs.map((c) => ({
      id: String(c.id),
      name: c.name,
      locationId: String(c.location_id),
      ...(c.fixed_microscope_id !== null ? { fixedMicroscopeId: String(c.fixed_microscope_id) } : {}),
    }));
    const finderMicroscopes: Microscope[] = microscopes.map((m) => {
      const chairId = fixedChairOf.get(m.id);
      return { id: String(m.id), name: m.name, locationId: String(m.location_id), mobile: !!m.mobile, ...(chairId !== undefined ? { chairId: String(chairId) } : {}) };
    });
    const finderOperators: Operator[] = operators.map((o) => ({
      id: String(o.id),
      name: o.name,
      workingRules: rules
        .filter((r) => r.operator_id === o.id)
        .map(
          (r): WorkingRule => ({
            locationId: String(r.location_id),
            rrule: r.rrule,
            startLocal: r.start_local,
            endLocal: r.end_local,
            breaks: (json(r.breaks) ?? []).map((b) => ({ startLocal: b.start, endLocal: b.end })),
          }),
        ),
      timeOff: timeOff.filter((t) => t.operator_id === o.id).map((t): Interval => ({ start: ms(t.start), end: ms(t.end) })),
    }));
    const finderHolds: Hold[] = holds.map((h) => ({
      operatorId: String(h.operator_id),
      locationId: String(h.location_id),
      rrule: h.rrule,
      startLocal: h.start_local,
      endLocal: h.end_local,
      ...(h.opens_evening_before_at ? { opensEveningBeforeAt: h.opens_evening_before_at } : {}),
    }));
    return {
      resources: { locations: finderLocations, chairs: finderChairs, microscopes: finderMicroscopes, operators: finderOperators, holds: finderHolds },
      gridMinutes: settings.bookingGridMinutes,
    };
  }

  /**
   * Busy intervals of every chair (with turnover), operator and microscope in one query. The hot read goes
   * to a pooled connection of Sequelize's own driver as plain arrays: Sequelize's per-field type casting
   * and row copying cost more than the query itself on thousands of rows.
   */
  async loadBusy(practiceId: number, from: number, to: number): Promise<BusyIntervals> {
    const rows = await this.arrays(
      `SELECT chair_id, operator_id, microscope_id, TIMESTAMPDIFF(SECOND, '1970-01-01', start), TIMESTAMPDIFF(SECOND, '1970-01-01', end), turnover_minutes
         FROM appointments
        WHERE practice_id = ? AND start < ? AND end > ? AND state NOT IN ('cancelled', 'no_show')`,
      [practiceId, new Date(to), new Date(from - TURNOVER_MARGIN_MS)],
    );
    const chairs: Record<string, Interval[]> = {};
    const operators: Record<string, Interval[]> = {};
    const microscopes: Record<string, Interval[]> = {};
    for (const r of rows) {
      // Epoch seconds (TIMESTAMPDIFF ignores the session zone), so no DATETIME is turned into a Date.
      const start = Number(r[3]) * 1000;
      const end = Number(r[4]) * 1000;
      (chairs[String(r[0])] ??= []).push({ start, end: end + Number(r[5]) * 60_000 });
      (operators[String(r[1])] ??= []).push({ start, end });
      if (r[2] !== null) (microscopes[String(r[2])] ??= []).push({ start, end });
    }
    return { chairs, operators, microscopes };
  }

  private async arrays(sql: string, params: unknown[]): Promise<unknown[][]> {
    const manager = this.sequelize.connectionManager as unknown as {
      getConnection(o: { type: 'read' | 'write' }): Promise<NativeConnection>;
      releaseConnection(c: NativeConnection): Promise<void>;
    };
    const connection = await manager.getConnection({ type: 'read' });
    try {
      return await connection.query({ sql, rowsAsArray: true, typeCast: undefined }, params);
    } finally {
      await manager.releaseConnection(connection);
    }
  }

  /** The plan of the request: the case's (estimate / override, urgency, its endodontist) or the explicit one. */
  async resolvePlan(practiceId: number, dto: TimeFinderApiRequest): Promise<ResolvedPlan> {
    if (dto.caseId !== undefined) {
      const c = await this.referrals.getCase(practiceId, dto.caseId);
      const plan = planOfCase(c.estimate, c.override as CaseOverride | null);
      if (!plan) {
        throw new BadRequestException({
          message: 'The case has no chair-time estimate yet; open the case sheet first',
          errors: [{ field: 'caseId', message: 'no estimate' }],
        });
      }
      return { ...plan, urgent: dto.urgent ?? c.urgency === 'urgent', ...(c.operatorId ? { previousOperatorId: c.operatorId } : {}) };
    }
    if (!dto.plan) throw new BadRequestException({ message: 'Give a caseId or a plan', errors: [{ field: 'plan', message: 'caseId or plan required' }] });
    return { visits: dto.plan.visits, turnoverMinutes: DEFAULT_TURNOVER_MINUTES, urgent: dto.urgent ?? false };
  }

  async find(practiceId: number, dto: TimeFinderApiRequest, opts: SearchOptions = {}): Promise<TimeFinderApiResponse> {
    const plan = await this.resolvePlan(practiceId, dto);
    return this.search(practiceId, dto, { ...plan, ...opts, previousOperatorId: opts.previousOperatorId ?? plan.previousOperatorId, turnoverMinutes: opts.turnoverMinutes ?? plan.turnoverMinutes });
  }

  /** Reads resources and busy time side by side (8 + 1 queries), then searches. */
  async search(
    practiceId: number,
    dto: Omit<TimeFinderApiRequest, 'caseId' | 'plan'>,
    plan: ResolvedPlan & SearchOptions,
  ): Promise<TimeFinderApiResponse> {
    const now = plan.now ?? Date.now();
    const from = dto.from ? Date.parse(dto.from) : now;
    const to = dto.to ? Date.parse(dto.to) : from + DEFAULT_WEEKS * WEEK_MS;
    if (!(to > from)) throw new BadRequestException({ message: 'to must be after from', errors: [{ field: 'to', message: 'must be after from' }] });
    if (to - from > 53 * WEEK_MS) throw new BadRequestException({ message: 'The search horizon is at most a year', errors: [{ field: 'to', message: 'at most a year after from' }] });
    const [input, busy] = await Promise.all([this.loadResources(practiceId, from, to), this.loadBusy(practiceId, from, to)]);
    const request: TimeFinderRequest = {
      plan: { visits: plan.visits },
      from,
      to,
      now,
      turnoverMinutes: plan.turnoverMinutes,
      gridMinutes: input.gridMinutes,
      urgent: plan.urgent,
      ...(dto.locationId !== undefined ? { locationId: String(dto.locationId) } : {}),
      ...(dto.operatorId !== undefined ? { operatorId: String(dto.operatorId) } : {}),
      ...(plan.previousOperatorId !== undefined ? { previousOperatorId: String(plan.previousOperatorId) } : {}),
      ...(dto.preferences ? { preferences: { weekdays: dto.preferences.weekdays as IsoWeekday[] | undefined, partOfDay: dto.preferences.partOfDay } } : {}),
      ...(dto.limit !== undefined ? { limit: dto.limit } : {}),
    };
    const result = findTimes(input.resources, busy, request);
    const proposals = result.proposals.map((p) => ({
      visits: p.visits.map(
        (v): ProposedVisitSlot => ({
          start: new Date(v.start).toISOString(),
          end: new Date(v.end).toISOString(),
          chairId: Number(v.chairId),
          operatorId: Number(v.operatorId),
          ...(v.microscopeId !== undefined ? { microscopeId: Number(v.microscopeId) } : {}),
        }),
      ),
      gapMinutesLeft: p.gapMinutesLeft,
      reasons: p.reasons,
    }));
    return result.unplaceable ? { proposals, unplaceable: { reason: result.unplaceable.reason } } : { proposals };
  }
}
