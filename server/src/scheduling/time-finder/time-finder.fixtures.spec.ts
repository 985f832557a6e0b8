// Hand-checked fixtures for the time finder. Rules come from the design brief (scheduling.md "Resources",
// "Time finder"); every expected time below was worked out by hand from the fixture and is noted inline.
// Dates: 2026-03-02 is a Monday (ISO 8601 calendar); Europe/Vienna keeps UTC+1 until 2026-03-29 (IANA tzdb).
import { describe, expect, it } from 'vitest';
import { findTimes } from './time-finder.util.js';
import { at, noBusy, operator, reading, span, world, WEEKDAYS_RULE } from './time-finder.fixtures.util.js';
import type { BusyIntervals, Hold, TimeFinderRequest } from './time-finder.types.js';

const Z = 'Europe/Vienna';

function request(extra: Partial<TimeFinderRequest> = {}): TimeFinderRequest {
  return {
    plan: { visits: [{ minutes: 60, needsMicroscope: false }] },
    from: at(Z, '2026-03-02 00:00'),
    to: at(Z, '2026-03-14 00:00'),
    now: at(Z, '2026-02-27 10:00'),
    ...extra,
  };
}

function firstStart(result: ReturnType<typeof findTimes>): string {
  expect(result.proposals.length).toBeGreaterThan(0);
  return reading(result.proposals[0].visits[0].start, Z);
}

describe('turnover of the day', () => {
  // A booking 08:00–10:00 is stored with its 10-minute turnover (scheduling.md), so the chair is busy to 10:10.
  const busy: BusyIntervals = { ...noBusy(), chairs: { C1: [span(Z, '2026-03-02 08:00', '2026-03-02 10:10')] } };

  it('makes the chair free only from 10:10 after a booking ending 10:00', () => {
    expect(firstStart(findTimes(world(), busy, request({ plan: { visits: [{ minutes: 30, needsMicroscope: false }] } })))).toBe('2026-03-02 10:10');
  });

  it('keeps the new visit’s own turnover clear of the next booking', () => {
    const tight: BusyIntervals = {
      ...noBusy(),
      chairs: { C1: [span(Z, '2026-03-02 08:00', '2026-03-02 10:10'), span(Z, '2026-03-02 11:00', '2026-03-02 12:10')] },
    };
    // 40 min: 10:10–10:50, turnover to 11:00 = the next booking: fits flush, no gap left.
    const forty = findTimes(world(), tight, request({ plan: { visits: [{ minutes: 40, needsMicroscope: false }] } }));
    expect(firstStart(forty)).toBe('2026-03-02 10:10');
    expect(forty.proposals[0].gapMinutesLeft).toBe(0);
    expect(forty.proposals[0].reasons.join(' ')).toContain('no gap left');
    // 45 min would need the chair to 11:05; next chance is after the operator's lunch 12:00–12:45.
    const fortyFive = findTimes(world(), tight, request({ plan: { visits: [{ minutes: 45, needsMicroscope: false }] } }));
    expect(firstStart(fortyFive)).toBe('2026-03-02 12:45');
  });

  it('uses the requested turnover length', () => {
    const tight: BusyIntervals = { ...noBusy(), chairs: { C1: [span(Z, '2026-03-02 09:00', '2026-03-02 10:00')] } };
    // 50 min from 08:00 ends 08:50; with 15 min turnover the chair is needed to 09:05 > 09:00 → after the booking.
    const r = findTimes(world(), tight, request({ turnoverMinutes: 15, plan: { visits: [{ minutes: 50, needsMicroscope: false }] } }));
    expect(firstStart(r)).toBe('2026-03-02 10:00');
    const r10 = findTimes(world(), tight, request({ turnoverMinutes: 10, plan: { visits: [{ minutes: 50, needsMicroscope: false }] } }));
    expect(firstStart(r10)).toBe('2026-03-02 08:00');
  });
});

describe('microscope', () => {
  const res = world({
    chairs: [
      { id: 'C1', locationId: 'L1' },
      { id: 'C2', locationId: 'L1' },
    ],
    microscopes: [{ id: 'M1', locationId: 'L1', mobile: true }],
  });
  const busy: BusyIntervals = { ...noBusy(), microscopes: { M1: [span(Z, '2026-03-02 08:00', '2026-03-02 09:30')] } };

  it('waits for a busy mobile microscope', () => {
    const r = findTimes(res, busy, request({ plan: { visits: [{ minutes: 60, needsMicroscope: true }] } }));
    expect(firstStart(r)).toBe('2026-03-02 09:30');
    expect(r.proposals[0].visits[0].microscopeId).toBe('M1');
  });

  it('does not wait when the visit needs no microscope', () => {
    const r = findTimes(res, busy, request());
    expect(firstStart(r)).toBe('2026-03-02 08:00');
    expect(r.proposals[0].visits[0].microscopeId).toBeUndefined();
  });

  it('counts only a chair’s own fixed microscope or a mobile one', () => {
    const fixed = world({
      chairs: [
        { id: 'C1', locationId: 'L1', fixedMicroscopeId: 'M1' },
        { id: 'C2', locationId: 'L1' },
      ],
      microscopes: [{ id: 'M1', locationId: 'L1', mobile: false, chairId: 'C1' }],
    });
    const chairBusy: BusyIntervals = { ...noBusy(), chairs: { C1: [span(Z, '2026-03-02 08:00', '2026-03-02 11:00')] } };
    // C2 is free at 08:00 but has no microscope; C1's fixed one frees at 11:00.
    const r = findTimes(fixed, chairBusy, request({ plan: { visits: [{ minutes: 60, needsMicroscope: true }] } }));
    expect(firstStart(r)).toBe('2026-03-02 11:00');
    expect(r.proposals[0].visits[0]).toMatchObject({ chairId: 'C1', microscopeId: 'M1' });
    // Without a microscope need, the microscope chair is left free: C2 is chosen at 08:00 over C1.
    const plain = findTimes(fixed, noBusy(), request());
    expect(plain.proposals[0].visits[0].chairId).toBe('C2');
  });

  it('says so when no microscope is ever free', () => {
    const allDay: BusyIntervals = { ...noBusy(), microscopes: { M1: [span(Z, '2026-03-01 00:00', '2026-03-15 00:00')] } };
    const r = findTimes(res, allDay, request({ plan: { visits: [{ minutes: 60, needsMicroscope: true }] } }));
    expect(r.proposals).toEqual([]);
    expect(r.unplaceable?.code).toBe('no-microscope-free');
    expect(r.unplaceable?.reason).toContain('no microscope free when the operator and a chair are');
  });

  it('says so when the location has no microscope at all', () => {
    const r = findTimes(world(), noBusy(), request({ plan: { visits: [{ minutes: 60, needsMicroscope: true }] } }));
    expect(r.unplaceable?.code).toBe('no-microscope');
  });
});

describe('operator off', () => {
  const monday = span(Z, '2026-03-02 00:00', '2026-03-03 00:00');

  it('skips an operator’s day off', () => {
    const res = world({ operators: [operator('O1', WEEKDAYS_RULE, { timeOff: [monday] })] });
    expect(firstStart(findTimes(res, noBusy(), request()))).toBe('2026-03-03 08:00');
  });

  it('takes another operator when the first is off', () => {
    const res = world({
      chairs: [{ id: 'C1', locationId: 'L1' }],
      operators: [operator('O1', WEEKDAYS_RULE, { timeOff: [monday] }), operator('O2', 'FREQ=WEEKLY;BYDAY=MO')],
    });
    const r = findTimes(res, noBusy(), request());
    expect(firstStart(r)).toBe('2026-03-02 08:00');
    expect(r.proposals[0].visits[0].operatorId).toBe('O2');
  });

  it('reports time off covering the whole horizon', () => {
    const res = world({ operators: [operator('O1', WEEKDAYS_RULE, { timeOff: [span(Z, '2026-02-01 00:00', '2026-04-01 00:00')] })] });
    const r = findTimes(res, noBusy(), request());
    expect(r.unplaceable?.code).toBe('operator-off');
    expect(r.unplaceable?.reason).toContain('operator off (time off)');
  });

  it('reports an operator who never works at the location', () => {
    const elsewhere = operator('O1');
    const res = world({ operators: [{ ...elsewhere, workingRules: elsewhere.workingRules.map((w) => ({ ...w, locationId: 'L2' })) }] });
    const r = findTimes(res, noBusy(), request());
    expect(r.unplaceable?.code).toBe('no-operator-working');
    expect(r.unplaceable?.reason).toContain('no operator working at this location in the horizon');
  });

  it('reports working hours that fall outside the opening hours', () => {
    // Saturday work, but the location is open Mon–Fri only.
    const res = world({ operators: [operator('O1', 'FREQ=WEEKLY;BYDAY=SA')] });
    const r = findTimes(res, noBusy(), request());
    expect(r.unplaceable?.code).toBe('outside-opening-hours');
    expect(r.unplaceable?.reason).toContain('outside opening hours');
  });

  it('reports a fully booked operator and a visit too long for any free stretch', () => {
    const full: BusyIntervals = { ...noBusy(), operators: { O1: [span(Z, '2026-03-01 00:00', '2026-03-15 00:00')] } };
    expect(findTimes(world(), full, request()).unplaceable?.code).toBe('operator-fully-booked');
    // The longest stretch is 12:45–17:00 (255 min); a 300-minute visit fits nowhere.
    const long = findTimes(world(), noBusy(), request({ plan: { visits: [{ minutes: 300, needsMicroscope: false }] } }));
    expect(long.unplaceable?.code).toBe('no-stretch-long-enough');
  });
});

describe('interval between visits', () => {
  const MW = 'FREQ=WEEKLY;BYDAY=MO,WE';
  const plan = { visits: [{ minutes: 60, needsMicroscope: false }, { minutes: 60, needsMicroscope: false, earliestDaysAfterPrevious: 7, latestDaysAfterPrevious: 21 }] };

  it('places visit 2 on the first working day 7–21 days after visit 1, same operator', () => {
    const res = world({ operators: [operator('O1', MW), operator('O2')] });
    const busy: BusyIntervals = {
      ...noBusy(),
      operators: { O1: [span(Z, '2026-03-09 00:00', '2026-03-10 00:00'), span(Z, '2026-03-11 00:00', '2026-03-12 00:00')] },
    };
    const r = findTimes(res, busy, request({ plan, operatorId: 'O1', to: at(Z, '2026-04-30 00:00') }));
    const [v1, v2] = r.proposals[0].visits;
    expect(reading(v1.start, Z)).toBe('2026-03-02 08:00');
    // Mar 9 and 11 are blocked, Mar 16 (Mon) is 14 days after Mar 2.
    expect(reading(v2.start, Z)).toBe('2026-03-16 08:00');
    expect(v2.operatorId).toBe('O1');
    expect(r.proposals[0].reasons.join(' ')).toContain('14 day(s) after visit 1 (allowed 7–21)');
  });

  it('moves visit 1 when its whole window is full', () => {
    const res = world({ operators: [operator('O1', MW)] });
    const busy: BusyIntervals = { ...noBusy(), operators: { O1: [span(Z, '2026-03-09 00:00', '2026-03-24 00:00')] } };
    const r = findTimes(res, busy, request({ plan, to: at(Z, '2026-04-30 00:00') }));
    const [v1, v2] = r.proposals[0].visits;
    // Mon Mar 2's window (Mar 9–23) is full; Wed Mar 4's window (Mar 11–25) has Wed Mar 25 free.
    expect(reading(v1.start, Z)).toBe('2026-03-04 08:00');
    expect(reading(v2.start, Z)).toBe('2026-03-25 08:00');
  });

  it('says so when no visit 2 fits inside the interval', () => {
    const res = world({ operators: [operator('O1', MW)] });
    const busy: BusyIntervals = { ...noBusy(), operators: { O1: [span(Z, '2026-03-09 00:00', '2026-03-14 00:00')] } };
    const r = findTimes(res, busy, request({ plan }));
    expect(r.proposals).toEqual([]);
    expect(r.unplaceable?.code).toBe('no-time-between-visits');
    expect(r.unplaceable?.reason).toContain('no time inside the interval between visits');
  });

  it('says so when the interval reaches past the horizon', () => {
    const r = findTimes(world(), noBusy(), request({ plan, to: at(Z, '2026-03-07 00:00') }));
    expect(r.unplaceable?.code).toBe('interval-past-horizon');
  });

  it('lets another operator take visit 2 when sameOperator is false', () => {
    const res = world({ operators: [operator('O1', 'FREQ=WEEKLY;BYDAY=MO'), operator('O2', 'FREQ=WEEKLY;BYDAY=TU')] });
    const short = { visits: [plan.visits[0], { ...plan.visits[1], earliestDaysAfterPrevious: 1, latestDaysAfterPrevious: 1 }] };
    expect(findTimes(res, noBusy(), request({ plan: short, operatorId: 'O1' })).unplaceable?.code).toBe('no-time-between-visits');
    const r = findTimes(res, noBusy(), request({ plan: short, sameOperator: false }));
    expect(r.proposals[0].visits.map((v) => v.operatorId)).toEqual(['O1', 'O2']);
  });
});

describe('emergency holds', () => {
  const hold: Hold = { operatorId: 'O1', locationId: 'L1', rrule: WEEKDAYS_RULE, startLocal: '08:00', endLocal: '08:30' };
  const res = { ...world(), holds: [hold] };

  it('are not offered to a routine case before they open', () => {
    expect(firstStart(findTimes(res, noBusy(), request()))).toBe('2026-03-02 08:30');
  });

  it('are offered to an urgent case', () => {
    const r = findTimes(res, noBusy(), request({ urgent: true }));
    expect(firstStart(r)).toBe('2026-03-02 08:00');
    expect(r.proposals[0].reasons.join(' ')).toContain('emergency hold (urgent case)');
  });

  it('open at 18:00 local the evening before (Sunday for Monday)', () => {
    const opened = findTimes(res, noBusy(), request({ now: at(Z, '2026-03-01 18:00') }));
    expect(firstStart(opened)).toBe('2026-03-02 08:00');
    expect(opened.proposals[0].reasons.join(' ')).toContain('emergency hold that opened Sun 18:00');
    expect(firstStart(findTimes(res, noBusy(), request({ now: at(Z, '2026-03-01 17:59') })))).toBe('2026-03-02 08:30');
  });

  it('can open a set number of hours before instead', () => {
    const early = { ...res, holds: [{ ...hold, opensHoursBefore: 2 }] };
    expect(firstStart(findTimes(early, noBusy(), request({ now: at(Z, '2026-03-02 06:00') })))).toBe('2026-03-02 08:00');
    expect(firstStart(findTimes(early, noBusy(), request({ now: at(Z, '2026-03-02 05:59') })))).toBe('2026-03-02 08:30');
  });

  it('report only-holds-left when nothing else is free', () => {
    const busy: BusyIntervals = { ...noBusy(), chairs: {}, operators: { O1: [] } };
    const narrow = world({ operators: [{ ...operator('O1'), workingRules: [{ locationId: 'L1', rrule: WEEKDAYS_RULE, startLocal: '08:00', endLocal: '08:30' }] }] });
    const r = findTimes({ ...narrow, holds: [hold] }, busy, request({ plan: { visits: [{ minutes: 30, needsMicroscope: false }] } }));
    expect(r.unplaceable?.code).toBe('only-holds-left');
  });
});

describe('closures', () => {
  it('skip a closed day', () => {
    const res = world({ location: { closures: [{ date: '2026-03-02', reason: 'staff training' }] } });
    expect(firstStart(findTimes(res, noBusy(), request()))).toBe('2026-03-03 08:00');
  });

  it('name the closure when it covers the whole horizon', () => {
    const res = world({ location: { closures: [{ date: '2026-03-02', reason: 'staff training' }] } });
    const r = findTimes(res, noBusy(), request({ to: at(Z, '2026-03-03 00:00') }));
    expect(r.unplaceable?.code).toBe('location-closed');
    expect(r.unplaceable?.reason).toContain('2026-03-02 staff training');
  });

  it('report a horizon with no opening hours at all', () => {
    const r = findTimes(world(), noBusy(), request({ from: at(Z, '2026-03-07 00:00'), to: at(Z, '2026-03-09 00:00') }));
    expect(r.unplaceable?.code).toBe('no-opening-hours');
    expect(r.unplaceable?.reason).toContain('outside opening hours');
  });
});

describe('ranking and diversity', () => {
  it('gives one proposal per half-day, earliest first', () => {
    const r = findTimes(world(), noBusy(), request());
    expect(r.proposals.map((p) => reading(p.visits[0].start, Z))).toEqual([
      '2026-03-02 08:00',
      '2026-03-02 12:45',
      '2026-03-03 08:00',
      '2026-03-03 12:45',
      '2026-03-04 08:00',
    ]);
    expect(r.proposals[0].reasons[0]).toContain('earliest feasible start');
  });

  it('prefers the chair that leaves no unusable gap at an equal start', () => {
    const res = world({
      chairs: [
        { id: 'C1', locationId: 'L1' },
        { id: 'C2', locationId: 'L1' },
      ],
    });
    // C1 has a booking from 09:15: a 60-min visit at 08:00 plus turnover ends 09:10, leaving 5 idle minutes.
    const gappy: BusyIntervals = { ...noBusy(), chairs: { C1: [span(Z, '2026-03-02 09:15', '2026-03-02 12:00')] } };
    const r1 = findTimes(res, gappy, request());
    expect(r1.proposals[0].visits[0].chairId).toBe('C2');
    // With the booking from 09:10 the visit fills C1's stretch exactly: C1 wins, no gap is left.
    const flush: BusyIntervals = { ...noBusy(), chairs: { C1: [span(Z, '2026-03-02 09:10', '2026-03-02 12:00')] } };
    const r2 = findTimes(res, flush, request());
    expect(r2.proposals[0].visits[0].chairId).toBe('C1');
    expect(r2.proposals[0].gapMinutesLeft).toBe(0);
    expect(r2.proposals[0].reasons.join(' ')).toContain('chosen over 1 other');
  });

  it('reports the gap a proposal leaves and flags gaps too short for a visit', () => {
    const busy: BusyIntervals = { ...noBusy(), chairs: { C1: [span(Z, '2026-03-02 08:00', '2026-03-02 08:20'), span(Z, '2026-03-02 09:40', '2026-03-02 17:00')] } };
    // Free 08:20–09:30 (09:40 minus turnover): a 60-min visit at 08:20 leaves 10 min after it.
    const r = findTimes(world(), busy, request());
    expect(reading(r.proposals[0].visits[0].start, Z)).toBe('2026-03-02 08:20');
    expect(r.proposals[0].gapMinutesLeft).toBe(10);
    expect(r.proposals[0].reasons.join(' ')).toContain('too short for another visit');
  });

  it('prefers the operator the patient saw before', () => {
    const res = world({ operators: [operator('O1'), operator('O2')] });
    const r = findTimes(res, noBusy(), request({ previousOperatorId: 'O2' }));
    expect(r.proposals[0].visits[0].operatorId).toBe('O2');
    expect(r.proposals[0].reasons.join(' ')).toContain('saw before');
  });

  it('follows a part-of-day preference', () => {
    const r = findTimes(world(), noBusy(), request({ preferences: { partOfDay: 'afternoon' } }));
    expect(r.proposals).toHaveLength(5);
    for (const p of r.proposals) expect(reading(p.visits[0].start, Z).slice(11)).toBe('12:45');
    expect(r.proposals[0].reasons.join(' ')).toContain('matches the preferred afternoon');
  });

  it('follows a weekday preference (luxon numbering, 3 = Wednesday)', () => {
    const r = findTimes(world(), noBusy(), request({ preferences: { weekdays: [3] } }));
    expect(r.proposals.map((p) => reading(p.visits[0].start, Z))).toEqual([
      '2026-03-04 08:00',
      '2026-03-04 12:45',
      '2026-03-11 08:00',
      '2026-03-11 12:45',
      '2026-03-02 08:00',
    ].sort());
  });

  it('tops up with non-matching slots when too few match, and says so', () => {
    const r = findTimes(world(), noBusy(), request({ preferences: { weekdays: [6] } }));
    expect(r.proposals).toHaveLength(5);
    expect(r.proposals[0].reasons.join(' ')).toContain('outside the preferences');
    expect(r.proposals[0].score).toBeLessThan(100);
  });
});

describe('request limits', () => {
  it('never proposes a start before now', () => {
    const r = findTimes(world(), noBusy(), request({ now: at(Z, '2026-03-02 09:03') }));
    // Next start on the 5-minute grid after 09:03.
    expect(firstStart(r)).toBe('2026-03-02 09:05');
  });

  it('keeps to the grid and the limit', () => {
    const busy: BusyIntervals = { ...noBusy(), chairs: { C1: [span(Z, '2026-03-02 08:00', '2026-03-02 08:07')] } };
    const r = findTimes(world(), busy, request({ gridMinutes: 15, limit: 2 }));
    expect(r.proposals).toHaveLength(2);
    expect(firstStart(r)).toBe('2026-03-02 08:15');
  });

  it('reports an unknown location or operator', () => {
    expect(findTimes(world(), noBusy(), request({ locationId: 'nowhere' })).unplaceable?.code).toBe('no-location');
    expect(findTimes(world(), noBusy(), request({ operatorId: 'nobody' })).unplaceable?.code).toBe('no-operator');
    expect(findTimes(world(), noBusy(), request({ to: at(Z, '2026-03-01 00:00') })).unplaceable?.code).toBe('empty-horizon');
  });
});
