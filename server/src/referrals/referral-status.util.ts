import type { ReferralStatus } from '@ostium/shared';

/** The referral's path through the practice, one step at a time. */
export const STATUS_PATH: readonly ReferralStatus[] = ['received', 'triaged', 'planned', 'booked', 'in_treatment', 'completed', 'report_sent'];

/** Statuses still before treatment ends: these may be declined or cancelled, and these are "waiting". */
export const OPEN_STATUSES: readonly ReferralStatus[] = ['received', 'triaged', 'planned', 'booked', 'in_treatment'];

/** Ends that need a reason. */
export const CLOSING_STATUSES: readonly ReferralStatus[] = ['declined', 'cancelled'];

export const isOpen = (s: ReferralStatus) => OPEN_STATUSES.includes(s);

export function nextStatus(from: ReferralStatus): ReferralStatus | null {
  const i = STATUS_PATH.indexOf(from);
  return i >= 0 && i < STATUS_PATH.length - 1 ? STATUS_PATH[i + 1]! : null;
}

const label = (s: ReferralStatus) => s.replace('_', ' ');

export type TransitionCheck =
  | { ok: true; reason: string | null }
  | { ok: false; httpStatus: 400 | 409; field: 'status' | 'reason'; message: string };

/**
 * Whether a referral may move from `from` to `to`: the next step on the path, or declined /
 * cancelled from an open status with a reason. A missing reason is the caller's mistake (400);
 * a move the referral's current state does not allow is a conflict (409).
 */
export function checkTransition(from: ReferralStatus, to: ReferralStatus, reason?: string | null): TransitionCheck {
  const why = reason?.trim() || null;
  if (from === to) return { ok: false, httpStatus: 409, field: 'status', message: `The referral is already ${label(from)}` };
  if (CLOSING_STATUSES.includes(to)) {
    if (!isOpen(from)) {
      return { ok: false, httpStatus: 409, field: 'status', message: `A referral that is ${label(from)} can no longer be ${label(to)}` };
    }
    if (!why) return { ok: false, httpStatus: 400, field: 'reason', message: `Give a reason when a referral is ${label(to)}` };
    return { ok: true, reason: why };
  }
  const next = nextStatus(from);
  if (next === to) return { ok: true, reason: why };
  if (next === null) return { ok: false, httpStatus: 409, field: 'status', message: `A referral that is ${label(from)} cannot change to ${label(to)}` };
  return {
    ok: false,
    httpStatus: 409,
    field: 'status',
    message: `A referral that is ${label(from)} cannot change to ${label(to)}; the next step is ${label(next)}${isOpen(from) ? ' (or declined / cancelled with a reason)' : ''}`,
  };
}
