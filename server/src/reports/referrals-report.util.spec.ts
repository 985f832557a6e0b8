// Referrals by dentist and month, cases by level, lead time (nearest rank) and the waiting list.
import { describe, expect, it } from 'vitest';
import { monthsOf, referralsReport, type ReportReferral } from './referrals-report.util.js';
import { NY, ny } from './reports.fixtures.util.js';

const ref = (id: number, receivedOn: string, dentist: number | null, first: string | null, levels: ('low' | 'moderate' | 'high' | null)[]): ReportReferral => ({
  id,
  locationId: 1,
  receivedOn,
  referringDentistId: dentist,
  dentistName: dentist === null ? 'No referring dentist' : `Dr. Dentist ${dentist}`,
  firstVisitStart: first === null ? null : ny(first),
  caseLevels: levels,
});

const referrals = [
  ref(1, '2026-09-03', 7, '2026-09-10 09:00', ['low']), // 7 days
  ref(2, '2026-09-20', 7, '2026-10-01 23:30', ['moderate', 'high']), // 11 days (23:30 New York is 10-02 in UTC)
  ref(3, '2026-10-02', 8, '2026-10-04 10:00', ['high']), // 2 days
  ref(4, '2026-10-15', 7, '2026-11-09 08:00', ['moderate']), // 25 days, across the DST change
  ref(5, '2026-10-30', 8, null, [null]), // not booked yet
  ref(6, '2026-08-31', 8, '2026-09-02 08:00', ['low']), // before the range
];

const report = () =>
  referralsReport({
    from: '2026-09-01',
    to: '2026-10-31',
    now: ny('2026-11-04 12:00'),
    zones: new Map([[1, NY]]),
    referrals,
    waiting: [
      { locationId: 1, receivedOn: '2026-10-30', status: 'received' },
      { locationId: 1, receivedOn: '2026-10-21', status: 'planned' },
      { locationId: 1, receivedOn: '2026-11-04', status: 'triaged' },
    ],
  });

describe('referralsReport', () => {
  it('months of the range, in order, across a year end', () => {
    expect(monthsOf('2026-11-15', '2027-02-01')).toEqual(['2026-11', '2026-12', '2027-01', '2027-02']);
    expect(report().months).toEqual(['2026-09', '2026-10']);
  });

  it('volume by referring dentist and month (received in the range only)', () => {
    expect(report().byDentist.map((d) => [d.referringDentistId, d.counts, d.total])).toEqual([
      [7, [2, 1], 3],
      [8, [0, 2], 2],
    ]);
  });

  it('cases by level; the shares add to 1', () => {
    const r = report();
    // Cases of referrals 1–5: low 1, moderate 2, high 2, untriaged 1 → 6.
    expect(r.byLevel.map((l) => [l.level, l.count])).toEqual([
      ['low', 1],
      ['moderate', 2],
      ['high', 2],
      ['untriaged', 1],
    ]);
    expect(r.byLevel.reduce((s, l) => s + l.share!, 0)).toBeCloseTo(1, 12);
  });

  it('lead time in local calendar days, median and 90th percentile by nearest rank', () => {
    // Leads 7, 11, 2, 25 → sorted 2 7 11 25: median rank 2 = 7, P90 rank ⌈3.6⌉ = 4 = 25.
    expect(report().leadTime).toEqual({ referrals: 4, medianDays: 7, p90Days: 25 });
  });

  it('waiting: how many and for how long, by status', () => {
    // Today 11-04: waited 5, 14 and 0 days → median 5, oldest 14.
    expect(report().waiting).toEqual({
      count: 3,
      medianDays: 5,
      oldestDays: 14,
      byStatus: [
        { status: 'received', count: 1 },
        { status: 'triaged', count: 1 },
        { status: 'planned', count: 1 },
      ],
    });
  });
});
