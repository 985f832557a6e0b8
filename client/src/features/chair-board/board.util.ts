import {
  formatTooth,
  type Appointment,
  type AppointmentState,
  type BookingConflict,
  type BookingConflictBody,
  type ChairSummary,
  type LocationSummary,
  type MicroscopeSummary,
  type OpeningHours,
  type ToothNotation,
  type UpdateAppointmentRequest,
} from '@ostium/shared';
import { DateTime } from 'luxon';
import { ApiError } from '../../lib/api-client';
import { PROCEDURE_LABELS } from '../case-sheet/case-sheet.util';

/** What the board needs to name things: the practice's tooth notation and the resources by id. */
export interface BoardLookup {
  notation: ToothNotation;
  timeZone: string;
  chairs: Map<number, ChairSummary>;
  microscopes: Map<number, MicroscopeSummary>;
  operators: Map<number, string>;
  /** Appointments already on screen, to name the one a conflict collides with. */
  appointments: Map<number, Appointment>;
}

export function makeLookup(opts: { notation: ToothNotation; locations: LocationSummary[]; operators: { id: number; name: string }[]; appointments?: Appointment[]; timeZone?: string }): BoardLookup {
  const chairs = new Map<number, ChairSummary>();
  const microscopes = new Map<number, MicroscopeSummary>();
  for (const l of opts.locations) {
    l.chairs.forEach((c) => chairs.set(c.id, c));
    l.microscopes.forEach((m) => microscopes.set(m.id, m));
  }
  return {
    notation: opts.notation,
    timeZone: opts.timeZone ?? opts.locations[0]?.timeZone ?? 'UTC',
    chairs,
    microscopes,
    operators: new Map(opts.operators.map((o) => [o.id, o.name])),
    appointments: new Map((opts.appointments ?? []).map((a) => [a.id, a])),
  };
}

export const STATE_LABELS: Record<AppointmentState, string> = {
  booked: 'Unconfirmed',
  confirmed: 'Confirmed',
  arrived: 'Arrived',
  seated: 'Seated',
  dismissed: 'Dismissed',
  cancelled: 'Cancelled',
  no_show: 'No-show',
};

/** The changes the details drawer offers from each state (design/scheduling.md, "Appointment states"). */
export const NEXT_STATES: Record<AppointmentState, AppointmentState[]> = {
  booked: ['confirmed', 'arrived', 'cancelled', 'no_show'],
  confirmed: ['arrived', 'cancelled', 'no_show'],
  arrived: ['seated', 'cancelled'],
  seated: ['dismissed'],
  dismissed: [],
  cancelled: [],
  no_show: [],
};

export const ACTION_LABELS: Record<AppointmentState, string> = {
  booked: 'Mark unconfirmed',
  confirmed: 'Confirm',
  arrived: 'Arrived',
  seated: 'Seated',
  dismissed: 'Dismissed',
  cancelled: 'Cancel visit',
  no_show: 'No-show',
};

/** Only visits that have not started may be dragged; once the patient is in, times are recorded, not moved. */
export const isMovable = (a: Appointment) => a.state === 'booked' || a.state === 'confirmed';
/** Cancelled visits free their time, so the board leaves them out. */
export const isShownOnBoard = (a: Appointment) => a.state !== 'cancelled';

export const localTime = (iso: string, zone: string) => DateTime.fromISO(iso, { zone }).toFormat('HH:mm');
export const localDate = (iso: string, zone: string) => DateTime.fromISO(iso, { zone }).toISODate()!;
export const localDay = (iso: string, zone: string) => DateTime.fromISO(iso, { zone }).toFormat('ccc d LLL yyyy');

/** Today in the location's zone, as YYYY-MM-DD. */
export const todayIn = (zone: string) => DateTime.now().setZone(zone).toISODate()!;

export const shiftDate = (date: string, days: number) => DateTime.fromISO(date).plus({ days }).toISODate()!;

/** The local day as a UTC query window; luxon keeps it right on a 23- or 25-hour daylight-saving day. */
export function dayWindow(date: string, zone: string): { from: string; to: string } {
  const start = DateTime.fromISO(date, { zone }).startOf('day');
  return { from: start.toUTC().toISO()!, to: start.plus({ days: 1 }).toUTC().toISO()! };
}

/** The ISO week (Monday first) around `date`, in the location's zone. */
export function weekWindow(date: string, zone: string): { from: string; to: string; monday: string } {
  const start = DateTime.fromISO(date, { zone }).startOf('week');
  return { from: start.toUTC().toISO()!, to: start.plus({ weeks: 1 }).toUTC().toISO()!, monday: start.toISODate()! };
}

/** Visible hours of a day grid: the location's opening hours that day, widened to whole hours; 07–19 when closed. */
export function gridHours(hours: OpeningHours, date: string, weekOnly = false): { min: string; max: string } {
  const weekday = DateTime.fromISO(date).weekday;
  const rows = weekOnly ? hours : hours.filter((h) => h.weekday === weekday);
  if (rows.length === 0) return { min: '07:00', max: '19:00' };
  const open = rows.map((r) => r.open).sort()[0]!;
  const close = rows.map((r) => r.close).sort().at(-1)!;
  const floorHour = (t: string) => `${t.slice(0, 2)}:00`;
  const ceilHour = (t: string) => (t.endsWith(':00') ? t : `${String(Number(t.slice(0, 2)) + 1).padStart(2, '0')}:00`);
  return { min: floorHour(open), max: ceilHour(close) };
}

export const minutesBetween = (start: string, end: string) => Math.round((Date.parse(end) - Date.parse(start)) / 60_000);

const toothText = (a: Appointment, notation: ToothNotation) => {
  try {
    return formatTooth(a.toothFdi, notation);
  } catch {
    return a.toothFdi;
  }
};

/** Short block text: "Robin Example · 19". */
export const blockTitle = (a: Appointment, notation: ToothNotation) => `${a.patient.name} · ${toothText(a, notation)}`;

/** The accessible name of a block: everything a sighted user reads off it, in one sentence. */
export function blockLabel(a: Appointment, lookup: BoardLookup): string {
  const chair = lookup.chairs.get(a.chairId)?.name ?? `chair ${a.chairId}`;
  const parts = [
    a.patient.name,
    `tooth ${toothText(a, lookup.notation)}`,
    PROCEDURE_LABELS[a.procedure],
    `${localTime(a.start, lookup.timeZone)} to ${localTime(a.end, lookup.timeZone)}`,
    chair,
    STATE_LABELS[a.state].toLowerCase(),
  ];
  if (a.level) parts.push(`difficulty ${a.level}`);
  if (a.microscopeId !== null) parts.push('microscope');
  return parts.join(', ');
}

/**
 * Block colours per state, from our palette. Unconfirmed is a pale block with a dashed edge and confirmed a
 * solid teal one; the block also names its state and carries its own icon, so colour is never the only cue.
 */
export const STATE_COLOURS: Record<AppointmentState, { color: string; contrast: string }> = {
  booked: { color: 'var(--mantine-color-stone-1)', contrast: 'var(--mantine-color-stone-9)' },
  confirmed: { color: 'var(--mantine-color-lagoon-8)', contrast: '#fffdfa' },
  arrived: { color: 'var(--mantine-color-amber-2)', contrast: 'var(--mantine-color-stone-9)' },
  seated: { color: 'var(--mantine-color-lagoon-5)', contrast: '#fffdfa' },
  dismissed: { color: 'var(--mantine-color-stone-3)', contrast: 'var(--mantine-color-stone-8)' },
  cancelled: { color: 'var(--mantine-color-stone-2)', contrast: 'var(--mantine-color-stone-7)' },
  no_show: { color: 'var(--mantine-color-plum-1)', contrast: 'var(--mantine-color-plum-9)' },
};

/** A FullCalendar event for one appointment; the appointment rides along for the block renderer. */
export function toCalendarEvent(a: Appointment) {
  const movable = isMovable(a);
  return {
    id: String(a.id),
    title: a.patient.name,
    start: a.start,
    end: a.end,
    startEditable: movable,
    durationEditable: movable,
    color: STATE_COLOURS[a.state].color,
    contrastColor: STATE_COLOURS[a.state].contrast,
    className: `ostium-block ostium-block--${a.state}`,
    extendedProps: { appointment: a },
  };
}

/** The PATCH body for a move, a resize or a chair change: only what changed, always with the version read. */
export function changeRequest(a: Appointment, next: { start?: string; end?: string; chairId?: number }, lookup?: Pick<BoardLookup, 'chairs'>): UpdateAppointmentRequest {
  const body: UpdateAppointmentRequest = { version: a.version };
  if (next.start && Date.parse(next.start) !== Date.parse(a.start)) body.start = new Date(next.start).toISOString();
  if (next.end && Date.parse(next.end) !== Date.parse(a.end)) body.end = new Date(next.end).toISOString();
  if (next.chairId !== undefined && next.chairId !== a.chairId) {
    body.chairId = next.chairId;
    // A microscope bolted to the new chair goes with the visit; a mobile one stays as it was.
    const fixed = lookup?.chairs.get(next.chairId)?.fixedMicroscopeId ?? null;
    if (a.microscopeId !== null && fixed !== null) body.microscopeId = fixed;
  }
  return body;
}

const RESOURCE_WORD: Record<BookingConflict['resource'], string> = { chair: 'Chair', operator: 'Endodontist', microscope: 'Microscope' };

/** "Chair 2 is taken 10:00–11:00 by Sam Example (visit #9)", in the location's time. */
export function describeConflict(c: BookingConflict, lookup: BoardLookup): string {
  const name =
    c.resource === 'chair'
      ? lookup.chairs.get(c.resourceId)?.name
      : c.resource === 'microscope'
        ? lookup.microscopes.get(c.resourceId)?.name
        : lookup.operators.get(c.resourceId);
  const who = lookup.appointments.get(c.appointmentId)?.patient.name;
  const word = RESOURCE_WORD[c.resource];
  // "Chair 2", not "Chair Chair 2"; a person's name stands alone.
  const what = !name ? `${word} #${c.resourceId}` : c.resource === 'operator' || name.toLowerCase().includes(word.toLowerCase()) ? name : `${word} ${name}`;
  return `${what} is taken ${localTime(c.start, lookup.timeZone)}–${localTime(c.end, lookup.timeZone)} by ${who ? `${who} (visit #${c.appointmentId})` : `visit #${c.appointmentId}`}`;
}

/** The 409 body of a refused booking or move, when the error is one. */
export function conflictBody(e: unknown): BookingConflictBody | null {
  if (!(e instanceof ApiError) || e.status !== 409) return null;
  const body = (e.body ?? {}) as Partial<BookingConflictBody>;
  return { statusCode: 409, message: body.message ?? e.message, conflicts: Array.isArray(body.conflicts) ? body.conflicts : [] };
}

/** What the board says when the server refuses a change: the reason, and each conflict by name. */
export interface ChangeProblem {
  title: string;
  message: string;
  conflicts: string[];
}

export function problemFrom(e: unknown, lookup: BoardLookup): ChangeProblem {
  const c = conflictBody(e);
  if (c) {
    return c.conflicts.length
      ? { title: 'Not moved: the time is taken', message: c.message, conflicts: c.conflicts.map((x) => describeConflict(x, lookup)) }
      : { title: 'Not changed: someone else changed this visit first', message: c.message, conflicts: [] };
  }
  return { title: 'Not changed', message: e instanceof Error ? e.message : 'The change could not be saved', conflicts: [] };
}
