// Events the scheduling module emits after a booking or change has committed. Listeners (reminders,
// letters, waitlist offers) must be idempotent: a periodic sweep may deliver the same fact again.
import type { AppointmentState } from '@ostium/shared';

export const APPOINTMENTS_BOOKED = 'appointments.booked';
export const APPOINTMENT_CHANGED = 'appointment.changed';

export interface AppointmentsBookedEvent {
  practiceId: number;
  seriesId: string;
  appointmentIds: number[];
  caseId: number;
  referralId: number;
  /** True when this series is the referral's first booking (its referral moved to booked now). */
  firstBooking: boolean;
  actorId: number | null;
  at: Date;
}

export interface AppointmentSnapshot {
  start: Date;
  end: Date;
  state: AppointmentState;
  chairId: number;
  operatorId: number;
  microscopeId: number | null;
  locationId: number;
}

export interface AppointmentChangedEvent {
  practiceId: number;
  appointmentId: number;
  caseId: number;
  referralId: number;
  previous: AppointmentSnapshot;
  current: AppointmentSnapshot;
  actorId: number | null;
  at: Date;
}
