// The manager's reports (Chair use page). Every figure's definition lives in REPORT_DEFINITIONS, which
// the server computes by, the client shows on hover and docs/reports.md quotes (a test checks all three).
import type { Level as DifficultyLevel } from './estimates.types.js';

/** Query of every GET /api/reports/* route. Dates are local calendar days in each location's zone, inclusive. */
export interface ReportQuery {
  from: string;
  to: string;
  locationId?: number;
  chairId?: number;
  operatorId?: number;
}

export interface ReportRange {
  from: string;
  to: string;
  locationId: number | null;
  chairId: number | null;
  operatorId: number | null;
}

/** A use ratio with its parts; `share` is null when there was no open time ("no open time", never ÷ 0). */
export interface UseFigure {
  openMinutes: number;
  bookedMinutes: number;
  share: number | null;
  /** Actual use, over the days whose visits are done (up to yesterday); null when none are. */
  actualOpenMinutes: number;
  actualMinutes: number;
  actualShare: number | null;
}

export interface ChairUseReport {
  range: ReportRange;
  totals: UseFigure;
  byChair: (UseFigure & { chairId: number; chairName: string; locationId: number; locationName: string })[];
  byLocation: (UseFigure & { locationId: number; locationName: string })[];
  /** One row per local day in the range (closed days have openMinutes 0). */
  byDay: (UseFigure & { date: string })[];
  /** Weeks start on Monday (ISO 8601). */
  byWeek: (UseFigure & { weekStart: string })[];
  /** Weekday 1 = Monday … 7 = Sunday (ISO 8601), local hour 0–23; only cells with open time. */
  heatmap: { weekday: number; hour: number; openMinutes: number; bookedMinutes: number; share: number | null }[];
}

export interface OperatorUseReport {
  range: ReportRange;
  totals: { workingMinutes: number; clinicalMinutes: number; share: number | null };
  byOperator: { operatorId: number; operatorName: string; workingMinutes: number; clinicalMinutes: number; share: number | null }[];
  byWeek: { weekStart: string; operatorId: number; operatorName: string; workingMinutes: number; clinicalMinutes: number; share: number | null }[];
}

export interface AttendanceReport {
  range: ReportRange;
  /** Hours of notice under which a cancellation counts as late (practice setting, default 48). */
  lateCancelNoticeHours: number;
  totals: {
    /** Visits whose start fell in the range, not counting ones cancelled early. */
    visits: number;
    attended: number;
    noShows: number;
    lateCancellations: number;
    earlyCancellations: number;
    sameDayFills: number;
    /** Visits in the range still booked or confirmed (upcoming, or past with no outcome recorded); not in `visits`. */
    open: number;
    /** attended + noShows + lateCancellations = visits; the shares add to 1. */
    attendedShare: number | null;
    noShowShare: number | null;
    lateCancellationShare: number | null;
  };
  /**
   * How the visits that took place or were missed (attended + no-shows) were confirmed, 'unconfirmed' for
   * the rest; the shares add to 1 over those visits, and the four channels' shares add to confirmationRate.
   */
  confirmationByChannel: { channel: 'sms' | 'email' | 'link' | 'desk' | 'unconfirmed'; visits: number; share: number | null }[];
  /** Confirmed visits by how many reminders had gone before the confirmation (0, 1, 2, 3 or more). */
  confirmationByReminders: { reminders: '0' | '1' | '2' | '3+'; visits: number; share: number | null }[];
  confirmationRate: number | null;
}

export interface ReferralsReport {
  range: ReportRange;
  /** Months "YYYY-MM" of the range, in order. */
  months: string[];
  byDentist: { referringDentistId: number | null; name: string; counts: number[]; total: number }[];
  byLevel: { level: DifficultyLevel | 'untriaged'; count: number; share: number | null }[];
  /** Days from received to the first visit's start, for referrals received in the range that have one. */
  leadTime: { referrals: number; medianDays: number | null; p90Days: number | null };
  /** Referrals not yet booked today (received, triaged, planned), with how long each has waited. */
  waiting: { count: number; medianDays: number | null; oldestDays: number | null; byStatus: { status: string; count: number }[] };
}

export interface EstimateAccuracyReport {
  range: ReportRange;
  /** Mean absolute error in minutes per visit, before (table alone) and after calibration. */
  byLevel: { level: DifficultyLevel; visits: number; beforeMae: number | null; afterMae: number | null }[];
  byOperator: { operatorId: number; operatorName: string; visits: number; beforeMae: number | null; afterMae: number | null }[];
  totals: { visits: number; beforeMae: number | null; afterMae: number | null };
  /** A chair's day whose last visit (with turnover) ended after the location's closing time. */
  overrunDays: { date: string; chairId: number; chairName: string; closesAt: string; lastEndAt: string; overrunMinutes: number }[];
  /** The same errors by month of the visit ("YYYY-MM"), in order; months without visits are left out. */
  byMonth: { month: string; visits: number; beforeMae: number | null; afterMae: number | null }[];
}

export interface BacklogRow {
  locationId: number | null;
  locationName: string;
  level: DifficultyLevel | 'untriaged';
  cases: number;
  /** At the practice's average booked minutes for the level (from its own visits), turnover included. */
  minutes: number;
  weeksOfBacklog: number | null;
}

export interface BacklogReport {
  /** The past days the average minutes per level come from (GET from/to, default the last 365 days). */
  range: ReportRange;
  /** The local days (from tomorrow) whose free time the forecast counts. */
  horizon: { from: string; to: string; weeks: number };
  /** Open chair minutes per week still free (open − booked), averaged over the next weeks used. */
  freeChairMinutesPerWeek: number;
  openChairMinutesPerWeek: number;
  /** Working minutes of the endodontists per week still free (working − booked clinical minutes). */
  freeOperatorMinutesPerWeek: number;
  /** What the backlog is divided by: free chair minutes with an endodontist free at the same location and day. */
  capacityMinutesPerWeek: number;
  /** Minutes an average case of each level takes, the figures the backlog is priced at. */
  averageMinutesByLevel: { level: DifficultyLevel | 'untriaged'; minutes: number; basis: 'visits' | 'estimate_table' }[];
  rows: BacklogRow[];
  totals: { cases: number; minutes: number; weeksOfBacklog: number | null };
  /** Expected weeks from now until a newly planned case gets its first visit. */
  leadTimeWeeks: number | null;
  /** Set when there is no free chair time at all: the forecast says so instead of dividing by zero. */
  noOpenTime: boolean;
  /** Operator time is the binding limit when it is below chair time. */
  limitedBy: 'chairs' | 'operators' | 'none';
}

export interface BacklogWhatIfRequest {
  locationId?: number;
  /** The past days the average minutes per level come from (as GET /api/reports/backlog); default the last 365 days. */
  from?: string;
  to?: string;
  /** Chair days to add (positive) or remove (negative) per week; a chair day comes with an endodontist to work it. */
  chairDaysPerWeek: number;
  /** Operator days to add or remove per week: an endodontist's day in chairs that are already open. */
  operatorDaysPerWeek: number;
}

export interface BacklogWhatIfResponse {
  before: BacklogReport;
  after: BacklogReport;
  change: { weeksOfBacklog: number | null; leadTimeWeeks: number | null };
  /** Minutes one chair day and one operator day stand for in this forecast. */
  assumptions: { chairDayMinutes: number; operatorDayMinutes: number; horizonWeeks: number };
}

export type ReportName = 'chair-use' | 'operator-use' | 'attendance' | 'referrals' | 'estimate-accuracy' | 'backlog';

/** The definition behind every figure; the server computes exactly this and docs/reports.md quotes it. */
export const REPORT_DEFINITIONS = {
  chairUse:
    'Booked chair minutes (each visit’s length plus its turnover, clipped to opening hours) ÷ open chair minutes (opening hours minus closures), per chair.',
  actualChairUse:
    'Actual chair minutes (seated → dismissed plus turnover) ÷ open chair minutes, over the days up to yesterday whose visits are done.',
  operatorUse: 'Booked clinical minutes (visit lengths, no turnover) ÷ working minutes (working rules minus breaks and time off).',
  estimateError: 'Mean absolute difference in minutes between a visit’s estimated and its actual length, before and after calibration.',
  overrunDay: 'A chair’s day whose last visit, with its turnover, ended after the location’s closing time.',
  noShow: 'A visit marked no-show.',
  lateCancellation: 'A visit cancelled with less notice than the practice’s late-cancellation notice (default 48 hours).',
  sameDayFill: 'A visit booked on the same local day it takes place, into chair time freed by a cancellation that day.',
  confirmationRate: 'Visits confirmed (by text, e-mail link or the front desk) ÷ visits that took place or were missed.',
  leadTime: 'Days from a referral’s receipt to its first visit; median and 90th percentile (nearest rank).',
  backlog:
    'Cases planned but not booked, and cases still to triage, priced at the practice’s average minutes for their level, ÷ free chair minutes per week (chair time with an endodontist free to work it).',
} as const;
export type ReportDefinitionKey = keyof typeof REPORT_DEFINITIONS;

export const DEFAULT_LATE_CANCEL_NOTICE_HOURS = 48;

/** GET/PUT /api/settings/reports: the practice's late-cancellation notice (practice setting lateCancellationHours). */
export interface ReportSettings {
  lateCancelNoticeHours: number;
}
