import { describe, expect, it } from 'vitest';
import type { AppointmentChangedEvent, AppointmentSnapshot } from '../scheduling/appointment-events.js';
import { MOVE_FREES_AHEAD_MS, WaitlistOffersService } from './waitlist-offers.service.js';

const NOW = Date.parse('2026-12-03T15:00:00Z');
const H = 3_600_000;
const snap = (startOffsetMs: number, extra: Partial<AppointmentSnapshot> = {}): AppointmentSnapshot => ({
  start: new Date(NOW + startOffsetMs),
  end: new Date(NOW + startOffsetMs + H),
  state: 'booked',
  chairId: 1,
  operatorId: 2,
  microscopeId: null,
  locationId: 3,
  ...extra,
});
const change = (previous: AppointmentSnapshot, current: AppointmentSnapshot): AppointmentChangedEvent => ({
  practiceId: 1,
  appointmentId: 10,
  caseId: 4,
  referralId: 5,
  previous,
  current,
  actorId: null,
  at: new Date(NOW),
});

describe(`${WaitlistOffersService.name}.freedBy`, () => {
  it('a cancellation of a future visit frees its time, whenever it is', () => {
    const prev = snap(5 * H);
    expect(WaitlistOffersService.freedBy(change(prev, { ...prev, state: 'cancelled' }), NOW)).toBe(prev);
    expect(WaitlistOffersService.freedBy(change(snap(48 * H, { state: 'confirmed' }), snap(48 * H, { state: 'cancelled' })), NOW)).not.toBeNull();
  });

  it('a visit that already began, a no-show, or an already released one frees nothing', () => {
    expect(WaitlistOffersService.freedBy(change(snap(-H), snap(-H, { state: 'cancelled' })), NOW)).toBeNull();
    expect(WaitlistOffersService.freedBy(change(snap(2 * H), snap(2 * H, { state: 'no_show' })), NOW)).toBeNull();
    expect(WaitlistOffersService.freedBy(change(snap(48 * H, { state: 'cancelled' }), snap(72 * H, { state: 'cancelled' })), NOW)).toBeNull();
  });

  it('a move frees the old time only when it was more than 24 h ahead', () => {
    const far = snap(MOVE_FREES_AHEAD_MS + 1);
    expect(WaitlistOffersService.freedBy(change(far, snap(MOVE_FREES_AHEAD_MS + 3 * H)), NOW)).toBe(far);
    expect(WaitlistOffersService.freedBy(change(far, { ...far, chairId: 9 }), NOW)).toBe(far);
    expect(WaitlistOffersService.freedBy(change(far, { ...far, operatorId: 9 }), NOW)).toBe(far);
    expect(WaitlistOffersService.freedBy(change(snap(MOVE_FREES_AHEAD_MS), snap(MOVE_FREES_AHEAD_MS + 3 * H)), NOW)).toBeNull();
    expect(WaitlistOffersService.freedBy(change(snap(12 * H), snap(30 * H)), NOW)).toBeNull();
  });

  it('a confirmation or a note frees nothing', () => {
    const prev = snap(72 * H);
    expect(WaitlistOffersService.freedBy(change(prev, { ...prev, state: 'confirmed' }), NOW)).toBeNull();
    expect(WaitlistOffersService.freedBy(change(prev, { ...prev }), NOW)).toBeNull();
  });
});
