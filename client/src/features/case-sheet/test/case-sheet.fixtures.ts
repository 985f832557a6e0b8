import { FACTOR_KEYS, type CaseSheet, type EstimateResult, type FactorDefinition, type FactorGroup, type FactorKey, type Level, type PracticeSummary } from '@ostium/shared';
import { sessionStore } from '../../../lib/session';
import type { Role } from '@ostium/shared';

// Test data for the case-sheet screens, in the server's shapes; all names and numbers are made up.

const LABELS: Record<FactorKey, [string, FactorGroup]> = {
  medicalHistory: ['Medical history', 'patient'],
  anaesthesia: ['Local anaesthesia', 'patient'],
  disposition: ['Patient disposition', 'patient'],
  mouthOpening: ['Mouth opening', 'patient'],
  gagReflex: ['Gag reflex', 'patient'],
  emergency: ['Pain and swelling', 'patient'],
  diagnosis: ['Diagnostic complexity', 'tooth'],
  radiographs: ['Radiographic difficulty', 'tooth'],
  archPosition: ['Position in the arch', 'tooth'],
  isolation: ['Isolation', 'tooth'],
  crownMorphology: ['Crown', 'tooth'],
  canalMorphology: ['Canal and root shape', 'tooth'],
  canalVisibility: ['Canal visibility', 'tooth'],
  resorption: ['Resorption', 'tooth'],
  apicalOpening: ['Apical opening', 'tooth'],
  toothLength: ['Tooth length', 'tooth'],
  traumaHistory: ['Trauma history', 'additional'],
  previousTreatment: ['Earlier endodontic treatment', 'additional'],
  perioEndo: ['Periodontal–endodontic condition', 'additional'],
};

const SET_BY: Partial<Record<FactorKey, FactorDefinition['setByFact']>> = {
  medicalHistory: 'asaClass',
  canalMorphology: 'curvatureDegrees',
  canalVisibility: 'calcifiedCanals',
  apicalOpening: 'apicalOpeningMm',
  toothLength: 'toothLengthMm',
  previousTreatment: 'complications',
};

export const FACTORS: FactorDefinition[] = FACTOR_KEYS.map((key) => ({
  key,
  label: LABELS[key][0],
  group: LABELS[key][1],
  levels:
    key === 'canalMorphology'
      ? { low: 'Curved under 10°', moderate: 'Curved 10° to 30°', high: 'Curved over 30°, or S-shaped' }
      : { low: `${LABELS[key][0]}: no trouble`, moderate: `${LABELS[key][0]}: some trouble`, high: `${LABELS[key][0]}: much trouble` },
  ...(SET_BY[key] ? { setByFact: SET_BY[key] } : {}),
  ...(key === 'archPosition' ? { derivedFromTooth: true } : {}),
}));

export const allLow = (over: Partial<Record<FactorKey, Level>> = {}) =>
  ({ ...Object.fromEntries(FACTOR_KEYS.map((k) => [k, 'low'])), ...over }) as Record<FactorKey, Level>;

/** A lower left first molar, initial treatment, moderate from its arch position: one visit of 115 min. */
export function estimate(over: Partial<EstimateResult> = {}): EstimateResult {
  return {
    level: 'moderate',
    levelReasons: ['archPosition'],
    cbctSuggested: true,
    assessment: allLow({ archPosition: 'moderate' }),
    toothFdi: '36',
    toothGroup: 'molar',
    canals: 3,
    canalsAssumed: true,
    visits: [{ index: 1, minutes: 115, turnoverMinutes: 10, needsMicroscope: false, purpose: 'Access, cleaning and shaping, root canal filling' }],
    totalMinutes: 115,
    breakdown: [
      { label: 'Base: root canal therapy, molar tooth, up to 3 canals', minutes: 90 },
      { label: 'Difficulty moderate: ×1.25', minutes: 23 },
      { label: 'Rounded up to the 5-minute booking grid', minutes: 2 },
    ],
    tableVersion: 2,
    trayList: [
      { label: 'Stainless steel hand file (glide path)', size: 10, taper: 0.02, colour: 'purple' },
      { label: 'Shaping file', size: 25, taper: 0.04, colour: 'red' },
      { label: 'Rubber dam kit' },
    ],
    recallMonths: [6, 12],
    notes: [],
    ...over,
  };
}

/** The same tooth once curvature is over 30°: high, two visits with a microscope. */
export function highEstimate(): EstimateResult {
  return estimate({
    level: 'high',
    levelReasons: ['canalMorphology'],
    assessment: allLow({ archPosition: 'moderate', canalMorphology: 'high' }),
    visits: [
      { index: 1, minutes: 90, turnoverMinutes: 10, needsMicroscope: true, purpose: 'Access, cleaning and shaping; calcium hydroxide dressing' },
      { index: 2, minutes: 60, turnoverMinutes: 10, needsMicroscope: true, purpose: 'Root canal filling (obturation)', earliestDaysAfterPrevious: 7, latestDaysAfterPrevious: 21 },
    ],
    totalMinutes: 150,
    breakdown: [
      { label: 'Base: root canal therapy, molar tooth, up to 3 canals', minutes: 90 },
      { label: 'Difficulty high: ×1.5', minutes: 45 },
      { label: 'Severe curvature (over 30° or S-shaped)', minutes: 15 },
      { label: 'Split into 2 visits (longer than the 120-minute longest visit)', minutes: 0 },
    ],
  });
}

export function caseSheet(over: Partial<CaseSheet> = {}): CaseSheet {
  return {
    id: 7,
    referralId: 12,
    toothFdi: '36',
    procedure: 'initial',
    status: 'triaged',
    patient: { id: 3, name: 'Robin Example', dateOfBirth: '1980-04-02' },
    referral: { id: 12, urgency: 'routine', locationId: 1, reason: 'Lingering pain to cold', receivedOn: '2026-11-30' },
    canals: null,
    assessment: {},
    facts: {},
    operatorId: null,
    estimate: null,
    tableVersion: null,
    override: null,
    bookedMinutesPerVisit: null,
    history: [],
    updatedAt: '2026-12-01T09:00:00.000Z',
    ...over,
  };
}

export function practice(toothNotation: 'fdi' | 'universal' = 'universal'): PracticeSummary {
  return { id: 1, name: 'Test Practice', phone: '555-0142', email: 'desk@example.com', settings: { toothNotation, bookingGridMinutes: 5, lateCancellationHours: 24 } };
}

export function signInAs(role: Role) {
  sessionStore.set({ accessToken: 't', user: { id: 5, email: `${role}@example.com`, name: `Dr. Test ${role}`, role } });
}
