// The fixed choices behind the reports' figures. docs/reports.md states each of them and
// definitions.spec.ts checks that the document and these values agree.
import { DEFAULT_LATE_CANCEL_NOTICE_HOURS } from '@ostium/shared';

export { DEFAULT_LATE_CANCEL_NOTICE_HOURS };

/** How percentiles are taken: the nearest-rank method (no interpolation). */
export const PERCENTILE_METHOD = 'nearest-rank' as const;

/** Local hours the heat map may show (0 = 00:00–01:00 … 23 = 23:00–24:00); only cells with open time appear. */
export const HEATMAP_FIRST_HOUR = 0;
export const HEATMAP_LAST_HOUR = 23;

/** Longest report range, in days (from and to both count). */
export const MAX_RANGE_DAYS = 400;

/** The backlog forecast counts the free time of this many weeks from tomorrow. */
export const BACKLOG_HORIZON_WEEKS = 12;

/** Without from/to, the backlog's average minutes per level come from this many days up to yesterday. */
export const BACKLOG_AVERAGE_DAYS = 365;

/** A level's average minutes come from its own booked cases once it has at least this many. */
export const MIN_CASES_FOR_AVERAGE = 5;

/** Confirmed visits are counted by reminders before the confirmation up to this many; more goes to "3+". */
export const REMINDER_BUCKETS = ['0', '1', '2', '3+'] as const;

/** What a chair day or an operator day stands for when the horizon has none to average: 8 hours. */
export const DEFAULT_DAY_MINUTES = 480;
