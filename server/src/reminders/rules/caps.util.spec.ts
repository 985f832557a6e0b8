// Caps per the health-care exemption of 47 CFR 64.1200(a)(9)(iv) (conditions from memory, references.md:
// at most one message a day and three a week), combined with 47 CFR 64.1200(c)(1) quiet hours.
import fc from 'fast-check';
import { DateTime } from 'luxon';
import { describe, expect, it } from 'vitest';
import { decideTextSlot } from './caps.util.js';

const u = (iso: string): number => Date.parse(iso);
const CHI = 'America/Chicago';
const NY = 'America/New_York';

function deferred(decision: ReturnType<typeof decideTextSlot>): { to: string; reason: string; codes: string[] } {
  if (decision.ok) throw new Error(`expected a deferral, got ok at ${decision.at.toISOString()}`);
  return { to: decision.deferTo.toISOString(), reason: decision.reason, codes: decision.reasons.map((r) => r.code) };
}

describe('decideTextSlot', () => {
  it('lets a first text inside quiet hours go as proposed', () => {
    const d = decideTextSlot([], u('2026-06-15T15:00:00Z'), CHI); // 10:00 CDT
    expect(d).toEqual({ ok: true, at: new Date('2026-06-15T15:00:00Z') });
  });

  it('moves a 06:00 text to 08:00 and says why (47 CFR 64.1200(c)(1))', () => {
    expect(deferred(decideTextSlot([], u('2026-06-15T11:00:00Z'), CHI))).toEqual({
      to: '2026-06-15T13:00:00.000Z',
      reason: 'quiet hours in America/Chicago until 08:00',
      codes: ['quiet_hours'],
    });
  });

  it('allows one text per local day: a second one goes next morning', () => {
    const sent = [u('2026-06-15T14:00:00Z')]; // 09:00 CDT
    expect(deferred(decideTextSlot(sent, u('2026-06-15T20:00:00Z'), CHI))).toEqual({
      to: '2026-06-16T13:00:00.000Z',
      reason: 'already texted today',
      codes: ['daily_cap'],
    });
  });

  it('counts the day in the patient’s zone, not in UTC', () => {
    const sent = [u('2026-06-15T11:00:00Z')]; // 01:00 HST on 15 June; 20:00 JST on 15 June
    const proposed = u('2026-06-15T23:30:00Z'); // 13:30 HST on 15 June; 08:30 JST on 16 June
    expect(decideTextSlot(sent, proposed, 'Asia/Tokyo')).toEqual({ ok: true, at: new Date(proposed) });
    expect(deferred(decideTextSlot(sent, proposed, 'Pacific/Honolulu')).to).toBe('2026-06-16T18:00:00.000Z');
  });

  it('allows three texts per rolling week: the fourth waits until the first is a week old', () => {
    const sent = ['2026-06-15', '2026-06-16', '2026-06-17'].map((d) => u(`${d}T15:00:00Z`)); // 10:00 CDT Mon–Wed
    expect(deferred(decideTextSlot(sent, u('2026-06-18T15:00:00Z'), CHI))).toEqual({
      to: '2026-06-22T15:00:00.000Z',
      reason: 'three texts this week',
      codes: ['weekly_cap'],
    });
  });

  it('keeps the week in local wall time across the spring-forward change (America/New_York, 2026-03-08)', () => {
    const sent = ['2026-03-02', '2026-03-03', '2026-03-04'].map((d) => u(`${d}T15:00:00Z`)); // 10:00 EST
    // A week after 10:00 EST on 2 March is 10:00 EDT on 9 March = 14:00Z, one real hour short of 168 h.
    expect(deferred(decideTextSlot(sent, u('2026-03-05T15:00:00Z'), NY)).to).toBe('2026-03-09T14:00:00.000Z');
  });

  it('chains quiet hours and the daily cap: 22:00 → 08:00 tomorrow → taken → 08:00 the day after', () => {
    const sent = [u('2026-06-16T14:00:00Z')]; // 09:00 CDT on 16 June
    expect(deferred(decideTextSlot(sent, u('2026-06-16T03:00:00Z'), CHI))).toEqual({
      to: '2026-06-17T13:00:00.000Z',
      reason: 'quiet hours in America/Chicago until 08:00',
      codes: ['quiet_hours', 'daily_cap'],
    });
  });

  it('judges only weeks that hold the new text: an old over-cap burst (e.g. manual sends) blocks nothing later', () => {
    const burst = ['2026-01-05', '2026-01-06', '2026-01-07', '2026-01-08'].map((d) => u(`${d}T16:00:00Z`));
    expect(decideTextSlot(burst, u('2026-01-20T16:00:00Z'), CHI)).toEqual({ ok: true, at: new Date('2026-01-20T16:00:00Z') });
  });

  it('counts a text already queued later the same day', () => {
    const queued = [u('2026-06-15T22:00:00Z')]; // 17:00 CDT
    expect(deferred(decideTextSlot(queued, u('2026-06-15T15:00:00Z'), CHI)).reason).toBe('already texted today');
  });

  it('honours practice caps and windows', () => {
    const sent = [u('2026-06-15T14:00:00Z')];
    const opts = { caps: { perDay: 2, perWeek: 5 }, window: { start: '09:30', end: '18:00' } };
    expect(decideTextSlot(sent, u('2026-06-15T16:00:00Z'), CHI, opts)).toMatchObject({ ok: true });
    expect(deferred(decideTextSlot(sent, u('2026-06-15T13:00:00Z'), CHI, opts))).toMatchObject({
      to: '2026-06-15T14:30:00.000Z',
      reason: 'quiet hours in America/Chicago until 09:30',
    });
    expect(() => decideTextSlot([], 0, CHI, { caps: { perDay: 0, perWeek: 3 } })).toThrow(/cap perDay/);
    expect(() => decideTextSlot([], 0, 'Nowhere/Place')).toThrow(/time zone/);
  });
});

// Independent checks, written without the module's helpers.
const ZONES = [NY, CHI, 'America/Los_Angeles', 'Pacific/Honolulu', 'Asia/Tokyo', 'Australia/Lord_Howe'];
const dayKey = (ms: number, zone: string): string => DateTime.fromMillis(ms, { zone }).toISODate()!;
const inQuiet = (ms: number, zone: string): boolean => {
  const hm = DateTime.fromMillis(ms, { zone }).toFormat('HH:mm');
  return hm >= '08:00' && hm < '21:00';
};
function weekOk(times: number[], zone: string): boolean {
  const s = [...times].sort((a, b) => a - b);
  return s.every((t, i) => i + 3 >= s.length || DateTime.fromMillis(t, { zone }).plus({ days: 7 }).toMillis() <= s[i + 3]);
}
function feasible(sent: number[], t: number, zone: string): boolean {
  return inQuiet(t, zone) && !sent.some((s) => dayKey(s, zone) === dayKey(t, zone)) && weekOk([...sent, t], zone);
}

const base = u('2026-02-25T00:00:00Z'); // spans both New York changes within the generated range
const proposalsArb = fc.array(fc.integer({ min: 0, max: 300 * 24 * 60 }), { minLength: 1, maxLength: 25 });

describe('decideTextSlot properties', () => {
  it('a patient scheduled one proposal after another never gets two texts on one local day or four in a week', () => {
    fc.assert(
      fc.property(fc.constantFrom(...ZONES), proposalsArb, (zone, minutes) => {
        const sent: number[] = [];
        for (const m of minutes) {
          const proposed = base + m * 60_000;
          const d = decideTextSlot(sent, proposed, zone);
          const at = (d.ok ? d.at : d.deferTo).getTime();
          expect(at).toBeGreaterThanOrEqual(proposed);
          expect(feasible(sent, at, zone)).toBe(true);
          sent.push(at);
        }
        expect(new Set(sent.map((s) => dayKey(s, zone))).size).toBe(sent.length);
        expect(weekOk(sent, zone)).toBe(true);
      }),
      { numRuns: 150 },
    );
  });

  it('the deferred instant is the earliest: no sampled instant between proposal and result would do', () => {
    fc.assert(
      fc.property(fc.constantFrom(...ZONES), proposalsArb, fc.integer({ min: 0, max: 300 * 24 * 60 }), (zone, minutes, p) => {
        const sent: number[] = [];
        for (const m of minutes) {
          const d = decideTextSlot(sent, base + m * 60_000, zone);
          sent.push((d.ok ? d.at : d.deferTo).getTime());
        }
        const proposed = base + p * 60_000;
        const d = decideTextSlot(sent, proposed, zone);
        const at = (d.ok ? d.at : d.deferTo).getTime();
        expect(d.ok).toBe(at === proposed);
        for (let t = proposed; t < at; t += 20 * 60_000) expect(feasible(sent, t, zone)).toBe(false);
      }),
      { numRuns: 60 },
    );
  });
});
