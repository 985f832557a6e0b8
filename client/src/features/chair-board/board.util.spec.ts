import { describe, expect, it } from 'vitest';
import { ApiError } from '../../lib/api-client';
import { blockLabel, changeRequest, dayWindow, describeConflict, gridHours, makeLookup, NEXT_STATES, problemFrom, toCalendarEvent, weekWindow } from './board.util';
import { appointment, ENDODONTISTS, location } from './test/scheduling.fixtures';

const lookup = (notation: 'fdi' | 'universal' = 'universal') =>
  makeLookup({ notation, locations: [location()], operators: ENDODONTISTS, appointments: [appointment(), appointment({ id: 9, patient: { id: 8, name: 'Sam Example' }, chairId: 2 })] });

describe('dayWindow', () => {
  it('covers the 23-hour local day when New York springs forward', () => {
    // references.md, "Calendars": America/New_York moves 2026-03-08 02:00 → 03:00 (EST −5 → EDT −4).
    expect(dayWindow('2026-03-08', 'America/New_York')).toEqual({ from: '2026-03-08T05:00:00.000Z', to: '2026-03-09T04:00:00.000Z' });
  });

  it('covers the 25-hour local day when New York falls back', () => {
    // references.md, "Calendars": 2026-11-01 02:00 → 01:00 (EDT −4 → EST −5).
    expect(dayWindow('2026-11-01', 'America/New_York')).toEqual({ from: '2026-11-01T04:00:00.000Z', to: '2026-11-02T05:00:00.000Z' });
  });
});

describe('weekWindow', () => {
  it('starts on the Monday of the ISO week', () => {
    // ISO 8601 weeks start on Monday; 2026-03-12 is a Thursday, so the week starts 2026-03-09.
    expect(weekWindow('2026-03-12', 'America/New_York')).toMatchObject({ monday: '2026-03-09', from: '2026-03-09T04:00:00.000Z', to: '2026-03-16T04:00:00.000Z' });
  });
});

describe('gridHours', () => {
  it('widens the day to whole hours and falls back on a closed day', () => {
    const hours = [{ weekday: 1, open: '07:30', close: '16:45' }];
    expect(gridHours(hours, '2026-03-09')).toEqual({ min: '07:00', max: '17:00' });
    expect(gridHours(hours, '2026-03-10')).toEqual({ min: '07:00', max: '19:00' });
  });
});

describe('blockLabel', () => {
  it('names patient, tooth in the practice notation, procedure, local time, chair, state, level and microscope', () => {
    // FDI 36 is Universal 19 (references.md, "Tooth numbering", verified checks).
    expect(blockLabel(appointment(), lookup('universal'))).toBe(
      'Robin Example, tooth 19, Root canal therapy, 09:00 to 10:55, Chair 1, unconfirmed, difficulty high, microscope',
    );
    expect(blockLabel(appointment({ state: 'confirmed', microscopeId: null, level: null }), lookup('fdi'))).toBe('Robin Example, tooth 36, Root canal therapy, 09:00 to 10:55, Chair 1, confirmed');
  });
});

describe('toCalendarEvent', () => {
  it('lets only visits that have not started be dragged, and styles by state', () => {
    expect(toCalendarEvent(appointment())).toMatchObject({ id: '41', startEditable: true, durationEditable: true, className: 'ostium-block ostium-block--booked' });
    expect(toCalendarEvent(appointment({ state: 'seated' }))).toMatchObject({ startEditable: false, durationEditable: false });
  });
});

describe('changeRequest', () => {
  it('sends the version read and only what changed', () => {
    const a = appointment();
    expect(changeRequest(a, { start: '2026-03-09T09:30:00-04:00', end: a.end })).toEqual({ version: 3, start: '2026-03-09T13:30:00.000Z' });
    expect(changeRequest(a, { start: a.start, end: a.end, chairId: 1 })).toEqual({ version: 3 });
  });

  it('takes the fixed microscope of the new chair along, and leaves a visit without one alone', () => {
    const l = lookup();
    expect(changeRequest(appointment({ chairId: 2, microscopeId: 2 }), { chairId: 1 }, l)).toEqual({ version: 3, chairId: 1, microscopeId: 1 });
    expect(changeRequest(appointment({ chairId: 2, microscopeId: null }), { chairId: 1 }, l)).toEqual({ version: 3, chairId: 1 });
    expect(changeRequest(appointment({ chairId: 1, microscopeId: 1 }), { chairId: 2 }, l)).toEqual({ version: 3, chairId: 2 });
  });
});

describe('conflicts', () => {
  const conflict = { visitIndex: 0, resource: 'chair' as const, resourceId: 2, appointmentId: 9, start: '2026-03-09T14:00:00.000Z', end: '2026-03-09T15:00:00.000Z' };

  it('names the resource, the local time and the patient of the booking it collides with', () => {
    expect(describeConflict(conflict, lookup())).toBe('Chair 2 is taken 10:00–11:00 by Sam Example (visit #9)');
    expect(describeConflict({ ...conflict, resource: 'operator', resourceId: 6, appointmentId: 99 }, lookup())).toBe('Dr. Second Endodontist is taken 10:00–11:00 by visit #99');
    expect(describeConflict({ ...conflict, resource: 'microscope', resourceId: 2 }, lookup())).toBe('Microscope Scope B is taken 10:00–11:00 by Sam Example (visit #9)');
  });

  it('tells a stale version from a taken time', () => {
    const taken = new ApiError(409, 'The chair is booked', [], { statusCode: 409, message: 'The chair is booked', conflicts: [conflict] });
    const stale = new ApiError(409, 'Changed by someone else', [], { statusCode: 409, message: 'Changed by someone else', conflicts: [] });
    expect(problemFrom(taken, lookup())).toMatchObject({ title: 'Not moved: the time is taken', conflicts: ['Chair 2 is taken 10:00–11:00 by Sam Example (visit #9)'] });
    expect(problemFrom(stale, lookup())).toMatchObject({ title: 'Not changed: someone else changed this visit first', conflicts: [] });
  });
});

describe('NEXT_STATES', () => {
  it('follows booked → confirmed → arrived → seated → dismissed and ends there', () => {
    // design/scheduling.md, "Appointment states".
    expect(NEXT_STATES.booked).toContain('confirmed');
    expect(NEXT_STATES.confirmed).toContain('arrived');
    expect(NEXT_STATES.arrived).toContain('seated');
    expect(NEXT_STATES.seated).toEqual(['dismissed']);
    expect(NEXT_STATES.dismissed).toEqual([]);
    expect(NEXT_STATES.cancelled).toEqual([]);
  });
});
