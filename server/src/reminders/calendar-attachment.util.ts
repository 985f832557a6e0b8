// The visit(s) of a booking as an iCalendar file for the patient's own calendar (RFC 5545, written by
// ical-generator): METHOD:PUBLISH, one VEVENT per visit with UID, DTSTAMP and UTC start/end. Only what
// confirms the appointment (HHS FAQ 198): the practice, the place and the time — no tooth, no procedure.
import ical, { ICalCalendarMethod } from 'ical-generator';
import type { OutgoingAttachment } from '../messaging/composer.types.js';

export interface CalendarVisit {
  appointmentId: number;
  /** The appointment's version, so a later file for the same visit supersedes this one (RFC 5545 SEQUENCE). */
  version: number;
  start: Date;
  end: Date;
  locationName: string;
  address: string | null;
}

export interface VisitCalendarInput {
  practiceName: string;
  practicePhone: string | null;
  /** The host part of the UIDs (the configured public URL's host). */
  host: string;
  visits: CalendarVisit[];
  /** DTSTAMP: when the file was made. */
  now: Date;
}

export const visitUid = (appointmentId: number, host: string) => `visit-${appointmentId}@${host}`;

export function visitCalendar(input: VisitCalendarInput): string {
  if (!input.visits.length) throw new RangeError('a calendar file needs at least one visit');
  const cal = ical({
    prodId: { company: 'Ostium', product: 'Visit reminder', language: 'EN' },
    method: ICalCalendarMethod.PUBLISH,
    name: input.practiceName,
  });
  for (const v of input.visits) {
    cal.createEvent({
      id: visitUid(v.appointmentId, input.host),
      sequence: Math.max(0, v.version - 1),
      stamp: input.now,
      start: v.start,
      end: v.end,
      summary: `Appointment at ${input.practiceName}`,
      location: v.address ? `${input.practiceName}, ${v.locationName}, ${v.address}` : `${input.practiceName}, ${v.locationName}`,
      description: input.practicePhone ? `To change or cancel, call ${input.practicePhone}.` : null,
    });
  }
  return cal.toString();
}

export function visitCalendarAttachment(input: VisitCalendarInput): OutgoingAttachment {
  return { filename: 'visit.ics', contentType: 'text/calendar; charset=utf-8; method=PUBLISH', content: visitCalendar(input) };
}
