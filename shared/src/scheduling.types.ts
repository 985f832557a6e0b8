import type { Level, Procedure, TrayItem } from './estimates.types.js';
import type { LocationSummary, OpeningHours } from './practice.types.js';

export const APPOINTMENT_STATES = ['booked', 'confirmed', 'arrived', 'seated', 'dismissed', 'cancelled', 'no_show'] as const;
export type AppointmentState = (typeof APPOINTMENT_STATES)[number];

// ---------- resources (admin) ----------
export interface WallClockRange {
  start: string; // 'HH:mm' local
  end: string;
}
export interface ClosureInput {
  date: string; // YYYY-MM-DD, local to the location
  reason: string;
}
export interface Closure extends ClosureInput {
  id: number;
  locationId: number;
}
/** POST /api/locations, PATCH /api/locations/:id (admin). */
export interface LocationInput {
  name: string;
  address?: string | null;
  phone?: string | null;
  timeZone: string; // IANA name
  openingHours: OpeningHours;
}
/** A location as the scheduling screens read it: chairs, microscopes and closures. */
export interface LocationResource extends LocationSummary {
  closures: Closure[];
}
export interface ChairInput {
  name: string;
  fixedMicroscopeId?: number | null;
  active?: boolean;
}
export interface MicroscopeInput {
  name: string;
  mobile: boolean;
  active?: boolean;
}
/** POST /api/operators/:id/feed-token: the private feed address (shown once; a new call replaces it). */
export interface FeedTokenResponse {
  url: string;
}
/** An operator's recurring working block at one location (RFC 5545 RRULE, e.g. FREQ=WEEKLY;BYDAY=MO,WE). */
export interface WorkingRuleInput {
  locationId: number;
  rrule: string;
  start: string; // 'HH:mm'
  end: string;
  breaks?: WallClockRange[]; // e.g. lunch 12:00–12:45
}
export interface WorkingRule extends WorkingRuleInput {
  id: number;
  operatorId: number;
}
export interface TimeOffInput {
  start: string; // ISO instant
  end: string;
  reason?: string;
}
export interface TimeOff extends TimeOffInput {
  id: number;
  operatorId: number;
}
/** A recurring block kept for emergencies; only urgent cases take it before it opens. */
export interface HoldInput {
  operatorId: number;
  locationId: number;
  rrule: string;
  start: string;
  end: string;
  opensEveningBeforeAt?: string; // default '18:00' local the day before
}
export interface Hold extends HoldInput {
  id: number;
}
export interface OperatorSchedule {
  operatorId: number;
  name: string;
  workingRules: WorkingRule[];
  timeOff: TimeOff[];
  holds: Hold[];
}
/** GET /api/scheduling/resources: everything the booking screens need to draw the practice. */
export interface SchedulingResourcesView {
  locations: LocationResource[];
  operators: OperatorSchedule[];
}

// ---------- time finder ----------
export interface TimeFinderPlanVisit {
  minutes: number;
  needsMicroscope: boolean;
  earliestDaysAfterPrevious?: number;
  latestDaysAfterPrevious?: number;
}
/** POST /api/time-finder: a case (its estimate or override sets the lengths) or an explicit plan. */
export interface TimeFinderApiRequest {
  caseId?: number;
  plan?: { visits: TimeFinderPlanVisit[] };
  locationId?: number;
  operatorId?: number;
  from?: string; // ISO; default now
  to?: string; // ISO; default 12 weeks after from
  preferences?: { weekdays?: number[]; partOfDay?: 'morning' | 'afternoon' };
  urgent?: boolean;
  limit?: number;
}
export interface ProposedVisitSlot {
  start: string; // ISO instant
  end: string;
  chairId: number;
  operatorId: number;
  microscopeId?: number;
}
export interface TimeProposal {
  visits: ProposedVisitSlot[];
  gapMinutesLeft: number;
  reasons: string[];
}
export interface TimeFinderApiResponse {
  proposals: TimeProposal[];
  unplaceable?: { reason: string };
}

// ---------- appointments ----------
/** POST /api/appointments (header Idempotency-Key optional): books a whole proposal, all or nothing. */
export interface BookAppointmentsRequest {
  caseId: number;
  visits: ProposedVisitSlot[];
  notes?: string;
}
export interface Appointment {
  id: number;
  version: number;
  seriesId: string;
  visitIndex: number;
  caseId: number;
  referralId: number;
  patient: { id: number; name: string };
  toothFdi: string;
  procedure: Procedure;
  level: Level | null;
  start: string;
  end: string;
  turnoverMinutes: number;
  chairId: number;
  locationId: number;
  operatorId: number;
  microscopeId: number | null;
  state: AppointmentState;
  confirmedAt: string | null;
  confirmedVia: string | null;
  cancellation: { byName: string | null; reason: string; at: string; noticeHours: number } | null;
  seatedAt: string | null;
  dismissedAt: string | null;
  notes: string | null;
}
export interface BookAppointmentsResponse {
  appointments: Appointment[];
}
/** PATCH /api/appointments/:id — moves, resizes and state changes all carry the version that was read. */
export interface UpdateAppointmentRequest {
  version: number;
  start?: string;
  end?: string;
  chairId?: number;
  operatorId?: number;
  microscopeId?: number | null;
  state?: AppointmentState;
  reason?: string; // required for cancelled
}
export interface BookingConflict {
  visitIndex: number;
  resource: 'chair' | 'operator' | 'microscope';
  resourceId: number;
  appointmentId: number;
  start: string;
  end: string;
}
/** 409 body of a booking or a move that collides (or is stale: then `conflicts` is empty). */
export interface BookingConflictBody {
  statusCode: 409;
  message: string;
  conflicts: BookingConflict[];
}
export interface AppointmentQuery {
  from: string;
  to: string;
  locationId?: number;
  chairId?: number;
  operatorId?: number;
  /** Also cancelled and no-show appointments (default: only those holding their time). */
  includeCancelled?: boolean;
}

// ---------- chairside list ----------
export interface ChairsideVisit extends Appointment {
  minutes: number;
  needsMicroscope: boolean;
  trayList: TrayItem[];
}
export interface ChairsideChair {
  chairId: number;
  chairName: string;
  visits: ChairsideVisit[];
}
export interface ChairsideDay {
  date: string;
  locationId: number;
  chairs: ChairsideChair[];
}

// ---------- waitlist ----------
export interface WaitlistEntryInput {
  caseId: number;
  earliest?: string; // YYYY-MM-DD
  notes?: string;
}
export interface WaitlistEntry extends WaitlistEntryInput {
  id: number;
  patient: { id: number; name: string };
  toothFdi: string;
  minutesPerVisit: number[];
  needsMicroscope: boolean;
  createdAt: string;
  /** Only in GET /api/waitlist/fits: where the first visit would go in the freed time. */
  fit?: ProposedVisitSlot;
}

/** How a visit's confirmation came in, in the front desk's words (appointments.confirmed_via). */
export const CONFIRMED_VIA_LABELS: Record<string, string> = { sms: 'text reply', link: 'the visit page link', desk: 'the front desk', email: 'e-mail' };
export const confirmedViaLabel = (via: string) => CONFIRMED_VIA_LABELS[via] ?? via;
