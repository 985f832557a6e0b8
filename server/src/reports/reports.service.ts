import { BadRequestException, Injectable } from '@nestjs/common';
import type {
  AttendanceReport,
  BacklogReport,
  BacklogWhatIfResponse,
  ChairUseReport,
  EstimateAccuracyReport,
  Level,
  OpeningHours,
  OperatorUseReport,
  PracticeSettings,
  ReferralsReport,
  ReportRange,
  ReportSettings,
} from '@ostium/shared';
import { DEFAULT_LATE_CANCEL_NOTICE_HOURS } from '@ostium/shared';
import { DateTime } from 'luxon';
import { QueryTypes } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import { calibrationOptions } from '../estimates/estimator/index.js';
import { EstimatesService } from '../estimates/estimates.service.js';
import { PracticesService } from '../practices/practices.service.js';
import { attendance, type AttendanceVisit } from './attendance.util.js';
import { backlogForecast, levelAverages, type BacklogCases, type BacklogFigures, type BacklogLevel, type LevelSample, type LocationCapacity, type WhatIf } from './backlog.util.js';
import { chairUse, type ChairBooking, type ReportChair } from './chair-use.util.js';
import type { BacklogQueryDto, BacklogWhatIfDto, ReportQueryDto } from './dto/report-query.dto.js';
import { estimateAccuracy, type AccuracyVisit, type DoneVisit } from './estimate-accuracy.util.js';
import { operatorDays, operatorUse, type OperatorBooking, type ReportOperator } from './operator-use.util.js';
import { referralsReport, WAITING_STATUSES, type ReportReferral } from './referrals-report.util.js';
import { BACKLOG_AVERAGE_DAYS, BACKLOG_HORIZON_WEEKS, MAX_RANGE_DAYS } from './report-constants.js';
import { DAY_MS, formatLocalDate, parseLocalDate, zoneClockToday, type ReportLocation, type ReportWorkingRule } from './report-time.util.js';

type Json<T> = T | string;
const json = <T>(v: Json<T> | null): T | null => (v === null ? null : typeof v === 'string' ? (JSON.parse(v) as T) : v);
/** Epoch seconds from SQL (TIMESTAMPDIFF from 1970, independent of the session zone) → epoch ms. */
const ms = (v: unknown): number | null => (v === null || v === undefined ? null : Number(v) * 1000);
const EPOCH = (col: string) => `TIMESTAMPDIFF(SECOND, '1970-01-01', ${col})`;

interface NativeConnection {
  query(options: { sql: string; namedPlaceholders: true }, values: Record<string, unknown>): Promise<unknown>;
}

const bad = (field: string, message: string) => new BadRequestException({ message, errors: [{ field, message }] });

interface Context {
  span: { from: string; to: string };
  /** Instants that surely hold every local day of the range in any zone (a day's margin each side). */
  lo: Date;
  hi: Date;
  locations: ReportLocation[];
  chairs: ReportChair[];
}

/**
 * The manager's reports. Each report reads what it needs in a fixed, small number of queries (run side by
 * side; none per chair, operator or day), then the pure *.util.ts modules compute the figures by the
 * definitions in REPORT_DEFINITIONS.
 */
@Injectable()
export class ReportsService {
  constructor(
    private readonly sequelize: Sequelize,
    private readonly practices: PracticesService,
    private readonly estimates: EstimatesService,
  ) {}

  /** Called with the SQL of every read that bypasses Sequelize (the benchmark prints it beside Sequelize's log). */
  traceSql: ((sql: string) => void) | null = null;

  private select<T extends object>(sql: string, replacements: Record<string, unknown>): Promise<T[]> {
    return this.sequelize.query<T>(sql, { replacements, type: QueryTypes.SELECT });
  }

  /**
   * The large reads (a year of visits is tens of thousands of rows) go to a pooled connection of
   * Sequelize's own driver, as TimeFinderService.loadBusy does: Sequelize's per-row copying costs more
   * than the query itself. Same named placeholders; values are plain (numbers, strings, Dates in UTC).
   */
  private async rows<T extends object>(sql: string, replacements: Record<string, unknown>): Promise<T[]> {
    this.traceSql?.(sql.replace(/\s+/g, ' ').trim());
    const manager = this.sequelize.connectionManager as unknown as {
      getConnection(o: { type: 'read' | 'write' }): Promise<NativeConnection>;
      releaseConnection(c: NativeConnection): Promise<void>;
    };
    const connection = await manager.getConnection({ type: 'read' });
    try {
      const values = Object.fromEntries(Object.entries(replacements).filter(([, v]) => v !== undefined));
      return (await connection.query({ sql, namedPlaceholders: true }, values)) as T[];
    } finally {
      await manager.releaseConnection(connection);
    }
  }

  // ---------- shared reads ----------

  static checkRange(from: string, to: string): void {
    if (from > to) throw bad('from', `from (${from}) is after to (${to})`);
    const days = parseLocalDate(to) - parseLocalDate(from) + 1;
    if (days > MAX_RANGE_DAYS) throw bad('to', `the range is ${days} days; at most ${MAX_RANGE_DAYS}`);
  }

  private static range(q: { from: string; to: string; locationId?: number; chairId?: number; operatorId?: number }): ReportRange {
    return { from: q.from, to: q.to, locationId: q.locationId ?? null, chairId: q.chairId ?? null, operatorId: q.operatorId ?? null };
  }

  /** Locations (hours, closures in the range) and active chairs: 3 queries. Unknown ids are the caller's 400. */
  private async context(practiceId: number, q: { from: string; to: string; locationId?: number; chairId?: number }): Promise<Context> {
    const lo = new Date(parseLocalDate(q.from) * DAY_MS - DAY_MS);
    const hi = new Date(parseLocalDate(q.to) * DAY_MS + 2 * DAY_MS);
    const p = { practiceId, from: q.from, to: q.to };
    const [locations, closures, chairs] = await Promise.all([
      this.select<{ id: number; name: string; time_zone: string; opening_hours: Json<OpeningHours> }>('SELECT id, name, time_zone, opening_hours FROM locations WHERE practice_id = :practiceId ORDER BY name', p),
      this.select<{ location_id: number; date: string }>(
        "SELECT location_id, DATE_FORMAT(date, '%Y-%m-%d') AS date FROM location_closures WHERE practice_id = :practiceId AND date BETWEEN :from AND :to",
        p,
      ),
      this.select<{ id: number; name: string; location_id: number }>('SELECT id, name, location_id FROM chairs WHERE practice_id = :practiceId AND active = 1 ORDER BY location_id, name', p),
    ]);
    if (q.locationId !== undefined && !locations.some((l) => l.id === q.locationId)) throw bad('locationId', `locationId: no location ${q.locationId} in this practice`);
    if (q.chairId !== undefined) {
      const chair = chairs.find((c) => c.id === q.chairId);
      if (!chair) throw bad('chairId', `chairId: no active chair ${q.chairId} in this practice`);
      if (q.locationId !== undefined && chair.location_id !== q.locationId) throw bad('chairId', `chairId: chair ${q.chairId} is not at location ${q.locationId}`);
    }
    const locs: ReportLocation[] = locations
      .filter((l) => q.locationId === undefined || l.id === q.locationId)
      .map((l) => ({
        id: l.id,
        name: l.name,
        timeZone: l.time_zone,
        openingHours: json(l.opening_hours) ?? [],
        closures: closures.filter((c) => c.location_id === l.id).map((c) => c.date),
      }));
    const chairList = chairs
      .filter((c) => locs.some((l) => l.id === c.location_id) && (q.chairId === undefined || c.id === q.chairId))
      .map((c) => ({ id: c.id, name: c.name, locationId: c.location_id }));
    return { span: { from: q.from, to: q.to }, lo, hi, locations: locs, chairs: chairList };
  }

  private async checkOperator(practiceId: number, operatorId: number | undefined): Promise<void> {
    if (operatorId === undefined) return;
    const [row] = await this.select<{ id: number }>("SELECT id FROM users WHERE practice_id = :practiceId AND id = :operatorId AND role = 'endodontist'", { practiceId, operatorId });
    if (!row) throw bad('operatorId', `operatorId: no endodontist ${operatorId} in this practice`);
  }

  private filters(q: { locationId?: number; chairId?: number; operatorId?: number }, alias = '') {
    const a = alias ? `${alias}.` : '';
    return [
      q.locationId !== undefined ? ` AND ${a}location_id = :locationId` : '',
      q.chairId !== undefined ? ` AND ${a}chair_id = :chairId` : '',
      q.operatorId !== undefined ? ` AND ${a}operator_id = :operatorId` : '',
    ].join('');
  }

  /** Visits still holding their chair that start in [lo, hi): 1 query. */
  private async holdingBookings(practiceId: number, lo: Date, hi: Date, q: { locationId?: number; chairId?: number; operatorId?: number }): Promise<(ChairBooking & OperatorBooking)[]> {
    const rows = await this.rows<{ chair_id: number; operator_id: number; location_id: number; s: unknown; e: unknown; t: number; state: ChairBooking['state']; seated: unknown; dismissed: unknown }>(
      `SELECT chair_id, operator_id, location_id, ${EPOCH('start')} AS s, ${EPOCH('end')} AS e, turnover_minutes AS t, state, ${EPOCH('seated_at')} AS seated, ${EPOCH('dismissed_at')} AS dismissed
         FROM appointments
        WHERE practice_id = :practiceId AND start >= :lo AND start < :hi AND state NOT IN ('cancelled', 'no_show')${this.filters(q)}`,
      { practiceId, lo, hi, ...q },
    );
    return rows.map((r) => ({
      chairId: r.chair_id,
      operatorId: r.operator_id,
      locationId: r.location_id,
      start: ms(r.s)!,
      end: ms(r.e)!,
      turnoverMinutes: Number(r.t),
      state: r.state,
      seatedAt: ms(r.seated),
      dismissedAt: ms(r.dismissed),
    }));
  }

  /** Endodontists with their working rules and time off in [lo, hi): 3 queries. */
  private async operators(practiceId: number, lo: Date, hi: Date, operatorId?: number): Promise<(ReportOperator & { active: boolean })[]> {
    const p = { practiceId, lo, hi, operatorId };
    const only = operatorId !== undefined ? ' AND operator_id = :operatorId' : '';
    const [users, rules, timeOff] = await Promise.all([
      this.select<{ id: number; name: string; active: number | boolean }>(
        `SELECT id, name, active FROM users WHERE practice_id = :practiceId AND role = 'endodontist'${operatorId !== undefined ? ' AND id = :operatorId' : ''} ORDER BY name`,
        p,
      ),
      this.select<{ operator_id: number; location_id: number; rrule: string; start_local: string; end_local: string; breaks: Json<{ start: string; end: string }[]> | null }>(
        `SELECT operator_id, location_id, rrule, start_local, end_local, breaks FROM working_rules WHERE practice_id = :practiceId${only}`,
        p,
      ),
      this.select<{ operator_id: number; s: unknown; e: unknown }>(`SELECT operator_id, ${EPOCH('start')} AS s, ${EPOCH('end')} AS e FROM time_off WHERE practice_id = :practiceId AND start < :hi AND end > :lo${only}`, p),
    ]);
    return users.map((u) => ({
      id: u.id,
      name: u.name,
      active: !!u.active,
      rules: rules
        .filter((r) => r.operator_id === u.id)
        .map((r): ReportWorkingRule => ({
          locationId: r.location_id,
          rrule: r.rrule,
          startLocal: r.start_local,
          endLocal: r.end_local,
          breaks: (json(r.breaks) ?? []).map((b) => ({ startLocal: b.start, endLocal: b.end })),
        })),
      timeOff: timeOff.filter((t) => t.operator_id === u.id).map((t) => ({ start: ms(t.s)!, end: ms(t.e)! })),
    }));
  }

  private async lateNotice(practiceId: number): Promise<number> {
    const [row] = await this.select<{ settings: Json<Partial<PracticeSettings>> }>('SELECT settings FROM practices WHERE id = :practiceId', { practiceId });
    const hours = json(row?.settings ?? null)?.lateCancellationHours;
    return typeof hours === 'number' ? hours : DEFAULT_LATE_CANCEL_NOTICE_HOURS;
  }

  // ---------- reports ----------

  /** Chair use: 4 queries (locations, closures, chairs, appointments). */
  async chairUse(practiceId: number, q: ReportQueryDto, now = Date.now()): Promise<ChairUseReport> {
    ReportsService.checkRange(q.from, q.to);
    const [ctx] = await Promise.all([this.context(practiceId, q), this.checkOperator(practiceId, q.operatorId)]);
    const bookings = await this.holdingBookings(practiceId, ctx.lo, ctx.hi, q);
    return { range: ReportsService.range(q), ...chairUse({ from: q.from, to: q.to, now, locations: ctx.locations, chairs: ctx.chairs, bookings }) };
  }

  /** Operator use: 7 queries (locations, closures, chairs, endodontists, working rules, time off, appointments). */
  async operatorUse(practiceId: number, q: ReportQueryDto): Promise<OperatorUseReport> {
    ReportsService.checkRange(q.from, q.to);
    const ctx = await this.context(practiceId, q);
    const [ops, bookings] = await Promise.all([this.operators(practiceId, ctx.lo, ctx.hi, q.operatorId), this.holdingBookings(practiceId, ctx.lo, ctx.hi, { locationId: q.locationId, operatorId: q.operatorId })]);
    if (q.operatorId !== undefined && ops.length === 0) throw bad('operatorId', `operatorId: no endodontist ${q.operatorId} in this practice`);
    const figures = operatorUse({ from: q.from, to: q.to, locations: ctx.locations, operators: ops, bookings, locationId: q.locationId });
    // Former endodontists appear only where they worked or were booked in the range.
    const shown = new Set(ops.filter((o) => o.active || figures.byOperator.some((b) => b.operatorId === o.id && (b.workingMinutes > 0 || b.clinicalMinutes > 0))).map((o) => o.id));
    return {
      range: ReportsService.range(q),
      totals: figures.totals,
      byOperator: figures.byOperator.filter((o) => shown.has(o.operatorId)),
      byWeek: figures.byWeek.filter((o) => shown.has(o.operatorId)),
    };
  }

  /** Attendance: 4 queries (settings, locations, appointments, reminders before confirmation). */
  async attendance(practiceId: number, q: ReportQueryDto): Promise<AttendanceReport> {
    ReportsService.checkRange(q.from, q.to);
    const lo = new Date(parseLocalDate(q.from) * DAY_MS - DAY_MS);
    const hi = new Date(parseLocalDate(q.to) * DAY_MS + 2 * DAY_MS);
    const p = { practiceId, lo, hi, ...q };
    const [notice, ctx, rows, reminders] = await Promise.all([
      this.lateNotice(practiceId),
      this.context(practiceId, q),
      this.rows<{ id: number; location_id: number; chair_id: number; s: unknown; e: unknown; t: number; state: AttendanceVisit['state']; created: unknown; cancelled: unknown; notice: string | number | null; confirmed: unknown; via: string | null }>(
        `SELECT id, location_id, chair_id, ${EPOCH('start')} AS s, ${EPOCH('end')} AS e, turnover_minutes AS t, state, ${EPOCH('created_at')} AS created,
                ${EPOCH('cancelled_at')} AS cancelled, cancel_notice_hours AS notice, ${EPOCH('confirmed_at')} AS confirmed, confirmed_via AS via
           FROM appointments
          WHERE practice_id = :practiceId AND start >= :lo AND start < :hi${this.filters(q)}`,
        p,
      ),
      this.rows<{ appointment_id: number; n: unknown }>(
        `SELECT o.appointment_id, COUNT(*) AS n
           FROM appointments a JOIN outbox_messages o ON o.appointment_id = a.id
          WHERE a.practice_id = :practiceId AND a.start >= :lo AND a.start < :hi AND a.confirmed_at IS NOT NULL${this.filters(q, 'a')}
            AND o.purpose = 'reminder' AND o.status IN ('sent', 'delivered') AND o.sent_at <= a.confirmed_at
          GROUP BY o.appointment_id`,
        p,
      ),
      this.checkOperator(practiceId, q.operatorId),
    ]);
    const counts = new Map(reminders.map((r) => [r.appointment_id, Number(r.n)]));
    const visits: AttendanceVisit[] = rows.map((r) => ({
      id: r.id,
      locationId: r.location_id,
      chairId: r.chair_id,
      start: ms(r.s)!,
      end: ms(r.e)!,
      turnoverMinutes: Number(r.t),
      state: r.state,
      createdAt: ms(r.created)!,
      cancelledAt: ms(r.cancelled),
      cancelNoticeHours: r.notice === null ? null : Number(r.notice),
      confirmedAt: ms(r.confirmed),
      confirmedVia: r.via,
      remindersBeforeConfirmation: counts.get(r.id) ?? 0,
    }));
    const zones = new Map(ctx.locations.map((l) => [l.id, l.timeZone]));
    return { range: ReportsService.range(q), ...attendance({ from: q.from, to: q.to, lateCancelNoticeHours: notice, zones, visits }) };
  }

  /** Referrals: 6 queries (locations, closures, chairs, referrals with their first visit, their cases, the waiting list). */
  async referrals(practiceId: number, q: ReportQueryDto, now = Date.now()): Promise<ReferralsReport> {
    ReportsService.checkRange(q.from, q.to);
    const p = { practiceId, from: q.from, to: q.to, locationId: q.locationId };
    const loc = q.locationId !== undefined ? ' AND r.location_id = :locationId' : '';
    const [ctx, referrals, cases, waiting] = await Promise.all([
      this.context(practiceId, { from: q.from, to: q.to, locationId: q.locationId }),
      this.rows<{ id: number; location_id: number; received_on: string; referring_dentist_id: number | null; dentist_name: string | null; first_visit: unknown }>(
        `SELECT r.id, r.location_id, DATE_FORMAT(r.received_on, '%Y-%m-%d') AS received_on, r.referring_dentist_id, d.name AS dentist_name,
                (SELECT ${EPOCH('MIN(a.start)')} FROM appointments a WHERE a.referral_id = r.id AND a.state NOT IN ('cancelled', 'no_show')) AS first_visit
           FROM referrals r LEFT JOIN referring_dentists d ON d.id = r.referring_dentist_id
          WHERE r.practice_id = :practiceId AND r.received_on BETWEEN :from AND :to${loc}`,
        p,
      ),
      this.rows<{ referral_id: number; level: Level | null }>(
        `SELECT c.referral_id, c.level FROM cases c JOIN referrals r ON r.id = c.referral_id
          WHERE r.practice_id = :practiceId AND r.received_on BETWEEN :from AND :to${loc}`,
        p,
      ),
      this.select<{ location_id: number; received_on: string; status: string }>(
        `SELECT r.location_id, DATE_FORMAT(r.received_on, '%Y-%m-%d') AS received_on, r.status FROM referrals r
          WHERE r.practice_id = :practiceId AND r.status IN (:waiting)${loc}`,
        { ...p, waiting: [...WAITING_STATUSES] },
      ),
    ]);
    const levels = new Map<number, (Level | null)[]>();
    for (const c of cases) (levels.get(c.referral_id) ?? levels.set(c.referral_id, []).get(c.referral_id)!).push(c.level);
    const list: ReportReferral[] = referrals.map((r) => ({
      id: r.id,
      locationId: r.location_id,
      receivedOn: r.received_on,
      referringDentistId: r.referring_dentist_id,
      dentistName: r.dentist_name ?? 'No referring dentist',
      firstVisitStart: ms(r.first_visit),
      caseLevels: levels.get(r.id) ?? [],
    }));
    const zones = new Map(ctx.locations.map((l) => [l.id, l.timeZone]));
    const figures = referralsReport({
      from: q.from,
      to: q.to,
      now,
      zones,
      referrals: list,
      waiting: waiting.map((w) => ({ locationId: w.location_id, receivedOn: w.received_on, status: w.status })),
    });
    return { range: ReportsService.range({ from: q.from, to: q.to, locationId: q.locationId }), ...figures };
  }

  /** Estimate accuracy: 7 queries side by side (estimate table, visit history, operators, locations, closures, chairs, done visits). */
  async estimateAccuracy(practiceId: number, q: ReportQueryDto): Promise<EstimateAccuracyReport> {
    ReportsService.checkRange(q.from, q.to);
    const lo = new Date(parseLocalDate(q.from) * DAY_MS - DAY_MS);
    const hi = new Date(parseLocalDate(q.to) * DAY_MS + 2 * DAY_MS);
    const [table, ctx, history, operators, doneRows] = await Promise.all([
      this.estimates.currentTable(practiceId),
      this.context(practiceId, q),
      this.rows<{ id: number; visit_date: string; procedure: AccuracyVisit['procedure']; tooth_group: AccuracyVisit['toothGroup']; level: Level; operator_id: number | null; estimated_minutes: number; actual_minutes: number; location_id: number | null; chair_id: number | null }>(
        `SELECT v.id, DATE_FORMAT(v.visit_date, '%Y-%m-%d') AS visit_date, v.\`procedure\`, v.tooth_group, v.level, v.operator_id, v.estimated_minutes, v.actual_minutes, a.location_id, a.chair_id
           FROM visit_history v LEFT JOIN appointments a ON a.id = v.appointment_id
          WHERE v.practice_id = :practiceId`,
        { practiceId },
      ),
      this.select<{ id: number; name: string }>("SELECT id, name FROM users WHERE practice_id = :practiceId AND role = 'endodontist' ORDER BY name", { practiceId }),
      this.rows<{ chair_id: number; location_id: number; operator_id: number; s: unknown; t: number; dismissed: unknown }>(
        `SELECT chair_id, location_id, operator_id, ${EPOCH('start')} AS s, turnover_minutes AS t, ${EPOCH('dismissed_at')} AS dismissed
           FROM appointments
          WHERE practice_id = :practiceId AND start >= :lo AND start < :hi AND state = 'dismissed' AND seated_at IS NOT NULL AND dismissed_at IS NOT NULL${this.filters(q)}`,
        { practiceId, lo, hi, ...q },
      ),
    ]);
    if (q.operatorId !== undefined && !operators.some((o) => o.id === q.operatorId)) throw bad('operatorId', `operatorId: no endodontist ${q.operatorId} in this practice`);
    const visits: AccuracyVisit[] = history.map((v) => ({
      id: v.id,
      visitDate: v.visit_date,
      procedure: v.procedure,
      toothGroup: v.tooth_group,
      level: v.level,
      operatorId: v.operator_id ?? undefined,
      estimatedMinutes: Number(v.estimated_minutes),
      actualMinutes: Number(v.actual_minutes),
      locationId: v.location_id,
      chairId: v.chair_id,
    }));
    const include = (v: AccuracyVisit) =>
      v.visitDate >= q.from &&
      v.visitDate <= q.to &&
      (q.operatorId === undefined || v.operatorId === q.operatorId) &&
      (q.locationId === undefined || v.locationId === q.locationId) &&
      (q.chairId === undefined || v.chairId === q.chairId);
    const done: DoneVisit[] = doneRows.map((r) => ({ chairId: r.chair_id, locationId: r.location_id, operatorId: r.operator_id, start: ms(r.s)!, turnoverMinutes: Number(r.t), dismissedAt: ms(r.dismissed)! }));
    const figures = estimateAccuracy({ from: q.from, to: q.to, options: calibrationOptions(table), visits, include, operators, locations: ctx.locations, chairs: ctx.chairs, done });
    return { range: ReportsService.range(q), ...figures };
  }

  // ---------- backlog ----------

  /** The horizon (from tomorrow, BACKLOG_HORIZON_WEEKS weeks) and the past days the level averages come from. */
  private static backlogDays(q: { from?: string; to?: string }, zone: string, now: number) {
    const today = zoneClockToday(zone, now);
    const horizon = { from: formatLocalDate(today + 1), to: formatLocalDate(today + BACKLOG_HORIZON_WEEKS * 7), weeks: BACKLOG_HORIZON_WEEKS };
    const from = q.from ?? formatLocalDate(today - BACKLOG_AVERAGE_DAYS);
    const to = q.to ?? formatLocalDate(today - 1);
    return { horizon, averages: { from, to } };
  }

  /**
   * Everything the forecast needs in 11 queries: locations, closures and chairs over the horizon; the
   * endodontists, rules and time off; the visits already booked in it; the cases waiting; the level
   * averages from booked cases and from stored estimates; the estimate table.
   */
  private async backlogInput(practiceId: number, q: { from?: string; to?: string; locationId?: number }, now: number) {
    const [firstLocation] = await this.select<{ time_zone: string }>('SELECT time_zone FROM locations WHERE practice_id = :practiceId ORDER BY id LIMIT 1', { practiceId });
    const days = ReportsService.backlogDays(q, firstLocation?.time_zone ?? 'UTC', now);
    if (q.from !== undefined || q.to !== undefined) ReportsService.checkRange(days.averages.from, days.averages.to);
    // The averaging days in the practice's (first location's) zone, exactly: a rough margin would let
    // visits of the neighbouring days into the price of a case.
    const zone = firstLocation?.time_zone ?? 'UTC';
    const avgLo = DateTime.fromISO(days.averages.from, { zone }).toJSDate();
    const avgHi = DateTime.fromISO(days.averages.to, { zone }).plus({ days: 1 }).toJSDate();
    const loc = q.locationId !== undefined ? ' AND r.location_id = :locationId' : '';
    const ctx = await this.context(practiceId, { ...days.horizon, locationId: q.locationId });
    const [ops, bookings, waiting, fromVisits, fromEstimates, table] = await Promise.all([
      this.operators(practiceId, ctx.lo, ctx.hi),
      this.holdingBookings(practiceId, ctx.lo, ctx.hi, { locationId: q.locationId }),
      this.select<{ location_id: number; level: Level | null; n: unknown }>(
        `SELECT r.location_id, c.level, COUNT(*) AS n FROM cases c JOIN referrals r ON r.id = c.referral_id
          WHERE c.practice_id = :practiceId AND c.status IN (:waiting) AND r.status NOT IN ('declined', 'cancelled')${loc}
          GROUP BY r.location_id, c.level`,
        { practiceId, waiting: [...WAITING_STATUSES], locationId: q.locationId },
      ),
      // Each case's booked minutes (visits + turnover) over the averaging days, summed per level.
      this.select<{ level: Level | null; cases: unknown; minutes: unknown }>(
        `SELECT c.level, COUNT(DISTINCT a.case_id) AS cases, SUM(TIMESTAMPDIFF(SECOND, a.start, a.end) / 60 + a.turnover_minutes) AS minutes
           FROM appointments a JOIN cases c ON c.id = a.case_id
          WHERE a.practice_id = :practiceId AND a.start >= :lo AND a.start < :hi AND a.state NOT IN ('cancelled', 'no_show')
          GROUP BY c.level`,
        { practiceId, lo: avgLo, hi: avgHi },
      ),
      this.select<{ level: Level | null; cases: unknown; minutes: unknown; visits: unknown }>(
        `SELECT level, COUNT(*) AS cases, SUM(estimated_minutes) AS minutes, SUM(COALESCE(visit_count, 1)) AS visits
           FROM cases WHERE practice_id = :practiceId AND estimated_minutes IS NOT NULL AND level IS NOT NULL
          GROUP BY level`,
        { practiceId },
      ),
      this.estimates.currentTable(practiceId),
    ]);
    const sample = (rows: { level: Level | null; cases: unknown; minutes: unknown }[]): LevelSample[] => rows.map((r) => ({ level: r.level, cases: Number(r.cases), minutes: Number(r.minutes) }));
    // Stored estimates hold the visits' minutes; each visit adds the table's turnover.
    const estimated = fromEstimates.map((r) => ({ level: r.level, cases: Number(r.cases), minutes: Number(r.minutes) + Number(r.visits) * table.turnoverMinutes }));
    const averages = levelAverages(sample(fromVisits), estimated, table);

    const horizonDays = BACKLOG_HORIZON_WEEKS * 7;
    const first = parseLocalDate(days.horizon.from);
    const opDays = operatorDays({ from: days.horizon.from, to: days.horizon.to, locations: ctx.locations, operators: ops, bookings, locationId: q.locationId });
    const capacity: LocationCapacity[] = ctx.locations.map((l) => {
      const chairs = ctx.chairs.filter((c) => c.locationId === l.id);
      const use = chairUse({ from: days.horizon.from, to: days.horizon.to, now, locations: [l], chairs, bookings: bookings.filter((b) => b.locationId === l.id) });
      const operatorFree = new Array<number>(horizonDays).fill(0);
      let operatorDayCount = 0;
      let workingMinutes = 0;
      for (const perLocation of opDays.values()) {
        for (const [day, v] of perLocation.get(l.id) ?? []) {
          if (v.working <= 0) continue;
          operatorFree[day - first] = (operatorFree[day - first] ?? 0) + (v.working - v.clinical) / 60_000;
          operatorDayCount++;
          workingMinutes += v.working / 60_000;
        }
      }
      return {
        locationId: l.id,
        locationName: l.name,
        days: use.byDay.map((d, i) => ({ chairFree: d.openMinutes - d.bookedMinutes, operatorFree: operatorFree[i]!, chairOpen: d.openMinutes })),
        openChairDays: use.byDay.filter((d) => d.openMinutes > 0).length * chairs.length,
        operatorDays: operatorDayCount,
        workingMinutes,
      };
    });
    const cases: BacklogCases[] = waiting.map((w) => ({ locationId: w.location_id, level: (w.level ?? 'untriaged') as BacklogLevel, cases: Number(w.n) }));
    return { days, capacity, cases, averages };
  }

  private static backlogReport(q: { locationId?: number }, days: { horizon: BacklogReport['horizon']; averages: { from: string; to: string } }, f: BacklogFigures): BacklogReport {
    const { assumptions: _assumptions, ...figures } = f;
    return { range: ReportsService.range({ ...days.averages, locationId: q.locationId }), horizon: days.horizon, ...figures };
  }

  /** Backlog forecast: the cases waiting, priced by level, over the free capacity of the coming weeks. */
  async backlog(practiceId: number, q: BacklogQueryDto, now = Date.now()): Promise<BacklogReport> {
    const input = await this.backlogInput(practiceId, q, now);
    return ReportsService.backlogReport(q, input.days, backlogForecast({ locations: input.capacity, cases: input.cases, averages: input.averages }));
  }

  /** The forecast before and after adding or removing chair days and operator days per week (one read). */
  async backlogWhatIf(practiceId: number, dto: BacklogWhatIfDto, now = Date.now()): Promise<BacklogWhatIfResponse> {
    const input = await this.backlogInput(practiceId, dto, now);
    const whatIf: WhatIf = { chairDaysPerWeek: dto.chairDaysPerWeek, operatorDaysPerWeek: dto.operatorDaysPerWeek, ...(dto.locationId !== undefined ? { locationId: dto.locationId } : {}) };
    const beforeF = backlogForecast({ locations: input.capacity, cases: input.cases, averages: input.averages });
    const afterF = backlogForecast({ locations: input.capacity, cases: input.cases, averages: input.averages, whatIf });
    const before = ReportsService.backlogReport(dto, input.days, beforeF);
    const after = ReportsService.backlogReport(dto, input.days, afterF);
    const diff = (a: number | null, b: number | null) => (a === null || b === null ? null : b - a);
    return {
      before,
      after,
      change: { weeksOfBacklog: diff(before.totals.weeksOfBacklog, after.totals.weeksOfBacklog), leadTimeWeeks: diff(before.leadTimeWeeks, after.leadTimeWeeks) },
      assumptions: beforeF.assumptions,
    };
  }

  // ---------- settings ----------

  async settings(practiceId: number): Promise<ReportSettings> {
    const p = await this.practices.get(practiceId);
    return { lateCancelNoticeHours: p.settings.lateCancellationHours ?? DEFAULT_LATE_CANCEL_NOTICE_HOURS };
  }

  /** The notice is the practice setting lateCancellationHours (also on PATCH /api/practice/settings). */
  async updateSettings(practiceId: number, dto: ReportSettings): Promise<ReportSettings> {
    const p = await this.practices.updateSettings(practiceId, { lateCancellationHours: dto.lateCancelNoticeHours });
    return { lateCancelNoticeHours: p.settings.lateCancellationHours };
  }
}
