// Types of the pure time finder: resources, busy intervals, request and result.
// All instants are epoch milliseconds (UTC); wall-clock values are 'HH:mm' readings in a location's IANA zone.

/** Half-open instant interval [start, end) in epoch ms UTC. */
export interface Interval {
  start: number;
  end: number;
}

/** 1 = Monday … 7 = Sunday (ISO 8601 / luxon numbering). */
export type IsoWeekday = 1 | 2 | 3 | 4 | 5 | 6 | 7;

/** Wall-clock range on one local date, 'HH:mm'–'HH:mm' (end may be '24:00'); end must be after start. */
export interface LocalRange {
  startLocal: string;
  endLocal: string;
}

/** Weekly opening hours: the wall-clock ranges of each weekday (missing weekday = closed). */
export type OpeningHours = Partial<Record<IsoWeekday, readonly LocalRange[]>>;

/** A whole local day on which the location is shut. */
export interface Closure {
  /** Local calendar date 'YYYY-MM-DD' in the location's zone. */
  date: string;
  reason: string;
}

export interface Location {
  id: string;
  /** IANA zone name, e.g. 'America/New_York'. */
  timeZone: string;
  openingHours: OpeningHours;
  closures: readonly Closure[];
}

export interface Chair {
  id: string;
  /** What the explanations call it (else "chair <id>"). */
  name?: string;
  locationId: string;
  fixedMicroscopeId?: string;
}

export interface Microscope {
  id: string;
  /** What the explanations call it (else "microscope <id>"). */
  name?: string;
  locationId: string;
  /** Mobile microscopes serve any chair of their location; fixed ones only their chair. */
  mobile: boolean;
  /** The chair a fixed microscope is mounted on. */
  chairId?: string;
}

/**
 * A recurring working block of an operator at one location.
 * rrule is an RFC 5545 RRULE value ('FREQ=WEEKLY;BYDAY=MO,WE'); only the dates it yields are used, the
 * times come from startLocal/endLocal. Without a DTSTART line the rule is anchored at the request's
 * `from` date, so rules with INTERVAL>1 should carry a DTSTART (read as a local date).
 */
export interface WorkingRule {
  locationId: string;
  rrule: string;
  startLocal: string;
  endLocal: string;
  breaks?: readonly LocalRange[];
}

export interface Operator {
  id: string;
  name: string;
  workingRules: readonly WorkingRule[];
  timeOff: readonly Interval[];
}

/**
 * A recurring emergency hold of an operator (times in the hold location's zone). An occurrence blocks the
 * operator for non-urgent cases until it opens: `opensHoursBefore` hours before its start, or, when that is
 * absent, at `opensEveningBeforeAt` (default '18:00') local time on the previous day.
 */
export interface Hold {
  operatorId: string;
  locationId: string;
  rrule: string;
  startLocal: string;
  endLocal: string;
  opensHoursBefore?: number;
  opensEveningBeforeAt?: string;
}

export interface SchedulingResources {
  locations: readonly Location[];
  chairs: readonly Chair[];
  microscopes: readonly Microscope[];
  operators: readonly Operator[];
  holds: readonly Hold[];
}

/** Resource id → busy intervals (any order; overlaps allowed). */
export type BusyMap = Readonly<Record<string, readonly Interval[] | undefined>>;

export interface BusyIntervals {
  /** Chair busy intervals already include each booking's turnover. */
  chairs: BusyMap;
  operators: BusyMap;
  microscopes: BusyMap;
}

export interface PlannedVisit {
  minutes: number;
  needsMicroscope: boolean;
  /** Local calendar days after the previous visit's date (ignored for the first visit); default 0. */
  earliestDaysAfterPrevious?: number;
  /** Local calendar days after the previous visit's date; default: up to the end of the horizon. */
  latestDaysAfterPrevious?: number;
}

export interface VisitPlan {
  visits: readonly PlannedVisit[];
}

/** Morning = local start before 12:00, afternoon = from 12:00. */
export type PartOfDay = 'morning' | 'afternoon';

export interface PatientPreferences {
  weekdays?: readonly IsoWeekday[];
  partOfDay?: PartOfDay;
}

export interface TimeFinderRequest {
  plan: VisitPlan;
  /** Chair cleaning/setup after each new visit; default 10. */
  turnoverMinutes?: number;
  /** Horizon [from, to): every visit lies inside it. */
  from: number;
  to: number;
  /** The moment of the search: holds open relative to it and no slot starts before it. */
  now: number;
  /** Restrict to one location (default: any). */
  locationId?: string;
  /** Restrict to one operator (default: any). */
  operatorId?: string;
  /** The operator the patient saw before: preferred on ties (operator continuity). */
  previousOperatorId?: string;
  preferences?: PatientPreferences;
  /** Urgent cases may take emergency holds before they open. */
  urgent?: boolean;
  /** Maximum number of proposals; default 5. */
  limit?: number;
  /** Candidate starts lie on this grid of local wall-clock minutes after midnight; default 5. */
  gridMinutes?: number;
  /** Later visits with the first visit's operator; default true. */
  sameOperator?: boolean;
  /** A leftover chair gap shorter than this cannot hold another visit; default 30. */
  minUsefulGapMinutes?: number;
}

export interface ProposedVisit {
  start: number;
  end: number;
  chairId: string;
  operatorId: string;
  microscopeId?: string;
}

export interface Proposal {
  visits: ProposedVisit[];
  /** Smallest idle chair gap (minutes) the series leaves next to its visits; 0 = flush on every side. */
  gapMinutesLeft: number;
  /** Why the proposal is here and ranked where it is. */
  reasons: string[];
  /** Tie-break quality 0–100 (preferences 40, continuity 20, fit 40); the list is ordered by start. */
  score: number;
}

export type UnplaceableCode =
  | 'empty-horizon'
  | 'no-location'
  | 'no-opening-hours'
  | 'location-closed'
  | 'no-operator'
  | 'no-operator-working'
  | 'outside-opening-hours'
  | 'operator-off'
  | 'operator-fully-booked'
  | 'only-holds-left'
  | 'no-chair-free'
  | 'no-microscope'
  | 'no-microscope-free'
  | 'no-stretch-long-enough'
  | 'no-time-between-visits'
  | 'interval-past-horizon';

export interface Unplaceable {
  /** What is missing, in words. */
  reason: string;
  code: UnplaceableCode;
  /** 0-based index of the visit that could not be placed. */
  visitIndex: number;
}

export interface TimeFinderResult {
  proposals: Proposal[];
  unplaceable?: Unplaceable;
}
