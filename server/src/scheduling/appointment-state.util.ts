import type { AppointmentState } from '@ostium/shared';

// scheduling.md "Appointment states": booked → confirmed → arrived → seated → dismissed, or cancelled / no-show.
// A patient who never confirmed may still arrive; cancelling is possible until the patient is seated.
const NEXT: Record<AppointmentState, readonly AppointmentState[]> = {
  booked: ['confirmed', 'arrived', 'cancelled', 'no_show'],
  confirmed: ['arrived', 'cancelled', 'no_show'],
  arrived: ['seated', 'cancelled'],
  seated: ['dismissed'],
  dismissed: [],
  cancelled: [],
  no_show: [],
};

/** States whose appointment no longer holds its chair, operator and microscope. */
export const RELEASED_STATES: readonly AppointmentState[] = ['cancelled', 'no_show'];

/** States that may still be moved or resized. */
export const MOVABLE_STATES: readonly AppointmentState[] = ['booked', 'confirmed', 'arrived'];

export const allowedNext = (from: AppointmentState): readonly AppointmentState[] => NEXT[from];

export function canTransition(from: AppointmentState, to: AppointmentState): boolean {
  return NEXT[from].includes(to);
}

/** Hours of notice a cancellation gave, one decimal; negative when given after the start. */
export function noticeHours(start: number, at: number): number {
  return Math.round((start - at) / 360_000) / 10;
}
