import { DateTime } from 'luxon';
import { formatTooth, type CreateReferralRequest, type LetterChannel, type PreferredChannel, type Procedure, type ToothNotation, type Urgency } from '@ostium/shared';

/** The Intake form's values; the shape mirrors CreateReferralRequest so server field names map one to one. */
export interface IntakeValues {
  patientId: number | null;
  newPatient: boolean;
  patient: {
    firstName: string;
    lastName: string;
    dateOfBirth: string;
    phone: string;
    email: string;
    preferredChannel: PreferredChannel;
    smsConsent: boolean;
    smsConsentSource: string;
  };
  referringDentistId: number | null;
  newReferringDentist: boolean;
  referringDentist: {
    name: string;
    practiceName: string;
    email: string;
    phone: string;
    letterChannel: LetterChannel;
  };
  receivedOn: string;
  locationId: string | null;
  urgency: Urgency;
  procedure: Procedure;
  /** FDI, the stored form; shown and sent in the practice's notation. */
  teeth: string[];
  reason: string;
  notes: string;
}

/** Today's date where the referral is received (the desk's browser may sit in another zone, e.g. UTC). */
export function todayIn(timeZone: string | undefined, now: Date = new Date()): string {
  const d = DateTime.fromJSDate(now).setZone(timeZone ?? 'local');
  return (d.isValid ? d : DateTime.fromJSDate(now)).toISODate()!;
}

export function initialIntakeValues(today: string): IntakeValues {
  return {
    patientId: null,
    newPatient: false,
    patient: { firstName: '', lastName: '', dateOfBirth: '', phone: '', email: '', preferredChannel: 'text', smsConsent: false, smsConsentSource: '' },
    referringDentistId: null,
    newReferringDentist: false,
    referringDentist: { name: '', practiceName: '', email: '', phone: '', letterChannel: 'email' },
    receivedOn: today,
    locationId: null,
    urgency: 'routine',
    procedure: 'initial',
    teeth: [],
    reason: '',
    notes: '',
  };
}

const orNull = (s: string) => (s.trim() === '' ? null : s.trim());

/** The POST /api/referrals body. Teeth go in the practice's notation so the server's messages quote what the user typed. */
export function buildReferralRequest(v: IntakeValues, notation: ToothNotation, attachmentIds: number[], confirmNew = false): CreateReferralRequest {
  const body: CreateReferralRequest = {
    receivedOn: v.receivedOn || undefined,
    locationId: Number(v.locationId),
    urgency: v.urgency,
    procedure: v.procedure,
    reason: orNull(v.reason),
    notes: orNull(v.notes),
    notation,
    teeth: v.teeth.map((f) => ({ tooth: formatTooth(f, notation) })),
    attachmentIds,
  };
  if (v.newPatient || v.patientId === null) {
    const p = v.patient;
    body.patient = {
      firstName: p.firstName.trim(),
      lastName: p.lastName.trim(),
      dateOfBirth: p.dateOfBirth,
      phone: orNull(p.phone),
      email: orNull(p.email),
      preferredChannel: p.preferredChannel,
      smsConsent: p.smsConsent,
      smsConsentSource: p.smsConsent ? orNull(p.smsConsentSource) : null,
      ...(confirmNew ? { confirmNew: true } : {}),
    };
  } else {
    body.patientId = v.patientId;
  }
  if (v.newReferringDentist || v.referringDentistId === null) {
    const d = v.referringDentist;
    body.referringDentist = { name: d.name.trim(), practiceName: orNull(d.practiceName), email: orNull(d.email), phone: orNull(d.phone), letterChannel: d.letterChannel };
  } else {
    body.referringDentistId = v.referringDentistId;
  }
  return body;
}

const FORM_PATHS = new Set([
  'patientId',
  'patient.firstName',
  'patient.lastName',
  'patient.dateOfBirth',
  'patient.phone',
  'patient.email',
  'patient.preferredChannel',
  'patient.smsConsent',
  'patient.smsConsentSource',
  'referringDentistId',
  'referringDentist.name',
  'referringDentist.practiceName',
  'referringDentist.email',
  'referringDentist.phone',
  'referringDentist.letterChannel',
  'receivedOn',
  'locationId',
  'urgency',
  'procedure',
  'teeth',
  'reason',
  'notes',
]);

/** Where a server error field (`patient.phone`, `teeth.0.tooth`) shows on the form; null when no input matches. */
export function formPathFor(serverField: string): string | null {
  if (/^teeth(\.|$)/.test(serverField)) return 'teeth';
  if (/^attachmentIds(\.|$)/.test(serverField)) return 'attachments';
  if (serverField === 'patient') return 'patientId';
  if (serverField === 'referringDentist') return 'referringDentistId';
  return FORM_PATHS.has(serverField) ? serverField : null;
}

const EMAIL = /^[^\s@]+@[^\s@]+\.[^\s@]+$/;

/** Checks the form can make a request at all; the server judges the rest (phone numbers, dates, teeth). */
export function validateIntake(v: IntakeValues): Record<string, string> {
  const e: Record<string, string> = {};
  if (v.newPatient) {
    if (!v.patient.firstName.trim()) e['patient.firstName'] = 'Enter the first name';
    if (!v.patient.lastName.trim()) e['patient.lastName'] = 'Enter the last name';
    if (!v.patient.dateOfBirth) e['patient.dateOfBirth'] = 'Enter the date of birth';
    if (v.patient.email.trim() && !EMAIL.test(v.patient.email.trim())) e['patient.email'] = 'Enter an e-mail address like name@example.com';
    if (v.patient.smsConsent && !v.patient.phone.trim()) e['patient.phone'] = 'Text messages need a phone number';
  } else if (v.patientId === null) {
    e.patientId = 'Find the patient, or choose “New patient”';
  }
  if (v.newReferringDentist) {
    if (!v.referringDentist.name.trim()) e['referringDentist.name'] = "Enter the dentist's name";
    if (v.referringDentist.email.trim() && !EMAIL.test(v.referringDentist.email.trim())) e['referringDentist.email'] = 'Enter an e-mail address like name@example.com';
  } else if (v.referringDentistId === null) {
    e.referringDentistId = 'Find the referring dentist, or choose “New referring dentist”';
  }
  if (!v.locationId) e.locationId = 'Choose the location';
  if (v.teeth.length === 0) e.teeth = 'Pick at least one tooth';
  return e;
}
