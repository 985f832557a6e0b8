// The demo history generator on a world shaped like the demo practice: the same seed and day give the
// same months; visits keep the booking guard's rules and the opening hours; the estimate error falls
// after calibration because the hidden paces are learned.
import { DEFAULT_ESTIMATE_TABLE, type Level, type Procedure } from '@ostium/shared';
import { describe, expect, it } from 'vitest';
import { calibrationOptions, estimate } from '../estimates/estimator/index.js';
import { visitErrors } from '../reports/estimate-accuracy.util.js';
import { clockFor, closedDays, openOnDay } from '../reports/report-time.util.js';
import { CALIBRATION_STARTS_WEEK, generateHistory, type HistoryInput } from './demo-history.util.js';

const NY = 'America/New_York';
const weekdays = (days: number[], open: string, close: string) => days.map((weekday) => ({ weekday, open, close }));
const lunch = (start: string, end: string) => [{ startLocal: start, endLocal: end }];

const world = (now: number): HistoryInput => ({
  now,
  weeks: 17,
  seed: 7,
  practiceName: 'Quillfern Endodontics',
  table: DEFAULT_ESTIMATE_TABLE,
  locations: [
    { id: 1, name: 'Riverside', timeZone: NY, openingHours: [...weekdays([1, 2, 3, 4], '08:00', '17:00'), ...weekdays([5], '08:00', '14:00')], closures: ['2026-11-26'] },
    { id: 2, name: 'Hilltop', timeZone: NY, openingHours: [...weekdays([1, 2, 4], '09:00', '18:00'), ...weekdays([6], '09:00', '13:00')], closures: [] },
  ],
  chairs: [
    { id: 11, locationId: 1, fixedMicroscopeId: 91 },
    { id: 12, locationId: 1, fixedMicroscopeId: null },
    { id: 13, locationId: 1, fixedMicroscopeId: null },
    { id: 21, locationId: 2, fixedMicroscopeId: null },
    { id: 22, locationId: 2, fixedMicroscopeId: null },
    { id: 23, locationId: 2, fixedMicroscopeId: null },
  ],
  microscopes: [
    { id: 91, locationId: 1, mobile: false },
    { id: 92, locationId: 2, mobile: true },
  ],
  operators: [
    { id: 101, pace: 1.0, rules: [{ locationId: 1, rrule: 'FREQ=WEEKLY;BYDAY=MO,WE,TH', startLocal: '08:00', endLocal: '16:30', breaks: lunch('12:00', '12:45') }] },
    {
      id: 102,
      pace: 1.25,
      rules: [
        { locationId: 1, rrule: 'FREQ=WEEKLY;BYDAY=TU', startLocal: '08:00', endLocal: '16:30', breaks: lunch('12:00', '12:45') },
        { locationId: 1, rrule: 'FREQ=WEEKLY;BYDAY=FR', startLocal: '08:00', endLocal: '14:00', breaks: [] },
        { locationId: 2, rrule: 'FREQ=WEEKLY;BYDAY=MO,TH', startLocal: '09:00', endLocal: '17:30', breaks: lunch('12:30', '13:15') },
      ],
    },
    { id: 103, pace: 0.9, rules: [{ locationId: 2, rrule: 'FREQ=WEEKLY;BYDAY=MO,TU,TH', startLocal: '09:00', endLocal: '18:00', breaks: lunch('13:00', '13:45') }] },
  ],
  dentistIds: [1, 2, 3, 4, 5, 6, 7],
  tableMinutes: (toothFdi: string, procedure: Procedure, canals: number, level: Level) => {
    const r = estimate({ toothFdi, procedure, canals, assessment: { archPosition: 'low', diagnosis: level } }, DEFAULT_ESTIMATE_TABLE);
    return Math.round(r.totalMinutes / r.visits.length);
  },
});

const NOW = Date.parse('2026-12-02T15:00:00Z');
const h = generateHistory(world(NOW));
const holding = h.appointments.filter((a) => a.state === 'dismissed');

describe('generateHistory', () => {
  it('is deterministic for a seed and a day', () => {
    const again = generateHistory(world(NOW));
    expect(again.appointments).toEqual(h.appointments);
    expect(again.patients).toEqual(h.patients);
    expect(generateHistory({ ...world(NOW), seed: 8 }).appointments).not.toEqual(h.appointments);
  });

  it('fills about four months before the seed day, none of it today or later', () => {
    expect(h.appointments.length).toBeGreaterThan(700);
    const first = Math.min(...h.appointments.map((a) => a.start));
    expect(NOW - first).toBeGreaterThan(16 * 7 * 86_400_000);
    expect(Math.max(...h.appointments.map((a) => a.start))).toBeLessThan(Date.parse('2026-12-02T05:00:00Z'));
  });

  it('never books two visits on one chair (with turnover), one endodontist or one microscope at once', () => {
    const clash = (key: (a: (typeof holding)[number]) => number | null, withTurnover: boolean) => {
      const by = new Map<number, (typeof holding)[number][]>();
      for (const a of holding) {
        const k = key(a);
        if (k !== null) (by.get(k) ?? by.set(k, []).get(k)!).push(a);
      }
      for (const list of by.values()) {
        list.sort((x, y) => x.start - y.start);
        for (let i = 1; i < list.length; i++) {
          const prev = list[i - 1]!;
          if (list[i]!.start < prev.end + (withTurnover ? prev.turnoverMinutes * 60_000 : 0)) return [prev, list[i]];
        }
      }
      return null;
    };
    expect(clash((a) => a.chairId, true)).toBeNull();
    expect(clash((a) => a.operatorId, false)).toBeNull();
    expect(clash((a) => a.microscopeId, false)).toBeNull();
  });

  it('books inside opening hours, with the chair clean by closing; the 5-minute grid', () => {
    const w = world(NOW);
    const span = { first: Math.floor(Math.min(...h.appointments.map((a) => a.start)) / 86_400_000) - 2, last: Math.floor(NOW / 86_400_000) + 2 };
    for (const a of h.appointments) {
      const loc = w.locations.find((l) => l.id === a.locationId)!;
      const clock = clockFor(loc.timeZone, span);
      const open = openOnDay(clock, loc, closedDays(loc), clock.day(a.start));
      expect(open.some((iv) => iv.start <= a.start && a.end + a.turnoverMinutes * 60_000 <= iv.end), JSON.stringify({ ...a, s: new Date(a.start).toISOString(), e: new Date(a.end).toISOString(), open: open.map((o) => [new Date(o.start).toISOString(), new Date(o.end).toISOString()]) })).toBe(true);
      expect(a.start % 300_000).toBe(0);
      expect(a.end % 300_000).toBe(0);
    }
  });

  it('has its no-shows, cancellations, same-day fills and confirmations', () => {
    const share = (s: string) => h.appointments.filter((a) => a.state === s).length / h.appointments.length;
    expect(share('no_show')).toBeGreaterThan(0.03);
    expect(share('no_show')).toBeLessThan(0.07);
    const cancelled = h.appointments.filter((a) => a.state === 'cancelled');
    expect(cancelled.some((a) => a.cancelNoticeHours! < 48)).toBe(true);
    expect(cancelled.some((a) => a.cancelNoticeHours! >= 48)).toBe(true);
    for (const a of cancelled) expect(a.cancelledAt!).toBeLessThan(a.start);
    // A same-day fill: created after a cancellation that day on the same chair, over its time.
    expect(holding.some((f) => cancelled.some((c) => c.chairId === f.chairId && c.start === f.start && c.cancelledAt! <= f.createdAt && f.createdAt > f.start - 86_400_000))).toBe(true);
    for (const via of ['sms', 'link', 'desk']) expect(h.appointments.some((a) => a.confirmedVia === via)).toBe(true);
    for (const a of h.appointments) if (a.confirmedAt !== null) expect(a.confirmedAt).toBeLessThan(a.start);
    // Reminders went out before the visit and after it was booked; a confirmation after the first text counts it.
    for (const r of h.reminders) {
      const a = h.appointments[r.appointment]!;
      expect(r.sentAt).toBeGreaterThan(a.createdAt);
      expect(r.sentAt).toBeLessThan(a.start);
    }
  });

  it('runs some days past closing, fewer once bookings are calibrated', () => {
    const seatedLate = holding.filter((a) => a.dismissedAt! > a.end + 30 * 60_000);
    expect(seatedLate.length).toBeGreaterThan(0);
    for (const a of holding) expect(a.dismissedAt!).toBeGreaterThan(a.seatedAt!);
    const cut = Math.min(...h.appointments.map((a) => a.start)) + CALIBRATION_STARTS_WEEK * 7 * 86_400_000;
    const lateShare = (list: typeof holding) => list.filter((a) => a.dismissedAt! > a.end + 20 * 60_000).length / list.length;
    expect(lateShare(holding.filter((a) => a.start >= cut + 14 * 86_400_000))).toBeLessThan(lateShare(holding.filter((a) => a.start < cut)));
  });

  it('its visits teach the estimates: the error after calibration is smaller than before', () => {
    const visits = h.visits.map((v, i) => ({ ...v, id: i + 1, locationId: null, chairId: null }));
    const errors = visitErrors(visits, calibrationOptions(DEFAULT_ESTIMATE_TABLE));
    const mae = (k: 'before' | 'after') => errors.reduce((s, e) => s + Math.abs(e[k]), 0) / errors.length;
    expect(mae('after')).toBeLessThan(mae('before') * 0.75);
  });

  it('every referral moves forward in time, ends in a real status, and its people are fictional', () => {
    for (const r of h.referrals) {
      for (let i = 1; i < r.events.length; i++) expect(r.events[i]!.at, JSON.stringify(r.events.map((e) => [e.status, new Date(e.at).toISOString()]))).toBeGreaterThanOrEqual(r.events[i - 1]!.at);
      expect(r.events[r.events.length - 1]!.status).toBe(r.status);
      expect(r.events[r.events.length - 1]!.at).toBeLessThanOrEqual(NOW);
    }
    const statuses = new Set(h.referrals.map((r) => r.status));
    for (const s of ['received', 'triaged', 'planned', 'completed', 'report_sent', 'declined', 'cancelled']) expect(statuses, s).toContain(s);
    // One number per patient, so a reply or a STOP belongs to one person.
    expect(new Set(h.patients.map((p) => p.phone)).size).toBe(Math.min(h.patients.length, 1000));
    for (const p of h.patients) {
      expect(p.phone).toMatch(/^\+1[2-9]\d\d555(01\d\d)$/); // references.md: 555-0100…0199 are fictional (in any area code)
      expect(p.email).toMatch(/@example\.com$/);
    }
    const levels = new Set(h.cases.map((c) => c.estimate?.level ?? 'untriaged'));
    expect([...levels].sort()).toEqual(['high', 'low', 'moderate', 'untriaged']);
  });
});
