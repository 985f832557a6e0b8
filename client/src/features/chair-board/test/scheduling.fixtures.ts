import type { Appointment, ChairsideDay, LocationSummary, UserSummary } from '@ostium/shared';

// Test data for the scheduling screens, in the server's shapes; every name and number is made up.

/** One location in New York with two chairs; chair 1 has microscope 1 fixed, microscope 2 is mobile. */
export function location(over: Partial<LocationSummary> = {}): LocationSummary {
  return {
    id: 1,
    name: 'Harbour Street',
    address: '1 Example Way',
    phone: '555-0110',
    timeZone: 'America/New_York',
    openingHours: [1, 2, 3, 4, 5].map((weekday) => ({ weekday, open: '08:00', close: '17:00' })),
    chairs: [
      { id: 1, name: 'Chair 1', locationId: 1, fixedMicroscopeId: 1 },
      { id: 2, name: 'Chair 2', locationId: 1, fixedMicroscopeId: null },
    ],
    microscopes: [
      { id: 1, name: 'Scope A', mobile: false, locationId: 1 },
      { id: 2, name: 'Scope B', mobile: true, locationId: 1 },
    ],
    ...over,
  };
}

export const ENDODONTISTS: UserSummary[] = [
  { id: 5, email: 'endo@example.com', name: 'Dr. Test Endodontist', role: 'endodontist', active: true, lastSignInAt: null, createdAt: '2026-01-01T00:00:00Z' },
  { id: 6, email: 'endo2@example.com', name: 'Dr. Second Endodontist', role: 'endodontist', active: true, lastSignInAt: null, createdAt: '2026-01-01T00:00:00Z' },
];

/** Robin Example, lower left first molar (FDI 36), Monday 9 March 2026 09:00–10:55 New York time (13:00Z, after the DST change). */
export function appointment(over: Partial<Appointment> = {}): Appointment {
  return {
    id: 41,
    version: 3,
    seriesId: 'a1b2c3d4-series',
    visitIndex: 0,
    caseId: 7,
    referralId: 12,
    patient: { id: 3, name: 'Robin Example' },
    toothFdi: '36',
    procedure: 'initial',
    level: 'high',
    start: '2026-03-09T13:00:00.000Z',
    end: '2026-03-09T14:55:00.000Z',
    turnoverMinutes: 10,
    chairId: 1,
    locationId: 1,
    operatorId: 5,
    microscopeId: 1,
    state: 'booked',
    confirmedAt: null,
    confirmedVia: null,
    cancellation: null,
    seatedAt: null,
    dismissedAt: null,
    notes: null,
    ...over,
  };
}

export function chairsideDay(): ChairsideDay {
  const a = appointment();
  return {
    date: '2026-03-09',
    locationId: 1,
    chairs: [
      {
        chairId: 1,
        chairName: 'Chair 1',
        visits: [
          {
            ...a,
            minutes: 115,
            needsMicroscope: true,
            trayList: [
              { label: 'Stainless steel hand file (glide path)', size: 10, taper: 0.02, colour: 'purple' },
              { label: 'Shaping file', size: 25, taper: 0.04, colour: 'red' },
              { label: 'Rubber dam kit' },
            ],
          },
        ],
      },
      {
        chairId: 2,
        chairName: 'Chair 2',
        visits: [
          {
            ...appointment({ id: 42, patient: { id: 4, name: 'Sam Example' }, toothFdi: '11', procedure: 'retreatment', level: 'low', chairId: 2, microscopeId: null, start: '2026-03-09T15:00:00.000Z', end: '2026-03-09T16:00:00.000Z', state: 'confirmed' }),
            minutes: 60,
            needsMicroscope: false,
            trayList: [{ label: 'Finishing file', size: 40, taper: 0.06, colour: 'black' }],
          },
        ],
      },
    ],
  };
}
