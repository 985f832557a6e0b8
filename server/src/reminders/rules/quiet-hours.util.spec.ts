// Quiet hours against 47 CFR 64.1200(c)(1) (no calls before 8 a.m. or after 9 p.m. at the called party's
// local time) and the IANA tz database through luxon (references.md "Calendars": America/New_York moves
// 2026-03-08 02:00 → 03:00 and 2026-11-01 02:00 → 01:00).
import fc from 'fast-check';
import { DateTime } from 'luxon';
import { describe, expect, it } from 'vitest';
import { isInsideWindow, nextAllowedInstant, type QuietWindow } from './quiet-hours.util.js';

const utc = (iso: string): Date => new Date(iso);
const iso = (d: Date): string => d.toISOString();
const NY = 'America/New_York';
const CHI = 'America/Chicago';

describe('nextAllowedInstant, default 08:00–21:00 (47 CFR 64.1200(c)(1))', () => {
  it('keeps an instant inside the window, including 08:00 sharp and 20:59:59.999', () => {
    const at = utc('2026-06-15T15:00:00Z'); // 10:00 CDT
    expect(nextAllowedInstant(at, CHI)).toEqual(at);
    expect(iso(nextAllowedInstant(utc('2026-06-15T13:00:00Z'), CHI))).toBe('2026-06-15T13:00:00.000Z');
    expect(iso(nextAllowedInstant(utc('2026-06-16T01:59:59.999Z'), CHI))).toBe('2026-06-16T01:59:59.999Z');
  });

  it('moves an early instant to the same local day 08:00', () => {
    // 07:00 CDT → 08:00 CDT (13:00Z).
    expect(iso(nextAllowedInstant(utc('2026-06-15T12:00:00Z'), CHI))).toBe('2026-06-15T13:00:00.000Z');
    expect(iso(nextAllowedInstant(Date.parse('2026-06-15T05:00:00Z'), CHI))).toBe('2026-06-15T13:00:00.000Z');
  });

  it('moves a late instant, and 21:00 sharp, to the next local day 08:00', () => {
    // 21:30 CDT on 15 June → 08:00 CDT on 16 June.
    expect(iso(nextAllowedInstant(utc('2026-06-16T02:30:00Z'), CHI))).toBe('2026-06-16T13:00:00.000Z');
    expect(iso(nextAllowedInstant(utc('2026-06-16T02:00:00Z'), CHI))).toBe('2026-06-16T13:00:00.000Z');
  });

  it('judges one instant by each patient’s own zone', () => {
    const at = utc('2026-06-15T12:00:00Z');
    expect(iso(nextAllowedInstant(at, 'Asia/Tokyo'))).toBe('2026-06-15T23:00:00.000Z'); // 21:00 JST → 08:00 JST
    expect(iso(nextAllowedInstant(at, 'Pacific/Honolulu'))).toBe('2026-06-15T18:00:00.000Z'); // 02:00 HST → 08:00
    expect(iso(nextAllowedInstant(at, 'Europe/London'))).toBe('2026-06-15T12:00:00.000Z'); // 13:00 BST, inside
    expect(iso(nextAllowedInstant(at, 'Asia/Kolkata'))).toBe('2026-06-15T12:00:00.000Z'); // 17:30 IST, inside
    // 21:30 IST (UTC+05:30) → 08:00 IST next day = 02:30Z.
    expect(iso(nextAllowedInstant(utc('2026-06-15T16:00:00Z'), 'Asia/Kolkata'))).toBe('2026-06-16T02:30:00.000Z');
  });

  it('lands on 08:00 EDT after the spring-forward night (2026-03-08)', () => {
    // 22:00 EST on 7 March → 08:00 EDT on 8 March = 12:00Z, not 13:00Z.
    expect(iso(nextAllowedInstant(utc('2026-03-08T03:00:00Z'), NY))).toBe('2026-03-08T12:00:00.000Z');
    // 01:30 EST, just before the gap.
    expect(iso(nextAllowedInstant(utc('2026-03-08T06:30:00Z'), NY))).toBe('2026-03-08T12:00:00.000Z');
    // The night before: 21:30 EST on 6 March → 08:00 EST on 7 March = 13:00Z.
    expect(iso(nextAllowedInstant(utc('2026-03-07T02:30:00Z'), NY))).toBe('2026-03-07T13:00:00.000Z');
  });

  it('lands on 08:00 EST after the fall-back night (2026-11-01), from either pass of 01:30', () => {
    expect(iso(nextAllowedInstant(utc('2026-11-01T03:00:00Z'), NY))).toBe('2026-11-01T13:00:00.000Z');
    expect(iso(nextAllowedInstant(utc('2026-11-01T05:30:00Z'), NY))).toBe('2026-11-01T13:00:00.000Z'); // 01:30 EDT
    expect(iso(nextAllowedInstant(utc('2026-11-01T06:30:00Z'), NY))).toBe('2026-11-01T13:00:00.000Z'); // 01:30 EST
    // 20:30 EST on 1 Nov is still inside; 21:00 EST = 02:00Z on 2 Nov is not.
    expect(iso(nextAllowedInstant(utc('2026-11-02T01:30:00Z'), NY))).toBe('2026-11-02T01:30:00.000Z');
    expect(iso(nextAllowedInstant(utc('2026-11-02T02:00:00Z'), NY))).toBe('2026-11-02T13:00:00.000Z');
  });
});

describe('nextAllowedInstant, practice windows touching the change hours', () => {
  it('a start inside the skipped hour opens at the change, 03:00 EDT', () => {
    const w = { start: '02:30', end: '05:00' };
    expect(iso(nextAllowedInstant(utc('2026-03-08T05:00:00Z'), NY, w))).toBe('2026-03-08T07:00:00.000Z');
  });

  it('a start inside the repeated hour opens again on its second pass', () => {
    const w = { start: '01:30', end: '03:00' };
    // 01:10 EST (second pass): the first 01:30 (EDT) is already past, the next is 01:30 EST = 06:30Z.
    expect(iso(nextAllowedInstant(utc('2026-11-01T06:10:00Z'), NY, w))).toBe('2026-11-01T06:30:00.000Z');
  });

  it('an end inside the repeated hour reopens when the clock falls back', () => {
    const w = { start: '00:30', end: '01:30' };
    // 01:45 EDT is past the end; at 06:00Z the clock reads 01:00 EST, inside again.
    expect(iso(nextAllowedInstant(utc('2026-11-01T05:45:00Z'), NY, w))).toBe('2026-11-01T06:00:00.000Z');
  });

  it('a window wholly inside the skipped hour waits for the next day', () => {
    const w = { start: '02:10', end: '02:50' };
    // 2026-03-09 02:10 EDT = 06:10Z.
    expect(iso(nextAllowedInstant(utc('2026-03-08T05:00:00Z'), NY, w))).toBe('2026-03-09T06:10:00.000Z');
  });

  it('rejects bad zones, bad times and windows that do not start before they end', () => {
    const at = utc('2026-06-15T12:00:00Z');
    expect(() => nextAllowedInstant(at, 'Mars/Olympus')).toThrow(/time zone/);
    expect(() => nextAllowedInstant(at, NY, { start: '8:00', end: '21:00' })).toThrow(/HH:mm/);
    expect(() => nextAllowedInstant(at, NY, { start: '21:00', end: '08:00' })).toThrow(/before it ends/);
    expect(() => nextAllowedInstant(Number.NaN, NY)).toThrow(/valid/);
  });
});

const ZONES = [NY, CHI, 'America/Los_Angeles', 'Pacific/Honolulu', 'Europe/London', 'Asia/Tokyo', 'Australia/Lord_Howe', 'America/Santiago'];
const zoneArb = fc.constantFrom(...ZONES);
// Instants over 2026, with a bias to the two New York change nights.
const atArb = fc.oneof(
  fc.integer({ min: Date.parse('2026-01-01T00:00:00Z'), max: Date.parse('2027-01-01T00:00:00Z') }),
  fc.integer({ min: Date.parse('2026-03-07T00:00:00Z'), max: Date.parse('2026-03-09T12:00:00Z') }),
  fc.integer({ min: Date.parse('2026-10-31T00:00:00Z'), max: Date.parse('2026-11-02T12:00:00Z') }),
);
const hhmm = (m: number): string => `${String(Math.floor(m / 60)).padStart(2, '0')}:${String(m % 60).padStart(2, '0')}`;
const windowArb: fc.Arbitrary<QuietWindow> = fc
  .tuple(fc.integer({ min: 0, max: 1439 }), fc.integer({ min: 0, max: 1439 }))
  .filter(([a, b]) => a !== b)
  .map(([a, b]) => ({ start: hhmm(Math.min(a, b)), end: hhmm(Math.max(a, b)) }));

function readsInside(ms: number, zone: string, w: QuietWindow): boolean {
  const dt = DateTime.fromMillis(ms, { zone });
  const hm = dt.toFormat('HH:mm:ss.SSS');
  return hm >= `${w.start}:00.000` && hm < `${w.end}:00.000`;
}

describe('nextAllowedInstant properties', () => {
  it('result is inside the window, never before `at`, and nothing just before it is allowed', () => {
    fc.assert(
      fc.property(atArb, zoneArb, windowArb, (at, zone, w) => {
        const r = nextAllowedInstant(at, zone, w).getTime();
        expect(r).toBeGreaterThanOrEqual(at);
        expect(readsInside(r, zone, w)).toBe(true);
        if (r > at) expect(readsInside(r - 1, zone, w)).toBe(false);
        expect(isInsideWindow(r, zone, w)).toBe(true);
      }),
      { numRuns: 500 },
    );
  });

  it('with the default window, no sampled minute between `at` and the result is allowed', () => {
    fc.assert(
      fc.property(atArb, zoneArb, (at, zone) => {
        const r = nextAllowedInstant(at, zone).getTime();
        for (let t = at; t < r; t += 5 * 60_000) expect(readsInside(t, zone, { start: '08:00', end: '21:00' })).toBe(false);
      }),
      { numRuns: 60 },
    );
  });
});
