import { describe, expect, it } from 'vitest';
import { buildReferralRequest, formPathFor, initialIntakeValues, todayIn, validateIntake } from './intake-form.util';

describe('formPathFor', () => {
  it('puts every per-tooth error on the tooth picker and keeps nested patient fields', () => {
    expect(formPathFor('teeth.0.tooth')).toBe('teeth');
    expect(formPathFor('teeth')).toBe('teeth');
    expect(formPathFor('patient.phone')).toBe('patient.phone');
    expect(formPathFor('referringDentist.email')).toBe('referringDentist.email');
    expect(formPathFor('patient')).toBe('patientId');
    expect(formPathFor('attachmentIds.1')).toBe('attachments');
    expect(formPathFor('patient.timeZone')).toBeNull();
  });
});

describe('buildReferralRequest', () => {
  const v = { ...initialIntakeValues('2026-02-02'), locationId: '2', patientId: 7, referringDentistId: 3, teeth: ['36', '46'], reason: '  cold pain ' };

  it('sends chosen records by id and the teeth in the practice notation', () => {
    // FDI 36 / 46 = Universal 19 / 30 (references.md, ISO 3950 / HL7 crosswalk checks).
    expect(buildReferralRequest(v, 'universal', [5])).toEqual({
      receivedOn: '2026-02-02',
      locationId: 2,
      urgency: 'routine',
      procedure: 'initial',
      reason: 'cold pain',
      notes: null,
      notation: 'universal',
      teeth: [{ tooth: '19' }, { tooth: '30' }],
      attachmentIds: [5],
      patientId: 7,
      referringDentistId: 3,
    });
    expect(buildReferralRequest(v, 'fdi', []).teeth).toEqual([{ tooth: '36' }, { tooth: '46' }]);
  });

  it('sends a new patient with consent only when given, and confirmNew only when asked', () => {
    const n = { ...v, newPatient: true, patient: { ...v.patient, firstName: ' Ana ', lastName: 'Lark', dateOfBirth: '1984-03-02', smsConsent: false, smsConsentSource: 'verbal at desk' } };
    const body = buildReferralRequest(n, 'fdi', []);
    expect(body.patientId).toBeUndefined();
    expect(body.patient).toMatchObject({ firstName: 'Ana', smsConsent: false, smsConsentSource: null });
    expect(body.patient).not.toHaveProperty('confirmNew');
    expect(buildReferralRequest(n, 'fdi', [], true).patient?.confirmNew).toBe(true);
  });
});

describe('validateIntake', () => {
  it('asks for what the server cannot guess and nothing more', () => {
    expect(Object.keys(validateIntake(initialIntakeValues('2026-02-02'))).sort()).toEqual(['locationId', 'patientId', 'referringDentistId', 'teeth']);
    const n = { ...initialIntakeValues('2026-02-02'), newPatient: true, locationId: '1', referringDentistId: 3, teeth: ['11'] };
    n.patient = { ...n.patient, smsConsent: true, email: 'not-an-address' };
    expect(Object.keys(validateIntake(n)).sort()).toEqual(['patient.dateOfBirth', 'patient.email', 'patient.firstName', 'patient.lastName', 'patient.phone']);
  });
});

describe('todayIn', () => {
  // IANA time zone database via luxon: 00:30 UTC on 2 Dec is still 1 Dec (19:30) in New York.
  it('gives the date at the location, not in the browser', () => {
    const now = new Date('2026-12-02T00:30:00Z');
    expect(todayIn('America/New_York', now)).toBe('2026-12-01');
    expect(todayIn('Europe/Berlin', now)).toBe('2026-12-02');
  });
});
