import type {
  AttendanceReport,
  BacklogReport,
  BacklogWhatIfResponse,
  ChairUseReport,
  EstimateAccuracyReport,
  LocationSummary,
  OperatorUseReport,
  PracticeSummary,
  ReferralsReport,
  ReportRange,
  Role,
  UserSummary,
} from '@ostium/shared';
import { sessionStore } from '../../../lib/session';

// Report answers in the server's shapes (shared/src/reports.types.ts) for two weeks, Oct 26 – Nov 8, 2026.
// Every name is made up; the figures add up the way the server's do (parts sum to totals, shares to 1).

export const RANGE: ReportRange = { from: '2026-10-26', to: '2026-11-08', locationId: null, chairId: null, operatorId: null };

const hours = (weekday: number, open: string, close: string) => ({ weekday, open, close });
export const LOCATIONS: LocationSummary[] = [
  {
    id: 1,
    name: 'Harbour Street',
    address: '1 Example Way',
    phone: '555-0110',
    timeZone: 'America/New_York',
    openingHours: [1, 2, 3, 4, 5].map((d) => hours(d, '08:00', '17:00')),
    chairs: [
      { id: 1, name: 'Chair 1', locationId: 1, fixedMicroscopeId: null },
      { id: 2, name: 'Chair 2', locationId: 1, fixedMicroscopeId: null },
    ],
    microscopes: [],
  },
  {
    id: 2,
    name: 'Mill Lane',
    address: '2 Example Way',
    phone: '555-0111',
    timeZone: 'America/New_York',
    openingHours: [1, 3].map((d) => hours(d, '09:00', '15:00')),
    chairs: [{ id: 3, name: 'Mill 1', locationId: 2, fixedMicroscopeId: null }],
    microscopes: [],
  },
];

export const ENDODONTISTS: UserSummary[] = [
  { id: 5, email: 'endo@example.com', name: 'Dr. Test Endodontist', role: 'endodontist', active: true, lastSignInAt: null, createdAt: '2026-01-01T00:00:00Z' },
  { id: 6, email: 'endo2@example.com', name: 'Dr. Second Endodontist', role: 'endodontist', active: true, lastSignInAt: null, createdAt: '2026-01-01T00:00:00Z' },
];

const use = (openMinutes: number, bookedMinutes: number, actualOpenMinutes: number, actualMinutes: number) => ({
  openMinutes,
  bookedMinutes,
  share: openMinutes ? bookedMinutes / openMinutes : null,
  actualOpenMinutes,
  actualMinutes,
  actualShare: actualOpenMinutes ? actualMinutes / actualOpenMinutes : null,
});

export function chairUseReport(over: Partial<ChairUseReport> = {}): ChairUseReport {
  return {
    range: RANGE,
    totals: use(6000, 4000, 5400, 3420),
    byChair: [
      { chairId: 1, chairName: 'Chair 1', locationId: 1, locationName: 'Harbour Street', ...use(2400, 1800, 2100, 1470) },
      { chairId: 2, chairName: 'Chair 2', locationId: 1, locationName: 'Harbour Street', ...use(2400, 1200, 2100, 1050) },
      { chairId: 3, chairName: 'Mill 1', locationId: 2, locationName: 'Mill Lane', ...use(1200, 1000, 1200, 900) },
    ],
    byLocation: [
      { locationId: 1, locationName: 'Harbour Street', ...use(4800, 3000, 4200, 2520) },
      { locationId: 2, locationName: 'Mill Lane', ...use(1200, 1000, 1200, 900) },
    ],
    byDay: [],
    byWeek: [
      // Sent out of order on purpose: the page sorts by week.
      { weekStart: '2026-11-02', ...use(3000, 1900, 2400, 1620) },
      { weekStart: '2026-10-26', ...use(3000, 2100, 3000, 1800) },
    ],
    heatmap: [
      { weekday: 1, hour: 8, openMinutes: 180, bookedMinutes: 150, share: 150 / 180 },
      { weekday: 1, hour: 9, openMinutes: 180, bookedMinutes: 90, share: 0.5 },
      { weekday: 2, hour: 8, openMinutes: 180, bookedMinutes: 20, share: 20 / 180 },
      { weekday: 5, hour: 13, openMinutes: 60, bookedMinutes: 60, share: 1 },
    ],
    ...over,
  };
}

export function emptyChairUse(): ChairUseReport {
  const zero = use(2400, 0, 2400, 0);
  return chairUseReport({ totals: zero, byChair: [{ chairId: 2, chairName: 'Chair 2', locationId: 1, locationName: 'Harbour Street', ...zero }], byLocation: [{ locationId: 1, locationName: 'Harbour Street', ...zero }], byWeek: [], heatmap: [] });
}

export function operatorUseReport(): OperatorUseReport {
  return {
    range: RANGE,
    totals: { workingMinutes: 4200, clinicalMinutes: 2850, share: 2850 / 4200 },
    byOperator: [
      { operatorId: 5, operatorName: 'Dr. Test Endodontist', workingMinutes: 2400, clinicalMinutes: 1500, share: 0.625 },
      { operatorId: 6, operatorName: 'Dr. Second Endodontist', workingMinutes: 1800, clinicalMinutes: 1350, share: 0.75 },
    ],
    byWeek: [],
  };
}

export function attendanceReport(): AttendanceReport {
  return {
    range: RANGE,
    lateCancelNoticeHours: 48,
    totals: { visits: 40, attended: 35, noShows: 3, lateCancellations: 2, earlyCancellations: 4, sameDayFills: 1, open: 5, attendedShare: 35 / 40, noShowShare: 3 / 40, lateCancellationShare: 2 / 40 },
    // Over the 38 visits that took place or were missed (35 attended + 3 no-shows); 30 of them confirmed.
    confirmationByChannel: [
      { channel: 'sms', visits: 18, share: 18 / 38 },
      { channel: 'email', visits: 6, share: 6 / 38 },
      { channel: 'link', visits: 3, share: 3 / 38 },
      { channel: 'desk', visits: 3, share: 3 / 38 },
      { channel: 'unconfirmed', visits: 8, share: 8 / 38 },
    ],
    // Thirds: rounded one by one they would show 99.9 %.
    confirmationByReminders: [
      { reminders: '0', visits: 10, share: 1 / 3 },
      { reminders: '1', visits: 10, share: 1 / 3 },
      { reminders: '2', visits: 10, share: 1 / 3 },
      { reminders: '3+', visits: 0, share: 0 },
    ],
    confirmationRate: 30 / 38,
  };
}

export function referralsReport(): ReferralsReport {
  return {
    range: RANGE,
    months: ['2026-10', '2026-11'],
    byDentist: [
      { referringDentistId: 11, name: 'Dr. Ines Marlow', counts: [3, 2], total: 5 },
      { referringDentistId: 12, name: 'Dr. Odo Brandt, Brandt & Vale Dental', counts: [1, 0], total: 1 },
      { referringDentistId: null, name: 'No referring dentist', counts: [0, 1], total: 1 },
    ],
    byLevel: [
      { level: 'low', count: 3, share: 3 / 7 },
      { level: 'moderate', count: 2, share: 2 / 7 },
      { level: 'high', count: 1, share: 1 / 7 },
      { level: 'untriaged', count: 1, share: 1 / 7 },
    ],
    leadTime: { referrals: 5, medianDays: 12, p90Days: 27 },
    waiting: { count: 4, medianDays: 9, oldestDays: 31, byStatus: [{ status: 'received', count: 1 }, { status: 'triaged', count: 1 }, { status: 'planned', count: 2 }] },
  };
}

export function accuracyReport(): EstimateAccuracyReport {
  return {
    range: RANGE,
    byLevel: [
      { level: 'low', visits: 20, beforeMae: 9.4, afterMae: 5.1 },
      { level: 'moderate', visits: 12, beforeMae: 16.2, afterMae: 9.84 },
      { level: 'high', visits: 6, beforeMae: 27.5, afterMae: 13 },
    ],
    byOperator: [
      { operatorId: 5, operatorName: 'Dr. Test Endodontist', visits: 22, beforeMae: 14, afterMae: 7.2 },
      { operatorId: 6, operatorName: 'Dr. Second Endodontist', visits: 16, beforeMae: 13.1, afterMae: 8 },
    ],
    totals: { visits: 38, beforeMae: 13.62, afterMae: 7.56 },
    // Oct 29, 2026 is still on daylight time in New York: 21:00Z closes at 17:00, 21:25Z is 17:25 on the wall clock.
    overrunDays: [{ date: '2026-10-29', chairId: 1, chairName: 'Chair 1', closesAt: '2026-10-29T21:00:00.000Z', lastEndAt: '2026-10-29T21:25:00.000Z', overrunMinutes: 25 }],
    byMonth: [
      { month: '2026-10', visits: 20, beforeMae: 14.1, afterMae: 8.3 },
      { month: '2026-11', visits: 18, beforeMae: 13.1, afterMae: 6.7 },
    ],
  };
}

export function backlogReport(over: Partial<BacklogReport> = {}): BacklogReport {
  return {
    range: RANGE,
    horizon: { from: '2026-12-03', to: '2027-02-24', weeks: 12 },
    freeChairMinutesPerWeek: 1200,
    openChairMinutesPerWeek: 6000,
    freeOperatorMinutesPerWeek: 1500,
    capacityMinutesPerWeek: 1200,
    averageMinutesByLevel: [
      { level: 'low', minutes: 75, basis: 'visits' },
      { level: 'moderate', minutes: 110, basis: 'visits' },
      { level: 'high', minutes: 190, basis: 'estimate_table' },
      { level: 'untriaged', minutes: 100, basis: 'estimate_table' },
    ],
    rows: [
      { locationId: 1, locationName: 'Harbour Street', level: 'low', cases: 4, minutes: 300, weeksOfBacklog: 300 / 1200 },
      { locationId: 1, locationName: 'Harbour Street', level: 'moderate', cases: 3, minutes: 330, weeksOfBacklog: 330 / 1200 },
      { locationId: 1, locationName: 'Harbour Street', level: 'high', cases: 2, minutes: 380, weeksOfBacklog: 380 / 1200 },
      { locationId: 2, locationName: 'Mill Lane', level: 'untriaged', cases: 1, minutes: 100, weeksOfBacklog: 100 / 1200 },
    ],
    totals: { cases: 10, minutes: 1110, weeksOfBacklog: 1110 / 1200 },
    leadTimeWeeks: 1.2,
    noOpenTime: false,
    limitedBy: 'chairs',
    ...over,
  };
}

/** One chair day (480 min) more per week: 1680 minutes of capacity a week for the same 1110 minutes of cases. */
export function whatIfResponse(): BacklogWhatIfResponse {
  const before = backlogReport();
  const after = backlogReport({
    freeChairMinutesPerWeek: 1680,
    openChairMinutesPerWeek: 6480,
    // A chair day comes with an endodontist to work it.
    freeOperatorMinutesPerWeek: 1980,
    capacityMinutesPerWeek: 1680,
    rows: before.rows.map((r) => ({ ...r, weeksOfBacklog: r.minutes / 1680 })),
    totals: { cases: 10, minutes: 1110, weeksOfBacklog: 1110 / 1680 },
    leadTimeWeeks: 0.9,
  });
  return { before, after, change: { weeksOfBacklog: 1110 / 1680 - 1110 / 1200, leadTimeWeeks: 0.9 - 1.2 }, assumptions: { chairDayMinutes: 480, operatorDayMinutes: 450, horizonWeeks: 12 } };
}

/** Taking five chair days away leaves no free chair time at all. */
export function noOpenTimeResponse(): BacklogWhatIfResponse {
  const before = backlogReport();
  const after = backlogReport({
    freeChairMinutesPerWeek: 0,
    openChairMinutesPerWeek: 3600,
    freeOperatorMinutesPerWeek: 0,
    capacityMinutesPerWeek: 0,
    rows: before.rows.map((r) => ({ ...r, weeksOfBacklog: null })),
    totals: { cases: 10, minutes: 1110, weeksOfBacklog: null },
    leadTimeWeeks: null,
    noOpenTime: true,
  });
  return { before, after, change: { weeksOfBacklog: null, leadTimeWeeks: null }, assumptions: { chairDayMinutes: 480, operatorDayMinutes: 450, horizonWeeks: 12 } };
}

export const PRACTICE: PracticeSummary = { id: 1, name: 'Example Endodontics', phone: null, email: null, settings: { toothNotation: 'fdi', bookingGridMinutes: 5, lateCancellationHours: 48 } };

export function signInAs(role: Role) {
  sessionStore.set({ accessToken: 't', user: { id: 9, email: `${role}@example.com`, name: `Test ${role}`, role } });
}
