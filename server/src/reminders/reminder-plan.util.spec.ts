// Reminder timing. Quiet hours 08:00–21:00 in the patient's zone (47 CFR 64.1200(c)(1), verified per
// references.md); one text a day, three a week (47 CFR 64.1200(a)(9)(iv), from memory); zone offsets and
// the 2026-11-01 change (America/New_York 02:00 EDT → 01:00 EST = 06:00Z; America/Los_Angeles
// 02:00 PDT → 01:00 PST = 09:00Z) from the IANA tz database (references.md "Calendars"). Every expected
// instant below is worked out by hand in the comment beside it.
import { describe, expect, it } from 'vitest';
import { DEFAULT_REMINDER_SETTINGS } from './default-reminder-settings.js';
import { describeLead, planReminder, type PlanInput } from './reminder-plan.util.js';

const NY = 'America/New_York';
const LA = 'America/Los_Angeles';
const [, R48, R24] = DEFAULT_REMINDER_SETTINGS.rules as [unknown, PlanInput['rule'], PlanInput['rule']];
const base = { window: { start: '08:00', end: '21:00' }, caps: { perDay: 1, perWeek: 3 }, texts: [] as number[] };
const u = (iso: string) => Date.parse(iso);
const due = (r: ReturnType<typeof planReminder>) => (r.kind === 'queue' ? r.dueAt.toISOString() : `skip: ${r.reason}`);

describe('planReminder', () => {
  it('a booking three days ahead in New York: 48 h and 24 h at the visit’s own local time', () => {
    // Booked Tue 1 Dec 2026 10:00 EST (15:00Z) for Fri 4 Dec 10:00 EST (UTC−5) = 15:00Z.
    const input = { ...base, visitStart: u('2026-12-04T15:00:00Z'), now: u('2026-12-01T15:00:00Z'), zone: NY };
    const a = planReminder({ ...input, rule: R48 });
    // 48 h before: Wed 2 Dec 15:00Z = 10:00 EST, inside quiet hours.
    expect(a).toEqual({ kind: 'queue', plannedAt: new Date('2026-12-02T15:00:00Z'), dueAt: new Date('2026-12-02T15:00:00Z'), reason: null });
    // 24 h before: Thu 3 Dec 15:00Z; the 48 h text is on another local day.
    expect(due(planReminder({ ...input, rule: R24, texts: [u('2026-12-02T15:00:00Z')] }))).toBe('2026-12-03T15:00:00.000Z');
  });

  it('the same in Los Angeles (UTC−8)', () => {
    // Fri 4 Dec 2026 09:15 PST = 17:15Z; 48 h → Wed 2 Dec 17:15Z = 09:15 PST; 24 h → Thu 3 Dec 17:15Z.
    const input = { ...base, visitStart: u('2026-12-04T17:15:00Z'), now: u('2026-12-01T18:00:00Z'), zone: LA };
    expect(due(planReminder({ ...input, rule: R48 }))).toBe('2026-12-02T17:15:00.000Z');
    expect(due(planReminder({ ...input, rule: R24, texts: [u('2026-12-02T17:15:00Z')] }))).toBe('2026-12-03T17:15:00.000Z');
  });

  it('a 07:30 visit: the 48 h text moves to 08:00 local the day before yesterday, across the 2026-11-01 change', () => {
    // Visit Tue 3 Nov 2026 07:30 EST (UTC−5) = 12:30Z. 48 h before = Sun 1 Nov 12:30Z; New York fell
    // back at 06:00Z that morning, so 12:30Z reads 07:30 EST: quiet until 08:00 EST = 13:00Z.
    const input = { ...base, visitStart: u('2026-11-03T12:30:00Z'), now: u('2026-10-28T14:00:00Z'), zone: NY };
    expect(planReminder({ ...input, rule: R48 })).toEqual({
      kind: 'queue',
      plannedAt: new Date('2026-11-01T12:30:00Z'),
      dueAt: new Date('2026-11-01T13:00:00Z'),
      reason: 'quiet hours in America/New_York until 08:00',
    });
    // 24 h before = Mon 2 Nov 12:30Z = 07:30 EST → 08:00 EST = 13:00Z.
    expect(due(planReminder({ ...input, rule: R24, texts: [u('2026-11-01T13:00:00Z')] }))).toBe('2026-11-02T13:00:00.000Z');
  });

  it('counts 48 real hours, not wall-clock hours, when the change falls in between', () => {
    // Visit Mon 2 Nov 2026 07:30 EST = 12:30Z. 48 h before = Sat 31 Oct 12:30Z, still EDT (UTC−4): 08:30,
    // inside quiet hours — wall-clock arithmetic would have said 07:30 and moved it.
    const input = { ...base, visitStart: u('2026-11-02T12:30:00Z'), now: u('2026-10-28T14:00:00Z'), zone: NY };
    expect(planReminder({ ...input, rule: R48 })).toMatchObject({ dueAt: new Date('2026-10-31T12:30:00Z'), reason: null });
    // 24 h before = Sun 1 Nov 12:30Z = 07:30 EST (after the change) → 08:00 EST = 13:00Z.
    expect(due(planReminder({ ...input, rule: R24, texts: [u('2026-10-31T12:30:00Z')] }))).toBe('2026-11-01T13:00:00.000Z');
  });

  it('in Los Angeles across its own change (09:00Z on 2026-11-01)', () => {
    // Visit Tue 3 Nov 07:30 PST (UTC−8) = 15:30Z. 48 h before = Sun 1 Nov 15:30Z = 07:30 PST → 08:00 PST = 16:00Z.
    const input = { ...base, visitStart: u('2026-11-03T15:30:00Z'), now: u('2026-10-28T14:00:00Z'), zone: LA };
    expect(due(planReminder({ ...input, rule: R48 }))).toBe('2026-11-01T16:00:00.000Z');
    // The same instant judged in New York (10:30 EST) would not move: the patient's zone decides.
    expect(due(planReminder({ ...input, rule: R48, zone: NY }))).toBe('2026-11-01T15:30:00.000Z');
  });

  it('a text that would land at night moves to the next morning, through the repeated hour', () => {
    // A 6 h rule before Sun 1 Nov 08:30 EST (13:30Z): 07:30Z = 02:30 EST → 08:00 EST = 13:00Z.
    const r = planReminder({ ...base, rule: { channel: 'sms', trigger: 'before_visit', hoursBefore: 6 }, visitStart: u('2026-11-01T13:30:00Z'), now: u('2026-10-30T12:00:00Z'), zone: NY });
    expect(r).toMatchObject({ dueAt: new Date('2026-11-01T13:00:00Z'), reason: 'quiet hours in America/New_York until 08:00' });
  });

  it('booked 30 minutes before the visit: the first text goes at once, the second has no allowed time', () => {
    // Now Thu 3 Dec 2026 14:30 EST = 19:30Z; visit 15:00 EST = 20:00Z.
    const input = { ...base, visitStart: u('2026-12-03T20:00:00Z'), now: u('2026-12-03T19:30:00Z'), zone: NY };
    expect(planReminder({ ...input, rule: R48 })).toEqual({
      kind: 'queue',
      plannedAt: new Date('2026-12-01T20:00:00Z'),
      dueAt: new Date('2026-12-03T19:30:00Z'),
      reason: 'booked 30 minutes before the visit: sent at once',
    });
    // The 48 h text is queued for now, so the 24 h one would wait for Fri 08:00: after the visit.
    expect(planReminder({ ...input, rule: R24, texts: [u('2026-12-03T19:30:00Z')] })).toEqual({
      kind: 'skip',
      plannedAt: new Date('2026-12-02T20:00:00Z'),
      reason: 'booked 30 minutes before the visit: no allowed time for this reminder before it',
    });
  });

  it('booked late at night for early next morning: no allowed time before the visit', () => {
    // Now Wed 2 Dec 22:10 EST (03:10Z Thu); visit Thu 3 Dec 07:45 EST = 12:45Z; quiet until 08:00.
    const r = planReminder({ ...base, rule: R24, visitStart: u('2026-12-03T12:45:00Z'), now: u('2026-12-03T03:10:00Z'), zone: NY });
    expect(r).toMatchObject({ kind: 'skip', reason: 'booked 9 hours before the visit: no allowed time for this reminder before it' });
  });

  it('a rule whose moved time would pass the visit is skipped with the reason', () => {
    // Visit Thu 3 Dec 08:15 EST = 13:15Z; 1 h rule → 07:15 → 08:00 EST = 13:00Z, but another text is
    // already queued for Thu 3 Dec 14:00 EST (19:00Z), so the next allowed time is Fri 08:00: after the visit.
    const rule = { channel: 'sms' as const, trigger: 'before_visit' as const, hoursBefore: 1 };
    const input = { ...base, rule, visitStart: u('2026-12-03T13:15:00Z'), now: u('2026-12-01T12:00:00Z'), zone: NY };
    expect(due(planReminder(input))).toBe('2026-12-03T13:00:00.000Z');
    expect(planReminder({ ...input, texts: [u('2026-12-03T19:00:00Z')] })).toMatchObject({
      kind: 'skip',
      reason: 'no allowed time for this reminder before the visit (quiet hours in America/New_York until 08:00; already texted today)',
    });
  });

  it('e-mail ignores quiet hours and caps; a rule on booking goes now; a started visit gets nothing', () => {
    const visitStart = u('2026-12-03T12:30:00Z');
    const email = { channel: 'email' as const, trigger: 'before_visit' as const, hoursBefore: 10 };
    // 10 h before 07:30 EST = 21:30 EST the evening before: fine for an e-mail.
    expect(due(planReminder({ ...base, rule: email, visitStart, now: u('2026-12-01T12:00:00Z'), zone: NY, texts: [u('2026-12-03T02:00:00Z')] }))).toBe('2026-12-03T02:30:00.000Z');
    const onBooking = { channel: 'email' as const, trigger: 'on_booking' as const, hoursBefore: null };
    expect(planReminder({ ...base, rule: onBooking, visitStart, now: u('2026-12-01T12:00:00Z'), zone: NY })).toMatchObject({ kind: 'queue', reason: null, dueAt: new Date('2026-12-01T12:00:00Z') });
    expect(planReminder({ ...base, rule: R48, visitStart, now: visitStart, zone: NY })).toMatchObject({ kind: 'skip', reason: 'the visit has already started' });
  });

  it('says "moved" when a move put the visit inside the lead time', () => {
    const r = planReminder({ ...base, rule: R48, visitStart: u('2026-12-03T20:00:00Z'), now: u('2026-12-03T15:00:00Z'), zone: NY, cause: 'moved' });
    expect(r).toMatchObject({ kind: 'queue', reason: 'moved 5 hours before the visit: sent at once' });
  });
});

describe('describeLead', () => {
  it('uses minutes under two hours, hours under two days, then days', () => {
    expect([1, 30, 119].map((m) => describeLead(m * 60_000))).toEqual(['1 minute', '30 minutes', '119 minutes']);
    expect([120, 47 * 60 + 59].map((m) => describeLead(m * 60_000))).toEqual(['2 hours', '47 hours']);
    expect(describeLead(49 * 3_600_000)).toBe('2 days');
  });
});
