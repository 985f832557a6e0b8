// Referrals (REPORT_DEFINITIONS.leadTime): volume by referring dentist and month, share of cases by
// level, lead time from receipt to the first visit, and the referrals still waiting to be booked. Pure.
import { LEVELS, type Level, type ReferralsReport } from '@ostium/shared';
import { median, nearestRank } from './percentile.util.js';
import { clockFor, daySpan, monthOf, parseLocalDate, ratio, type ZoneClock } from './report-time.util.js';

export interface ReportReferral {
  id: number;
  locationId: number;
  /** 'YYYY-MM-DD', the practice's local date of receipt. */
  receivedOn: string;
  referringDentistId: number | null;
  dentistName: string;
  /** Start of the first visit that was not cancelled or missed (epoch ms), if any. */
  firstVisitStart: number | null;
  /** The level of each of its cases (null: not assessed yet). */
  caseLevels: readonly (Level | null)[];
}

export interface WaitingReferral {
  locationId: number;
  receivedOn: string;
  status: string;
}

export interface ReferralsInput {
  from: string;
  to: string;
  now: number;
  zones: ReadonlyMap<number, string>;
  referrals: readonly ReportReferral[];
  waiting: readonly WaitingReferral[];
}

export type ReferralsFigures = Omit<ReferralsReport, 'range'>;

/** Statuses of a referral that still waits to be booked. */
export const WAITING_STATUSES = ['received', 'triaged', 'planned'] as const;

export function monthsOf(from: string, to: string): string[] {
  const out: string[] = [];
  let [y, m] = from.slice(0, 7).split('-').map(Number) as [number, number];
  const end = to.slice(0, 7);
  for (;;) {
    const key = `${y}-${String(m).padStart(2, '0')}`;
    out.push(key);
    if (key >= end) break;
    m++;
    if (m > 12) {
      m = 1;
      y++;
    }
  }
  return out;
}

export function referralsReport(input: ReferralsInput): ReferralsFigures {
  const span = daySpan(input.from, input.to);
  const months = monthsOf(input.from, input.to);
  const monthIndex = new Map(months.map((m, i) => [m, i]));
  const clocks = new Map<number, ZoneClock>();
  const clockOf = (locationId: number) => {
    let c = clocks.get(locationId);
    if (!c) clocks.set(locationId, (c = clockFor(input.zones.get(locationId) ?? 'UTC', { first: span.first, last: span.last + 400 })));
    return c;
  };
  const received = input.referrals.filter((r) => r.receivedOn >= input.from && r.receivedOn <= input.to);

  const dentists = new Map<string, { referringDentistId: number | null; name: string; counts: number[]; total: number }>();
  for (const r of received) {
    const key = `${r.referringDentistId ?? 'none'}`;
    let d = dentists.get(key);
    if (!d) dentists.set(key, (d = { referringDentistId: r.referringDentistId, name: r.dentistName, counts: months.map(() => 0), total: 0 }));
    d.counts[monthIndex.get(monthOf(parseLocalDate(r.receivedOn)))!]!++;
    d.total++;
  }

  const levelCounts = new Map<Level | 'untriaged', number>([...LEVELS.map((l) => [l, 0] as [Level, number]), ['untriaged', 0]]);
  let cases = 0;
  for (const r of received) {
    for (const l of r.caseLevels) {
      const k = l ?? 'untriaged';
      levelCounts.set(k, (levelCounts.get(k) ?? 0) + 1);
      cases++;
    }
  }

  // Calendar days between the local date of receipt and the local date of the first visit.
  const leads: number[] = [];
  for (const r of received) {
    if (r.firstVisitStart === null) continue;
    leads.push(clockOf(r.locationId).day(r.firstVisitStart) - parseLocalDate(r.receivedOn));
  }

  const waitedDays = input.waiting.map((w) => clockOf(w.locationId).day(input.now) - parseLocalDate(w.receivedOn));
  const byStatus = WAITING_STATUSES.map((status) => ({ status, count: input.waiting.filter((w) => w.status === status).length }));

  return {
    months,
    byDentist: [...dentists.values()].sort((a, b) => b.total - a.total || a.name.localeCompare(b.name)),
    byLevel: [...levelCounts.entries()].map(([level, count]) => ({ level, count, share: ratio(count, cases) })),
    leadTime: { referrals: leads.length, medianDays: median(leads), p90Days: nearestRank(leads, 90) },
    waiting: {
      count: input.waiting.length,
      medianDays: median(waitedDays),
      oldestDays: waitedDays.length ? Math.max(...waitedDays) : null,
      byStatus,
    },
  };
}
