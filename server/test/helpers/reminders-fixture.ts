import { DateTime } from 'luxon';
import type { OutboxMessageRow } from '../../src/messaging/models/outbox-message.model.js';
import type { TestApp } from './test-app.js';

/** A local wall-clock reading in a zone as an ISO instant. */
export const wall = (zone: string, date: string, time: string) => DateTime.fromISO(`${date}T${time}`, { zone }).toUTC().toISO()!;
/** 'YYYY-MM-DD HH:mm' of an instant in a zone. */
export const reading = (zone: string, at: Date | string) => DateTime.fromJSDate(new Date(at), { zone }).toFormat('yyyy-MM-dd HH:mm');

export interface ReminderPatient {
  caseId: number;
  patientId: number;
  /** E.164 as stored. */
  phone: string;
  email: string | null;
}

let counter = 0;
let dentistId: number | undefined;

/**
 * A referral with one case for a new patient of the demo practice (invented name, a number in the
 * fictional 555-01xx range, e-mail under example.com), text consent and zone as asked.
 */
export async function reminderPatient(
  t: TestApp,
  locationId: number,
  opts: { consent?: boolean; email?: string | null; timeZone?: string; phoneSuffix: number },
): Promise<ReminderPatient> {
  counter++;
  const desk = await t.as('frontdesk');
  if (opts.phoneSuffix < 0 || opts.phoneSuffix > 99) throw new Error('phone numbers stay inside 555-0100…0199');
  const email = opts.email === undefined ? `ilka.remindwell.${counter}.${opts.phoneSuffix}@example.com` : opts.email;
  const res = await desk.post('/api/referrals').send({
    patient: {
      firstName: 'Ilka',
      lastName: `Remindwell-${opts.phoneSuffix}-${counter}`,
      dateOfBirth: '1985-04-12',
      phone: `(202) 555-01${String(opts.phoneSuffix).padStart(2, '0')}`,
      email,
      smsConsent: opts.consent ?? true,
      ...(opts.consent === false ? {} : { smsConsentSource: 'intake form' }),
      ...(opts.timeZone ? { timeZone: opts.timeZone } : {}),
    },
    ...(dentistId ? { referringDentistId: dentistId } : { referringDentist: { name: 'Dr. Maple Remindsworth', practiceName: 'Remindsworth Dental', email: 'remindsworth@example.com' } }),
    locationId,
    urgency: 'routine',
    procedure: 'initial',
    notation: 'fdi',
    teeth: [{ tooth: '36' }],
  });
  if (res.status !== 201) throw new Error(`referral: ${res.status} ${JSON.stringify(res.body)}`);
  dentistId = res.body.referringDentistDetail?.id ?? dentistId;
  return { caseId: res.body.cases[0].id, patientId: res.body.patientDetail.id, phone: res.body.patientDetail.phone, email: res.body.patientDetail.email };
}

/** A location of its own in a zone, with one chair (no microscope). */
export async function reminderLocation(t: TestApp, name: string, timeZone: string): Promise<{ locationId: number; chairId: number }> {
  const admin = await t.as('admin');
  const weekdays = [1, 2, 3, 4, 5, 6, 7].map((weekday) => ({ weekday, open: '07:00', close: '20:00' }));
  const loc = await admin.post('/api/locations').send({ name, address: `1 ${name} Row, Testville`, timeZone, openingHours: weekdays });
  if (loc.status !== 201) throw new Error(`location: ${loc.status} ${JSON.stringify(loc.body)}`);
  const chair = await admin.post(`/api/locations/${loc.body.id}/chairs`).send({ name: `${name} chair` });
  if (chair.status !== 201) throw new Error(`chair: ${chair.status} ${JSON.stringify(chair.body)}`);
  return { locationId: loc.body.id, chairId: chair.body.id };
}

/** Books visits through the API (the booking guard and its event), returning the appointments. */
export async function book(t: TestApp, caseId: number, visits: { start: string; end: string; chairId: number; operatorId: number }[]) {
  const res = await (await t.as('frontdesk')).post('/api/appointments').send({ caseId, visits });
  if (res.status !== 201) throw new Error(`booking: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body.appointments as { id: number; seriesId: string; version: number; start: string }[];
}

/** The rows of a patient, keyed by rule id. */
export function byRule(rows: OutboxMessageRow[]): Record<string, OutboxMessageRow> {
  return Object.fromEntries(rows.map((r) => [r.ruleId ?? r.purpose, r]));
}
