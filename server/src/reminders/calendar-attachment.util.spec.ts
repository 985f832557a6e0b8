// The booking e-mail's calendar file, read back with ical.js (the reference reader named in
// references.md "Calendars"); structural checks per RFC 5545 §3.1 (CRLF, folding at 75 octets),
// §3.7.3–3.7.4 (one VERSION:2.0, one PRODID), §3.6.1 (one UID and one DTSTAMP per VEVENT), §3.7.2 (METHOD).
import ICAL from 'ical.js';
import { describe, expect, it } from 'vitest';
import { visitCalendar, visitCalendarAttachment } from './calendar-attachment.util.js';

const input = {
  practiceName: 'Quillfern Endodontics',
  practicePhone: '+1 202-555-0100',
  host: 'ostium.example.com',
  now: new Date('2026-11-30T15:04:05Z'),
  visits: [
    { appointmentId: 41, version: 1, start: new Date('2026-12-03T14:00:00Z'), end: new Date('2026-12-03T15:30:00Z'), locationName: 'Riverside', address: '14 Tannery Lane, Riverside Park, NY 10000' },
    { appointmentId: 42, version: 3, start: new Date('2026-12-10T19:15:00Z'), end: new Date('2026-12-10T20:00:00Z'), locationName: 'Hilltop', address: null },
  ],
};

describe('visitCalendar', () => {
  const text = visitCalendar(input);
  const lines = text.split('\r\n').filter((l) => l.length > 0);

  it('is RFC 5545 text: CRLF only, folded lines, one VERSION:2.0 and one PRODID, METHOD:PUBLISH', () => {
    expect(/[^\r]\n/.test(text)).toBe(false);
    for (const line of lines) expect(Buffer.byteLength(line, 'utf8')).toBeLessThanOrEqual(75);
    expect(lines.filter((l) => l.startsWith('VERSION:'))).toEqual(['VERSION:2.0']);
    expect(lines.filter((l) => l.startsWith('PRODID:'))).toHaveLength(1);
    expect(lines.filter((l) => l.startsWith('METHOD:'))).toEqual(['METHOD:PUBLISH']);
  });

  it('parses with ical.js: one event per visit with UID, DTSTAMP and UTC start/end', () => {
    const cal = new ICAL.Component(ICAL.parse(text));
    expect(cal.getFirstPropertyValue('version')).toBe('2.0');
    expect(cal.getFirstPropertyValue('method')).toBe('PUBLISH');
    const events = cal.getAllSubcomponents('vevent');
    expect(events).toHaveLength(2);
    for (const e of events) {
      expect(e.getAllProperties('uid')).toHaveLength(1);
      expect(e.getAllProperties('dtstamp')).toHaveLength(1);
      expect((e.getFirstPropertyValue('dtstamp') as ICAL.Time).toJSDate().toISOString()).toBe('2026-11-30T15:04:05.000Z');
      expect((e.getFirstPropertyValue('dtstart') as ICAL.Time).zone?.tzid).toBe('UTC');
      expect((e.getFirstPropertyValue('dtend') as ICAL.Time).zone?.tzid).toBe('UTC');
    }
    const [a, b] = events.map((e) => new ICAL.Event(e));
    expect(a!.uid).toBe('visit-41@ostium.example.com');
    expect(a!.startDate.toJSDate().toISOString()).toBe('2026-12-03T14:00:00.000Z');
    expect(a!.endDate.toJSDate().toISOString()).toBe('2026-12-03T15:30:00.000Z');
    expect(a!.summary).toBe('Appointment at Quillfern Endodontics');
    // TEXT escapes (RFC 5545 §3.3.11) come back as plain commas.
    expect(a!.location).toBe('Quillfern Endodontics, Riverside, 14 Tannery Lane, Riverside Park, NY 10000');
    expect(a!.description).toBe('To change or cancel, call +1 202-555-0100.');
    expect(a!.sequence).toBe(0);
    expect(b!.location).toBe('Quillfern Endodontics, Hilltop');
    expect(b!.sequence).toBe(2);
  });

  it('carries no clinical detail', () => {
    expect(text).not.toMatch(/tooth|canal|root|surgery|retreat|procedure|difficulty/i);
  });

  it('is attached as text/calendar and refuses an empty series', () => {
    const a = visitCalendarAttachment(input);
    expect(a.filename).toBe('visit.ics');
    expect(a.contentType).toMatch(/^text\/calendar/);
    expect(() => visitCalendar({ ...input, visits: [] })).toThrow(/at least one visit/);
  });
});
