// When one reminder rule should go for one visit: the rule's own time, moved by quiet hours and caps
// (decideTextSlot) and never after the visit has started. Pure, so the planner and the composer agree.
import type { ReminderRule } from '@ostium/shared';
import { decideTextSlot, type QuietWindow, type TextCaps } from './rules/index.js';

export interface PlanInput {
  rule: Pick<ReminderRule, 'channel' | 'trigger' | 'hoursBefore'>;
  /** The visit's start (the first active visit's for a rule on booking). */
  visitStart: Date | number;
  now: Date | number;
  /** The patient's zone, for quiet hours and the day of the caps. */
  zone: string;
  window: QuietWindow;
  caps: TextCaps;
  /** Other texts to this patient: sent ones and ones already queued (their due times). */
  texts: readonly (Date | number)[];
  /** What put the visit inside the lead time, for the reason's wording; default 'booked'. */
  cause?: 'booked' | 'moved';
}

export type PlanResult =
  | { kind: 'queue'; plannedAt: Date; dueAt: Date; reason: string | null }
  | { kind: 'skip'; plannedAt: Date; reason: string };

const MIN = 60_000;
const HOUR = 60 * MIN;

/** "30 minutes", "5 hours", "3 days": how long before the visit something happened. */
export function describeLead(ms: number): string {
  const minutes = Math.max(0, Math.round(ms / MIN));
  const plural = (n: number, unit: string) => `${n} ${unit}${n === 1 ? '' : 's'}`;
  if (minutes < 120) return plural(minutes, 'minute');
  if (minutes < 48 * 60) return plural(Math.floor(minutes / 60), 'hour');
  return plural(Math.floor(minutes / (24 * 60)), 'day');
}

/** The instant the rule asks for, before quiet hours and caps. */
export function ruleInstant(rule: PlanInput['rule'], visitStart: number, now: number): number {
  return rule.trigger === 'before_visit' ? visitStart - (rule.hoursBefore ?? 0) * HOUR : now;
}

export function planReminder(input: PlanInput): PlanResult {
  const start = +input.visitStart;
  const now = +input.now;
  const planned = ruleInstant(input.rule, start, now);
  const plannedAt = new Date(planned);
  if (start <= now) return { kind: 'skip', plannedAt, reason: 'the visit has already started' };
  // Booked (or moved) inside the rule's lead time: the rule's own time is past, so try at once.
  const late = input.rule.trigger === 'before_visit' && planned < now;
  const proposed = Math.max(planned, now);
  let at = proposed;
  let moved: string | null = null;
  if (input.rule.channel === 'sms') {
    const d = decideTextSlot(input.texts, proposed, input.zone, { window: input.window, caps: input.caps });
    at = (d.ok ? d.at : d.deferTo).getTime();
    // Every step of the move (quiet hours, then a capped day…), so the front desk sees the whole why.
    moved = d.ok ? null : d.reasons.map((r) => r.message).join('; ');
  }
  const lead = `${input.cause ?? 'booked'} ${describeLead(start - now)} before the visit`;
  if (at >= start) {
    return {
      kind: 'skip',
      plannedAt,
      reason: late ? `${lead}: no allowed time for this reminder before it` : `no allowed time for this reminder before the visit (${moved})`,
    };
  }
  const reason = late ? (moved ? `${lead}; ${moved}` : `${lead}: sent at once`) : moved;
  return { kind: 'queue', plannedAt, dueAt: new Date(at), reason };
}
