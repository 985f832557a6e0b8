import { REFERRAL_STATUSES, type ReferralStatus } from '@ostium/shared';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { checkTransition, nextStatus, OPEN_STATUSES, STATUS_PATH } from './referral-status.util.js';

// The allowed moves, written out by hand from the issue (received → … → report_sent; any open status
// → declined / cancelled with a reason), so the rule in code is checked against a separate statement.
const ALLOWED: [ReferralStatus, ReferralStatus][] = [
  ['received', 'triaged'],
  ['triaged', 'planned'],
  ['planned', 'booked'],
  ['booked', 'in_treatment'],
  ['in_treatment', 'completed'],
  ['completed', 'report_sent'],
  ...(['received', 'triaged', 'planned', 'booked', 'in_treatment'] as ReferralStatus[]).flatMap((s) => [
    [s, 'declined'] as [ReferralStatus, ReferralStatus],
    [s, 'cancelled'] as [ReferralStatus, ReferralStatus],
  ]),
];
const allowed = (a: ReferralStatus, b: ReferralStatus) => ALLOWED.some(([x, y]) => x === a && y === b);

describe('referral status transitions', () => {
  it('allows exactly the listed moves (all 81 pairs, with a reason)', () => {
    let ok = 0;
    for (const from of REFERRAL_STATUSES) {
      for (const to of REFERRAL_STATUSES) {
        const r = checkTransition(from, to, 'a reason');
        expect(r.ok, `${from} → ${to}`).toBe(allowed(from, to));
        if (r.ok) ok++;
      }
    }
    expect(ok).toBe(16);
  });

  it('needs a reason to decline or cancel (400 on reason), not for the steps', () => {
    for (const s of OPEN_STATUSES) {
      for (const to of ['declined', 'cancelled'] as const) {
        for (const reason of [undefined, null, '', '   ']) {
          expect(checkTransition(s, to, reason)).toEqual({ ok: false, httpStatus: 400, field: 'reason', message: `Give a reason when a referral is ${to}` });
        }
        expect(checkTransition(s, to, '  moved away ')).toEqual({ ok: true, reason: 'moved away' });
      }
    }
    expect(checkTransition('received', 'triaged')).toEqual({ ok: true, reason: null });
  });

  it('answers a refused move as a conflict (409) on status with a message naming both ends', () => {
    fc.assert(
      fc.property(fc.constantFrom(...REFERRAL_STATUSES), fc.constantFrom(...REFERRAL_STATUSES), fc.option(fc.string()), (from, to, reason) => {
        const r = checkTransition(from, to, reason);
        if (r.ok || r.field === 'reason') return;
        expect(r.httpStatus).toBe(409);
        expect(r.field).toBe('status');
        expect(r.message).toContain(from.replace('_', ' '));
        if (from !== to) expect(r.message).toContain(to.replace('_', ' '));
      }),
    );
    expect(checkTransition('received', 'booked')).toMatchObject({ message: 'A referral that is received cannot change to booked; the next step is triaged (or declined / cancelled with a reason)' });
    expect(checkTransition('completed', 'cancelled', 'x')).toMatchObject({ httpStatus: 409, message: 'A referral that is completed can no longer be cancelled' });
    expect(checkTransition('declined', 'triaged')).toMatchObject({ httpStatus: 409, message: 'A referral that is declined cannot change to triaged' });
  });

  it('walks the path in order', () => {
    expect(STATUS_PATH.map(nextStatus)).toEqual([...STATUS_PATH.slice(1), null]);
    expect(nextStatus('declined')).toBeNull();
  });
});
