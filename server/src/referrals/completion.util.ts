import type { AppointmentState, CompletionVisit, OpenVisit, RecallReview } from '@ostium/shared';
import { DateTime } from 'luxon';

/** A visit of the case as completion sees it (any state), with who treated and where. */
export interface CaseVisit {
  appointmentId: number;
  start: Date;
  end: Date;
  state: AppointmentState;
  endodontist: string;
  locationName: string;
  timeZone: string;
}

export interface Readiness {
  visits: CompletionVisit[];
  openVisits: OpenVisit[];
  canComplete: boolean;
  blockedBy: string | null;
  /** Local date of the last dismissed visit; null when none is dismissed. */
  treatmentEndedOn: string | null;
}

// Booked or confirmed visits ahead keep the case open, and so does a patient in the chair right now.
const WAITING: readonly AppointmentState[] = ['booked', 'confirmed'];
const IN_PROGRESS: readonly AppointmentState[] = ['arrived', 'seated'];

const local = (d: Date, zone: string) => DateTime.fromJSDate(d, { zone }).setLocale('en-US');

/**
 * Whether a case's visits are done: at least one dismissed, none booked in the future and none in
 * progress. A booked visit whose time has passed without being marked does not hold the case (it
 * is not listed either); cancelled and no-show visits are ignored.
 */
export function readiness(all: CaseVisit[], now: Date): Readiness {
  const sorted = [...all].sort((a, b) => a.start.getTime() - b.start.getTime() || a.appointmentId - b.appointmentId);
  const done = sorted.filter((v) => v.state === 'dismissed');
  const visits: CompletionVisit[] = done.map((v, i) => {
    const s = local(v.start, v.timeZone);
    return {
      appointmentId: v.appointmentId,
      visitIndex: i,
      date: s.toISODate()!,
      startTime: s.toFormat('HH:mm'),
      endTime: local(v.end, v.timeZone).toFormat('HH:mm'),
      start: v.start.toISOString(),
      end: v.end.toISOString(),
      endodontist: v.endodontist,
      locationName: v.locationName,
    };
  });
  const openVisits: OpenVisit[] = sorted
    .filter((v) => IN_PROGRESS.includes(v.state) || (WAITING.includes(v.state) && v.end.getTime() > now.getTime()))
    .map((v) => {
      const when = local(v.start, v.timeZone).toFormat("ccc d LLL yyyy 'at' HH:mm");
      const what = IN_PROGRESS.includes(v.state) ? `is in progress (${v.state})` : `is still ${v.state}`;
      return { appointmentId: v.appointmentId, visitIndex: sorted.indexOf(v), state: v.state, start: v.start.toISOString(), description: `the visit on ${when} ${what}` };
    });
  let blockedBy: string | null = null;
  if (openVisits.length) {
    blockedBy = `The case still has ${openVisits.length === 1 ? 'an open visit' : `${openVisits.length} open visits`}: ${openVisits.map((o) => o.description).join('; ')}`;
  } else if (!visits.length) {
    blockedBy = 'No visit of this case has been dismissed yet; complete the case after its last visit';
  }
  return { visits, openVisits, canComplete: blockedBy === null, blockedBy, treatmentEndedOn: visits.length ? visits[visits.length - 1]!.date : null };
}

/** Recall reviews, months after treatment ended, each with its due date (month ends clamp: 31 Aug + 6 → 28/29 Feb). */
export function recallDates(treatmentEndedOn: string, months: number[]): RecallReview[] {
  const end = DateTime.fromISO(treatmentEndedOn, { zone: 'utc' });
  return [...new Set(months)].sort((a, b) => a - b).map((m) => ({ months: m, dueOn: end.plus({ months: m }).toISODate()! }));
}
