// Text caps for health-care reminders (47 CFR 64.1200(a)(9)(iv) conditions, from memory per
// references.md): at most one text per local day and three per rolling week, combined with quiet hours.
import { DateTime } from 'luxon';
import { assertZone, DEFAULT_QUIET_WINDOW, nextAllowedInstant, type QuietWindow } from './quiet-hours.util.js';

export interface TextCaps {
  perDay: number;
  perWeek: number;
}

export const DEFAULT_TEXT_CAPS: TextCaps = { perDay: 1, perWeek: 3 };

export type DeferCode = 'quiet_hours' | 'daily_cap' | 'weekly_cap';

export interface DeferReason {
  code: DeferCode;
  message: string;
}

export type TextSlotDecision =
  | { ok: true; at: Date }
  | {
      ok: false;
      deferTo: Date;
      /** The first reason that moved the text, for the front desk. */
      reason: string;
      /** Every step of the move, in order (a quiet-hours move can land on a capped day, and so on). */
      reasons: DeferReason[];
    };

export interface TextSlotOptions {
  window?: QuietWindow;
  caps?: TextCaps;
}

const WORDS = ['zero', 'one', 'two', 'three', 'four', 'five', 'six', 'seven', 'eight', 'nine', 'ten'];
const say = (n: number): string => WORDS[n] ?? String(n);

const toMs = (v: Date | number): number => (typeof v === 'number' ? v : v.getTime());

/** A text counts against the weekly cap until the same local wall time seven days later (DST-safe). */
function ageOut(ms: number, timeZone: string): number {
  return DateTime.fromMillis(ms, { zone: timeZone }).plus({ days: 7 }).toMillis();
}

function assertCaps(caps: TextCaps): void {
  for (const [k, v] of Object.entries(caps)) {
    if (!Number.isInteger(v) || v < 1) throw new RangeError(`cap ${k} must be a whole number ≥ 1, got ${v}`);
  }
}

/** Texts (sent ones plus the candidate) breaking the weekly cap: perWeek + 1 of them inside one week. */
function breaksWeek(sorted: number[], t: number, timeZone: string, perWeek: number): boolean {
  const all = [...sorted, t].sort((a, b) => a - b);
  for (let i = 0; i + perWeek < all.length; i++) {
    const group = all.slice(i, i + perWeek + 1);
    if (group.includes(t) && ageOut(group[0], timeZone) > group[perWeek]) return true;
  }
  return false;
}

/**
 * Earliest instant at or after `proposed` that is inside quiet hours and breaks neither cap, given the
 * instants already texted to this patient (any order; later ones, e.g. already queued, count too).
 */
export function decideTextSlot(
  sent: readonly (Date | number)[],
  proposed: Date | number,
  timeZone: string,
  options: TextSlotOptions = {},
): TextSlotDecision {
  assertZone(timeZone);
  const window = options.window ?? DEFAULT_QUIET_WINDOW;
  const caps = options.caps ?? DEFAULT_TEXT_CAPS;
  assertCaps(caps);
  const sentMs = sent.map(toMs).sort((a, b) => a - b);
  if (sentMs.some((s) => !Number.isFinite(s))) throw new RangeError('a sent instant is not a valid time');
  const start = toMs(proposed);
  const reasons: DeferReason[] = [];
  const note = (code: DeferCode, message: string) => {
    if (!reasons.some((r) => r.code === code)) reasons.push({ code, message });
  };

  let t = start;
  // Each pass only moves t forward, and past the last sent text + a week nothing can block it.
  for (let guard = 0; guard < 10_000; guard++) {
    const allowed = nextAllowedInstant(t, timeZone, window).getTime();
    if (allowed !== t) {
      note('quiet_hours', `quiet hours in ${timeZone} until ${window.start}`);
      t = allowed;
    }
    const local = DateTime.fromMillis(t, { zone: timeZone });
    const sameDay = sentMs.filter((s) => DateTime.fromMillis(s, { zone: timeZone }).hasSame(local, 'day')).length;
    if (sameDay >= caps.perDay) {
      note('daily_cap', caps.perDay === 1 ? 'already texted today' : `${say(caps.perDay)} texts today`);
      // Straight to the next day's opening: that wait is the cap's, not a quiet-hours move.
      t = nextAllowedInstant(local.startOf('day').plus({ days: 1 }).toMillis(), timeZone, window).getTime();
      continue;
    }
    if (breaksWeek(sentMs, t, timeZone, caps.perWeek)) {
      note('weekly_cap', caps.perWeek === 1 ? 'already texted this week' : `${say(caps.perWeek)} texts this week`);
      // Between two age-outs the weekly count can only grow, so the next age-out is the next chance.
      const next = sentMs.map((s) => ageOut(s, timeZone)).filter((a) => a > t);
      t = Math.min(...next);
      continue;
    }
    if (t === start) return { ok: true, at: new Date(t) };
    return { ok: false, deferTo: new Date(t), reason: reasons[0].message, reasons };
  }
  throw new Error('text slot search did not settle');
}
