import { APPOINTMENT_STATES } from '@ostium/shared';
import { describe, expect, it } from 'vitest';
import { canTransition, noticeHours, RELEASED_STATES } from './appointment-state.util.js';

describe('appointment states', () => {
  it('follows booked → confirmed → arrived → seated → dismissed (scheduling.md "Appointment states")', () => {
    expect(canTransition('booked', 'confirmed')).toBe(true);
    expect(canTransition('confirmed', 'arrived')).toBe(true);
    expect(canTransition('arrived', 'seated')).toBe(true);
    expect(canTransition('seated', 'dismissed')).toBe(true);
    expect(canTransition('booked', 'dismissed')).toBe(false);
    expect(canTransition('seated', 'cancelled')).toBe(false);
  });

  it('ends for good in dismissed, cancelled and no-show', () => {
    for (const end of ['dismissed', ...RELEASED_STATES] as const) for (const s of APPOINTMENT_STATES) expect(canTransition(end, s)).toBe(false);
  });

  it('measures notice in hours before the start, one decimal', () => {
    const start = Date.UTC(2027, 0, 10, 14);
    expect(noticeHours(start, start - 36 * 3_600_000)).toBe(36);
    expect(noticeHours(start, start - 90 * 60_000)).toBe(1.5);
    expect(noticeHours(start, start + 30 * 60_000)).toBe(-0.5);
  });
});
