import type { AttendanceReport, BacklogReport, ChairUseReport, EstimateAccuracyReport, OperatorUseReport, ReferralsReport } from '@ostium/shared';
import { DateTime } from 'luxon';
import { daysNumber, hours, minutesNumber, NO_OPEN_TIME, percent, weeks } from '../report-format.util';
import type { ReportTableModel } from '../report-csv.util';
import { chairTable, weekTable } from '../report-tables.util';
import { referralsReceived } from './referrals-section';

/** At most this many weeks fit the printed page beside the figures and the chair table. */
const PRINTED_WEEKS = 14;

interface Figure {
  label: string;
  value: string;
  parts?: string;
}

export interface PrintReports {
  chairUse?: ChairUseReport;
  operatorUse?: OperatorUseReport;
  attendance?: AttendanceReport;
  referrals?: ReferralsReport;
  accuracy?: EstimateAccuracyReport;
  backlog?: BacklogReport;
}

function groups(r: PrintReports): { title: string; figures: Figure[] }[] {
  const out: { title: string; figures: Figure[] }[] = [];
  const c = r.chairUse?.totals;
  if (c)
    out.push({
      title: 'Chair time',
      figures: [
        { label: 'Booked share', value: percent(c.share), parts: `${hours(c.bookedMinutes)} of ${hours(c.openMinutes)} open` },
        { label: 'Actual share', value: percent(c.actualShare, 'no done days yet'), parts: `${hours(c.actualMinutes)} of ${hours(c.actualOpenMinutes)} open` },
      ],
    });
  const o = r.operatorUse?.totals;
  if (o) out.push({ title: 'Endodontists', figures: [{ label: 'Clinical share', value: percent(o.share, 'no working time'), parts: `${hours(o.clinicalMinutes)} of ${hours(o.workingMinutes)} working` }] });
  const a = r.attendance;
  if (a)
    out.push({
      title: 'Attendance',
      figures: [
        { label: 'No-shows', value: String(a.totals.noShows), parts: a.totals.noShowShare === null ? undefined : `${percent(a.totals.noShowShare)} of ${a.totals.visits} visits` },
        {
          label: 'Late cancellations',
          value: String(a.totals.lateCancellations),
          parts: a.totals.lateCancellationShare === null ? `under ${a.lateCancelNoticeHours} h notice` : `${percent(a.totals.lateCancellationShare)}, under ${a.lateCancelNoticeHours} h notice`,
        },
        { label: 'Same-day fills', value: String(a.totals.sameDayFills) },
        { label: 'Confirmation rate', value: percent(a.confirmationRate, '—') },
      ],
    });
  const f = r.referrals;
  if (f)
    out.push({
      title: 'Referrals',
      figures: [
        { label: 'Received', value: String(referralsReceived(f)) },
        { label: 'Lead time, median', value: f.leadTime.medianDays === null ? '—' : `${daysNumber(f.leadTime.medianDays)} days`, parts: f.leadTime.p90Days === null ? undefined : `90th percentile ${daysNumber(f.leadTime.p90Days)} days` },
        { label: 'Waiting today', value: String(f.waiting.count) },
      ],
    });
  const e = r.accuracy;
  if (e)
    out.push({
      title: 'Estimate accuracy',
      figures: [
        { label: 'Error, table alone', value: e.totals.beforeMae === null ? '—' : `${minutesNumber(e.totals.beforeMae)} min` },
        { label: 'Error, after calibration', value: e.totals.afterMae === null ? '—' : `${minutesNumber(e.totals.afterMae)} min`, parts: `${e.totals.visits} visits` },
        { label: 'Overrun days', value: String(e.overrunDays.length) },
      ],
    });
  const b = r.backlog;
  if (b)
    out.push({
      title: 'Backlog forecast',
      figures: [
        { label: 'Weeks of backlog', value: b.noOpenTime ? NO_OPEN_TIME : weeks(b.totals.weeksOfBacklog), parts: `${b.totals.cases} cases` },
        { label: 'Lead time for a new case', value: b.noOpenTime ? NO_OPEN_TIME : weeks(b.leadTimeWeeks, '—') },
        { label: 'Capacity per week', value: hours(b.capacityMinutesPerWeek), parts: `next ${b.horizon.weeks} weeks` },
      ],
    });
  return out;
}

/** The one-page summary printed by "Print summary": hidden on screen, the only thing on paper (chair-use.css). */
export function PrintSummary({ practiceName, range, scope, reports, now, zone }: { practiceName: string; range: string; scope: string; reports: PrintReports; now: Date; zone: string }) {
  return (
    <div className="ostium-print-summary" aria-hidden="true">
      <header>
        <h1>Chair use summary</h1>
        <p>
          {practiceName} · {range} · {scope}
        </p>
      </header>
      {groups(reports).map((g) => (
        <section key={g.title}>
          <h2>{g.title}</h2>
          <dl>
            {g.figures.map((f) => (
              <div key={f.label}>
                <dt>{f.label}</dt>
                <dd>
                  <strong>{f.value}</strong>
                  {f.parts && <span>{f.parts}</span>}
                </dd>
              </div>
            ))}
          </dl>
        </section>
      ))}
      {/* A long range's weeks would spill onto a second page; the screen and the CSV still have them. */}
      {reports.chairUse && reports.chairUse.byWeek.length <= PRINTED_WEEKS && <PrintTable model={weekTable(reports.chairUse)} />}
      {reports.chairUse && <PrintTable model={chairTable(reports.chairUse)} />}
      <footer>Printed {DateTime.fromJSDate(now, { zone }).toFormat('LLL d, yyyy, HH:mm')} from Ostium; each figure’s definition shows beside it on the Chair use page.</footer>
    </div>
  );
}

function PrintTable({ model }: { model: ReportTableModel }) {
  if (model.rows.length === 0) return null;
  const num = (j: number) => (model.columns[j]?.kind === 'number' ? 'num' : undefined);
  return (
    <section className="ostium-print-wide">
      <h2>{model.title}</h2>
      <table>
        <thead>
          <tr>
            {model.columns.map((c, j) => (
              <th key={c.label} className={num(j)}>
                {c.label}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {[...model.rows, ...(model.totals ? [model.totals] : [])].map((row, i) => (
            <tr key={i}>
              {row.map((cell, j) => (
                <td key={j} className={num(j)}>
                  {cell}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </section>
  );
}
