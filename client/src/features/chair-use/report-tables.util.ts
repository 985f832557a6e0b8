import type {
  AttendanceReport,
  BacklogReport,
  BacklogWhatIfResponse,
  ChairUseReport,
  EstimateAccuracyReport,
  OperatorUseReport,
  ReferralsReport,
  UseFigure,
} from '@ostium/shared';
import type { ReportColumn, ReportTableModel } from './report-csv.util';
import {
  clockTime,
  dayLabel,
  hourLabel,
  hoursNumber,
  LEVEL_LABELS,
  minutesNumber,
  monthLabel,
  NONE,
  percentNumber,
  sharesToTenths,
  shownChange,
  WEEKDAY_LABELS,
  weekLabel,
  weeksNumber,
  WHAT_IF_WEEK_DECIMALS,
} from './report-format.util';

// Builders of every table on the Chair use page, from the server's report shapes to formatted cells.

const num = (label: string, definition?: ReportColumn['definition']): ReportColumn => ({ label, kind: 'number', ...(definition ? { definition } : {}) });
const text = (label: string): ReportColumn => ({ label });
const level = (label = 'Difficulty'): ReportColumn => ({ label, kind: 'level' });

const USE_COLUMNS: ReportColumn[] = [
  num('Open (h)'),
  num('Booked (h)'),
  num('Booked share (%)', 'chairUse'),
  num('Open on done days (h)'),
  num('Used (h)'),
  num('Actual share (%)', 'actualChairUse'),
];
const useCells = (f: UseFigure) => [
  hoursNumber(f.openMinutes),
  hoursNumber(f.bookedMinutes),
  percentNumber(f.share),
  hoursNumber(f.actualOpenMinutes),
  hoursNumber(f.actualMinutes),
  percentNumber(f.actualShare, f.actualOpenMinutes === 0 && f.openMinutes > 0 ? 'no done days' : undefined),
];

export function chairTable(r: ChairUseReport): ReportTableModel {
  return {
    name: 'chair-use-by-chair',
    title: 'Chair use by chair',
    columns: [text('Chair'), text('Location'), ...USE_COLUMNS],
    rows: r.byChair.map((c) => [c.chairName, c.locationName, ...useCells(c)]),
    totals: ['All chairs', r.byLocation.length === 1 ? r.byLocation[0]!.locationName : 'All locations', ...useCells(r.totals)],
  };
}

export function locationTable(r: ChairUseReport): ReportTableModel {
  return {
    name: 'chair-use-by-location',
    title: 'Chair use by location',
    columns: [text('Location'), ...USE_COLUMNS],
    rows: r.byLocation.map((l) => [l.locationName, ...useCells(l)]),
    totals: ['All locations', ...useCells(r.totals)],
  };
}

export const sortedWeeks = (r: ChairUseReport) => [...r.byWeek].sort((a, b) => a.weekStart.localeCompare(b.weekStart));

export function weekTable(r: ChairUseReport): ReportTableModel {
  return {
    name: 'chair-use-by-week',
    title: 'Chair use by week',
    columns: [text('Week starting'), ...USE_COLUMNS],
    rows: sortedWeeks(r).map((w) => [weekLabel(w.weekStart), ...useCells(w)]),
    totals: ['Whole range', ...useCells(r.totals)],
  };
}

/** Chart points: shares as percentages rounded like the table, so a hover reads the same number. */
export const weekChartData = (r: ChairUseReport) =>
  sortedWeeks(r).map((w) => ({
    week: weekLabel(w.weekStart),
    booked: w.share === null ? null : Number(percentNumber(w.share)),
    actual: w.actualShare === null ? null : Number(percentNumber(w.actualShare)),
  }));

export const sortedHeatmap = (r: ChairUseReport) => [...r.heatmap].sort((a, b) => a.weekday - b.weekday || a.hour - b.hour);

export function heatmapTable(r: ChairUseReport): ReportTableModel {
  return {
    name: 'chair-use-by-weekday-and-hour',
    title: 'Booked share by weekday and hour',
    columns: [text('Weekday'), text('Hour'), num('Open (h)'), num('Booked (h)'), num('Booked share (%)', 'chairUse')],
    rows: sortedHeatmap(r).map((c) => [WEEKDAY_LABELS[c.weekday - 1] ?? String(c.weekday), `${hourLabel(c.hour)}–${hourLabel(c.hour + 1)}`, hoursNumber(c.openMinutes), hoursNumber(c.bookedMinutes), percentNumber(c.share)]),
  };
}

export function operatorTable(r: OperatorUseReport): ReportTableModel {
  return {
    name: 'endodontist-use',
    title: 'Use by endodontist',
    columns: [text('Endodontist'), num('Working (h)'), num('Clinical (h)'), num('Clinical share (%)', 'operatorUse')],
    rows: r.byOperator.map((o) => [o.operatorName, hoursNumber(o.workingMinutes), hoursNumber(o.clinicalMinutes), percentNumber(o.share, 'no working time')]),
    totals: ['All endodontists', hoursNumber(r.totals.workingMinutes), hoursNumber(r.totals.clinicalMinutes), percentNumber(r.totals.share, 'no working time')],
  };
}

export const operatorChartData = (r: OperatorUseReport) =>
  r.byOperator.filter((o) => o.share !== null).map((o) => ({ endodontist: o.operatorName, share: Number(percentNumber(o.share)) }));

/** The totals row of a share table: counts added up, the shown tenths added up (100.0 when the shares make a whole). */
function shareTotals(label: string, counts: number[], shown: (string | null)[]): string[] {
  const tenths = shown.filter((s): s is string => s !== null).reduce((sum, s) => sum + Math.round(Number(s) * 10), 0);
  return [label, String(counts.reduce((a, b) => a + b, 0)), shown.some((s) => s !== null) ? (tenths / 10).toFixed(1) : NONE];
}

export function outcomeTable(r: AttendanceReport): ReportTableModel {
  const t = r.totals;
  const counts = [t.attended, t.noShows, t.lateCancellations];
  const shown = sharesToTenths([t.attendedShare, t.noShowShare, t.lateCancellationShare]);
  return {
    name: 'attendance-outcomes',
    title: 'What became of the visits',
    columns: [text('Outcome'), num('Visits'), num('Share (%)')],
    rows: [
      ['Attended', String(t.attended), shown[0] ?? NONE],
      ['No-show', String(t.noShows), shown[1] ?? NONE],
      [`Late cancellation (under ${r.lateCancelNoticeHours} h notice)`, String(t.lateCancellations), shown[2] ?? NONE],
    ],
    totals: shareTotals('All visits', counts, shown),
  };
}

export const CHANNEL_LABELS: Record<AttendanceReport['confirmationByChannel'][number]['channel'], string> = {
  sms: 'Text reply',
  email: 'E-mail',
  link: 'Visit page link',
  desk: 'Front desk',
  unconfirmed: 'Not confirmed',
};

export function channelTable(r: AttendanceReport): ReportTableModel {
  const shown = sharesToTenths(r.confirmationByChannel.map((c) => c.share));
  return {
    name: 'confirmation-by-channel',
    title: 'Confirmation by channel',
    columns: [text('Confirmed by'), num('Visits'), num('Share (%)', 'confirmationRate')],
    rows: r.confirmationByChannel.map((c, i) => [CHANNEL_LABELS[c.channel] ?? c.channel, String(c.visits), shown[i] ?? NONE]),
    totals: shareTotals('All', r.confirmationByChannel.map((c) => c.visits), shown),
  };
}

const REMINDER_LABELS: Record<string, string> = { '0': 'None', '1': 'One', '2': 'Two', '3+': 'Three or more' };

export function remindersTable(r: AttendanceReport): ReportTableModel {
  const shown = sharesToTenths(r.confirmationByReminders.map((c) => c.share));
  return {
    name: 'confirmation-by-reminders',
    title: 'Confirmation by reminders sent before it',
    columns: [text('Reminders before confirming'), num('Confirmed visits'), num('Share (%)')],
    rows: r.confirmationByReminders.map((c, i) => [REMINDER_LABELS[c.reminders] ?? c.reminders, String(c.visits), shown[i] ?? NONE]),
    totals: shareTotals('All confirmed visits', r.confirmationByReminders.map((c) => c.visits), shown),
  };
}

export function dentistTable(r: ReferralsReport): ReportTableModel {
  const monthTotals = r.months.map((_, i) => r.byDentist.reduce((s, d) => s + (d.counts[i] ?? 0), 0));
  return {
    name: 'referrals-by-dentist-and-month',
    title: 'Referrals by referring dentist and month',
    columns: [text('Referring dentist'), ...r.months.map((m) => num(monthLabel(m))), num('Total')],
    rows: r.byDentist.map((d) => [d.name, ...r.months.map((_, i) => String(d.counts[i] ?? 0)), String(d.total)]),
    totals: ['All referring dentists', ...monthTotals.map(String), String(r.byDentist.reduce((s, d) => s + d.total, 0))],
  };
}

export const monthChartData = (r: ReferralsReport) => r.months.map((m, i) => ({ month: monthLabel(m), referrals: r.byDentist.reduce((s, d) => s + (d.counts[i] ?? 0), 0) }));

/** Cases, not referrals: a referral holds one case per tooth, each with its own difficulty. */
export function levelShareTable(r: ReferralsReport): ReportTableModel {
  const shown = sharesToTenths(r.byLevel.map((l) => l.share));
  return {
    name: 'cases-by-difficulty',
    title: 'Cases by difficulty',
    columns: [level(), num('Cases'), num('Share (%)')],
    rows: r.byLevel.map((l, i) => [LEVEL_LABELS[l.level], String(l.count), shown[i] ?? NONE]),
    totals: shareTotals('All cases', r.byLevel.map((l) => l.count), shown),
  };
}

const WAITING_LABELS: Record<string, string> = { received: 'Received, to triage', triaged: 'Triaged, to plan', planned: 'Planned, to book' };

export function waitingTable(r: ReferralsReport): ReportTableModel {
  return {
    name: 'referrals-waiting',
    title: 'Referrals waiting to be booked',
    columns: [text('Status'), num('Referrals')],
    rows: r.waiting.byStatus.map((s) => [WAITING_LABELS[s.status] ?? s.status, String(s.count)]),
    totals: ['All waiting', String(r.waiting.count)],
  };
}

const MAE_COLUMNS: ReportColumn[] = [num('Visits'), num('Error, table alone (min)', 'estimateError'), num('Error, after calibration (min)', 'estimateError')];

export function accuracyLevelTable(r: EstimateAccuracyReport): ReportTableModel {
  return {
    name: 'estimate-error-by-difficulty',
    title: 'Estimate error by difficulty',
    columns: [level(), ...MAE_COLUMNS],
    rows: r.byLevel.map((l) => [LEVEL_LABELS[l.level], String(l.visits), minutesNumber(l.beforeMae), minutesNumber(l.afterMae)]),
    totals: ['All visits', String(r.totals.visits), minutesNumber(r.totals.beforeMae), minutesNumber(r.totals.afterMae)],
  };
}

export function accuracyOperatorTable(r: EstimateAccuracyReport): ReportTableModel {
  return {
    name: 'estimate-error-by-endodontist',
    title: 'Estimate error by endodontist',
    columns: [text('Endodontist'), ...MAE_COLUMNS],
    rows: r.byOperator.map((o) => [o.operatorName, String(o.visits), minutesNumber(o.beforeMae), minutesNumber(o.afterMae)]),
    totals: ['All endodontists', String(r.totals.visits), minutesNumber(r.totals.beforeMae), minutesNumber(r.totals.afterMae)],
  };
}

export const accuracyChartData = (r: EstimateAccuracyReport) =>
  r.byLevel.map((l) => ({
    level: LEVEL_LABELS[l.level],
    before: l.beforeMae === null ? null : Number(minutesNumber(l.beforeMae)),
    after: l.afterMae === null ? null : Number(minutesNumber(l.afterMae)),
  }));

export function accuracyMonthTable(r: EstimateAccuracyReport): ReportTableModel {
  return {
    name: 'estimate-error-by-month',
    title: 'Estimate error by month',
    columns: [text('Month'), ...MAE_COLUMNS],
    rows: r.byMonth.map((m) => [monthLabel(m.month), String(m.visits), minutesNumber(m.beforeMae), minutesNumber(m.afterMae)]),
  };
}

export const accuracyMonthChartData = (r: EstimateAccuracyReport) =>
  r.byMonth.map((m) => ({
    month: monthLabel(m.month),
    before: m.beforeMae === null ? null : Number(minutesNumber(m.beforeMae)),
    after: m.afterMae === null ? null : Number(minutesNumber(m.afterMae)),
  }));

export function overrunTable(r: EstimateAccuracyReport, zone: string): ReportTableModel {
  return {
    name: 'overrun-days',
    title: 'Overrun days',
    columns: [text('Day'), text('Chair'), text('Closes at'), text('Last visit ended'), num('Over by (min)', 'overrunDay')],
    rows: [...r.overrunDays]
      .sort((a, b) => a.date.localeCompare(b.date) || a.chairName.localeCompare(b.chairName))
      .map((d) => [dayLabel(d.date), d.chairName, clockTime(d.closesAt, zone), clockTime(d.lastEndAt, zone), String(Math.round(d.overrunMinutes))]),
  };
}

export function backlogTable(r: BacklogReport, name = 'backlog-by-difficulty-and-location', title = 'Backlog by difficulty and location'): ReportTableModel {
  return {
    name,
    title,
    columns: [text('Location'), level(), num('Cases'), num('Chair time (h)'), num('Weeks of backlog', 'backlog')],
    rows: r.rows.map((b) => [b.locationName, LEVEL_LABELS[b.level], String(b.cases), hoursNumber(b.minutes), weeksNumber(b.weeksOfBacklog)]),
    totals: ['All locations', 'All levels', String(r.totals.cases), hoursNumber(r.totals.minutes), weeksNumber(r.totals.weeksOfBacklog)],
  };
}

export function averageMinutesTable(r: BacklogReport): ReportTableModel {
  return {
    name: 'backlog-minutes-per-case',
    title: 'Chair time per case, as the forecast prices it',
    columns: [level(), num('Minutes per case'), text('From')],
    rows: r.averageMinutesByLevel.map((a) => [LEVEL_LABELS[a.level], String(Math.round(a.minutes)), a.basis === 'visits' ? 'the practice’s own visits' : 'the estimate table']),
  };
}

/** Before → after of the what-if, the figures a manager weighs. */
export function whatIfTable(w: BacklogWhatIfResponse): ReportTableModel {
  const b = w.before;
  const a = w.after;
  const wk = (report: BacklogReport, n: number | null) => (report.noOpenTime ? 'no open time' : weeksNumber(n, NONE, WHAT_IF_WEEK_DECIMALS));
  const perWeek = (label: string, pick: (r: BacklogReport) => number) => [label, hoursNumber(pick(b)), hoursNumber(pick(a)), shownChange(pick(b) / 60, pick(a) / 60)];
  // The server's change is null when either side has no open time; otherwise the shown figures' difference.
  const change = (server: number | null, before: number | null, after: number | null) => (server === null || b.noOpenTime || a.noOpenTime ? NONE : shownChange(before, after, NONE, WHAT_IF_WEEK_DECIMALS));
  return {
    name: 'backlog-what-if',
    title: 'Backlog now and with the change',
    columns: [text('Figure'), num('Now'), num('With the change'), num('Change')],
    rows: [
      ['Weeks of backlog', wk(b, b.totals.weeksOfBacklog), wk(a, a.totals.weeksOfBacklog), change(w.change.weeksOfBacklog, b.totals.weeksOfBacklog, a.totals.weeksOfBacklog)],
      ['Lead time to a first visit (weeks)', wk(b, b.leadTimeWeeks), wk(a, a.leadTimeWeeks), change(w.change.leadTimeWeeks, b.leadTimeWeeks, a.leadTimeWeeks)],
      perWeek('Capacity per week (h)', (r) => r.capacityMinutesPerWeek),
      perWeek('Free chair time per week (h)', (r) => r.freeChairMinutesPerWeek),
      perWeek('Free endodontist time per week (h)', (r) => r.freeOperatorMinutesPerWeek),
      perWeek('Open chair time per week (h)', (r) => r.openChairMinutesPerWeek),
    ],
  };
}
