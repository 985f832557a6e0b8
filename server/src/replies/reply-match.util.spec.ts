import fc from 'fast-check';
import type { AppointmentState } from '@ostium/shared';
import { describe, expect, it } from 'vitest';
import { pickPatient, pickVisit, RECENT_PAST_MS, replyKind, type VisitCandidate } from './reply-match.util.js';

const H = 3_600_000;
const NOW = Date.parse('2026-12-03T15:00:00Z');
const v = (id: number, startOffsetMs: number, state: AppointmentState = 'booked', patientId = 1): VisitCandidate => ({ id, patientId, start: NOW + startOffsetMs, state });

describe('pickVisit', () => {
  it('takes the soonest future visit that is booked or confirmed', () => {
    expect(pickVisit([v(1, 48 * H), v(2, 24 * H), v(3, 12 * H, 'cancelled')], NOW)?.id).toBe(2);
    expect(pickVisit([v(1, 48 * H, 'confirmed'), v(2, 72 * H)], NOW)?.id).toBe(1);
  });

  it('falls back to the latest visit that began within two hours, else none', () => {
    expect(pickVisit([v(1, -1 * H), v(2, -1.5 * H)], NOW)?.id).toBe(1);
    expect(pickVisit([v(1, -RECENT_PAST_MS)], NOW)?.id).toBe(1);
    expect(pickVisit([v(1, -RECENT_PAST_MS - 1)], NOW)).toBeNull();
    expect(pickVisit([v(1, -1 * H, 'arrived'), v(2, 5 * H, 'no_show')], NOW)).toBeNull();
    expect(pickVisit([], NOW)).toBeNull();
  });

  it('prefers any future visit over a recent one, and never picks a released visit (property)', () => {
    const state = fc.constantFrom<AppointmentState>('booked', 'confirmed', 'arrived', 'seated', 'dismissed', 'cancelled', 'no_show');
    fc.assert(
      fc.property(fc.array(fc.record({ id: fc.nat(), offset: fc.integer({ min: -10 * H, max: 100 * H }), state }), { maxLength: 12 }), (rows) => {
        const list = rows.map((r) => v(r.id, r.offset, r.state));
        const got = pickVisit(list, NOW);
        const live = list.filter((x) => x.state === 'booked' || x.state === 'confirmed');
        const future = live.filter((x) => x.start > NOW);
        if (got === null) return future.length === 0 && !live.some((x) => x.start >= NOW - RECENT_PAST_MS);
        if (!live.includes(got)) return false;
        if (future.length) return got.start === Math.min(...future.map((x) => x.start));
        return got.start === Math.max(...live.filter((x) => x.start >= NOW - RECENT_PAST_MS).map((x) => x.start));
      }),
    );
  });
});

describe('replyKind and pickPatient', () => {
  it('a confirm word answers an open waitlist offer first; other words keep their meaning', () => {
    const offer = { offerId: 9, patientId: 2, open: true };
    expect(replyKind('confirm', offer)).toBe('waitlist_accept');
    expect(replyKind('confirm', null)).toBe('confirm');
    expect(replyKind('opt_out', offer)).toBe('opt_out');
    expect(replyKind('reschedule', offer)).toBe('reschedule');
  });

  it('picks the offer holder, then the visit’s patient, then the last texted, then the lowest id', () => {
    expect(pickPatient([], {})).toBeNull();
    expect(pickPatient([5, 3], {})).toBe(3);
    expect(pickPatient([5, 3], { lastTexted: 5 })).toBe(5);
    expect(pickPatient([5, 3], { lastTexted: 5, visit: v(1, H, 'booked', 3) })).toBe(3);
    expect(pickPatient([5, 3], { lastTexted: 5, visit: v(1, H, 'booked', 3), offer: { offerId: 1, patientId: 5, open: true } })).toBe(5);
    // A name from elsewhere is never chosen.
    expect(pickPatient([5, 3], { lastTexted: 8, visit: v(1, H, 'booked', 9) })).toBe(3);
  });
});
