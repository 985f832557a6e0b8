import type { EstimateTable, EstimateTableInfo } from '@ostium/shared';

// A whole estimate table in the server's shape, with the defaults of design/estimator.md (tray trimmed).
export function table(version = 2): EstimateTable {
  return {
    version,
    gridMinutes: 5,
    longestVisitMinutes: 120,
    turnoverMinutes: 10,
    base: { initial: { anterior: 60, premolar: 75, molar: 90 }, surgery: { anterior: 90, premolar: 90, molar: 120 }, consult: 30, emergency: 45 },
    canalsIncluded: { anterior: 1, premolar: 2, molar: 3 },
    extraCanalMinutes: 15,
    extraCanalProcedures: ['initial', 'retreatment'],
    tierMultiplier: { low: 1, moderate: 1.25, high: 1.5 },
    tierProcedures: ['initial', 'retreatment', 'surgery', 'emergency'],
    addOns: {
      retreatmentRemovalMinutes: 40,
      calcifiedCanalMinutes: 15,
      calcifiedCanalMaxMinutes: 45,
      complicationMinutes: 30,
      limitedOpeningMinutes: 10,
      severeCurvatureMinutes: 15,
      patientManagementMinutes: 10,
      canalProcedures: ['initial', 'retreatment'],
      patientProcedures: ['initial', 'retreatment', 'surgery', 'emergency'],
    },
    twoVisit: { splittableProcedures: ['initial', 'retreatment'], procedures: ['retreatment'], levels: [], acuteAbscessProcedures: ['initial', 'retreatment'], addedVisitSetupMinutes: 0 },
    interval: { minDays: 7, maxDays: 21 },
    microscope: { levels: ['high'], procedures: ['retreatment', 'surgery'], calcifiedCanals: true, maxillaryMolars: true, exemptProcedures: ['consult'] },
    recall: { months: [6, 12], procedures: ['initial', 'retreatment', 'surgery'] },
    thresholds: { curvatureModerateFromDegrees: 10, curvatureHighAboveDegrees: 30, apicalOpeningModerateFromMm: 1, apicalOpeningHighAboveMm: 1.5, toothLengthHighAboveMm: 25 },
    asaClassTwoLevel: 'moderate',
    calibration: { bookingQuantile: 0.5, cellPseudoVisits: 5, operatorPseudoVisits: 10, minVisitsForBand: 20, bandCoverage: 0.8, ratioClip: 3 },
    tray: {
      canalProcedures: ['initial', 'retreatment', 'emergency'],
      glidePath: [{ label: 'Stainless steel hand file (glide path)', size: 10, taper: 0.02 }],
      coronalFlaring: [{ label: 'Coronal flaring instrument', size: 25, taper: 0.08 }],
      shaping: { low: [{ label: 'Shaping file', size: 25, taper: 0.04 }], moderate: [{ label: 'Shaping file', size: 20, taper: 0.04 }], high: [{ label: 'Shaping file', size: 15, taper: 0.04 }] },
      flexibleApical: [{ label: 'Heat-treated flexible file (apical third)', size: 20, taper: 0.04 }],
      betweenVisits: [{ label: 'Calcium hydroxide dressing' }],
      byProcedure: { initial: [{ label: 'Rubber dam kit' }], retreatment: [{ label: 'Rubber dam kit' }], surgery: [{ label: 'Sutures' }], consult: [{ label: 'Cold test spray' }], emergency: [{ label: 'Rubber dam kit' }] },
    },
  };
}

export function info(version = 2): EstimateTableInfo {
  const versions = Array.from({ length: version - 1 }, (_, i) => ({ version: version - i, createdAt: `2026-11-${String(20 + i).padStart(2, '0')}T09:00:00.000Z`, createdBy: 1 }));
  return { version, table: table(version), createdAt: versions[0]?.createdAt ?? null, createdBy: versions[0] ? 1 : null, versions };
}
