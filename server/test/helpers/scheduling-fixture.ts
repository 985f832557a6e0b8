import { DateTime } from 'luxon';
import type { TestApp } from './test-app.js';

export const ZONE = 'America/New_York';
export const OP_PASSWORD = 'fixture-pass-2026';

/** A local wall-clock reading in the fixture's zone as an ISO instant. */
export const at = (date: string, time: string) => DateTime.fromISO(`${date}T${time}`, { zone: ZONE }).toUTC().toISO()!;
/** The local reading 'YYYY-MM-DD HH:mm' of an ISO instant. */
export const local = (iso: string) => DateTime.fromISO(iso).setZone(ZONE).toFormat('yyyy-MM-dd HH:mm');
export const plusDays = (date: string, n: number) => DateTime.fromISO(date).plus({ days: n }).toISODate()!;

export interface SchedulingFixture {
  locationId: number;
  microscopeId: number;
  /** Chair 1 carries the fixed microscope; chair 2 has none. */
  chair1: number;
  chair2: number;
  operators: number[];
  operatorEmails: string[];
  /** A Monday at least three weeks ahead, so holds are still closed and nothing is in the past. */
  monday: string;
  newCase: (opts?: { tooth?: string; urgency?: 'routine' | 'soon' | 'urgent' }) => Promise<{ caseId: number; referralId: number }>;
}

let patientCounter = 0;

/**
 * A location of its own (invented, America/New_York, Mon–Fri 08:00–17:00), two chairs, one microscope fixed
 * to chair 1, and `operatorCount` new endodontists working there Mon–Fri 08:00–12:00.
 */
export async function schedulingFixture(t: TestApp, name: string, operatorCount = 2): Promise<SchedulingFixture> {
  const admin = await t.as('admin');
  const desk = await t.as('frontdesk');
  const weekdays = [1, 2, 3, 4, 5].map((weekday) => ({ weekday, open: '08:00', close: '17:00' }));
  const loc = await admin.post('/api/locations').send({
    name,
    // Long enough that its feed line must be folded.
    address: `${name} Clinic Building, 41 Lantern Wharf Passage, Upper Meadowbrook Industrial Quarter, NY 10002`,
    timeZone: ZONE,
    openingHours: weekdays,
  });
  if (loc.status !== 201) throw new Error(`location: ${loc.status} ${JSON.stringify(loc.body)}`);
  const mic = await admin.post(`/api/locations/${loc.body.id}/microscopes`).send({ name: `${name} scope`, mobile: false });
  const chair1 = await admin.post(`/api/locations/${loc.body.id}/chairs`).send({ name: `${name} 1`, fixedMicroscopeId: mic.body.id });
  const chair2 = await admin.post(`/api/locations/${loc.body.id}/chairs`).send({ name: `${name} 2` });
  if (chair1.status !== 201 || chair2.status !== 201) throw new Error(`chairs: ${JSON.stringify([chair1.body, chair2.body])}`);
  const operators: number[] = [];
  const operatorEmails: string[] = [];
  for (let i = 1; i <= operatorCount; i++) {
    const email = `${name.toLowerCase()}-op${i}@example.test`;
    const u = await admin.post('/api/users').send({ email, name: `Dr. ${name} Operator ${i}`, role: 'endodontist', password: OP_PASSWORD });
    if (u.status !== 201) throw new Error(`user: ${u.status} ${JSON.stringify(u.body)}`);
    const rule = await admin.post(`/api/operators/${u.body.id}/working-rules`).send({ locationId: loc.body.id, rrule: 'FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR', start: '08:00', end: '12:00' });
    if (rule.status !== 201) throw new Error(`rule: ${rule.status} ${JSON.stringify(rule.body)}`);
    operators.push(u.body.id);
    operatorEmails.push(email);
  }
  const monday = DateTime.now().setZone(ZONE).plus({ weeks: 3 }).startOf('week').toISODate()!;
  let dentistId: number | undefined;
  const newCase = async (opts: { tooth?: string; urgency?: 'routine' | 'soon' | 'urgent' } = {}) => {
    patientCounter++;
    const res = await desk.post('/api/referrals').send({
      patient: { firstName: 'Orla', lastName: `${name}-Fenwright-${patientCounter}`, dateOfBirth: '1980-05-0' + ((patientCounter % 9) + 1), phone: '(202) 555-0177' },
      ...(dentistId ? { referringDentistId: dentistId } : { referringDentist: { name: `Dr. ${name} Referrer`, practiceName: `${name} Family Dental`, email: `${name.toLowerCase()}@example.com` } }),
      locationId: loc.body.id,
      urgency: opts.urgency ?? 'routine',
      procedure: 'initial',
      notation: 'fdi',
      teeth: [{ tooth: opts.tooth ?? '36' }],
    });
    if (res.status !== 201) throw new Error(`referral: ${res.status} ${JSON.stringify(res.body)}`);
    dentistId = res.body.referringDentistDetail?.id ?? dentistId;
    return { caseId: res.body.cases[0].id, referralId: res.body.id };
  };
  return { locationId: loc.body.id, microscopeId: mic.body.id, chair1: chair1.body.id, chair2: chair2.body.id, operators, operatorEmails, monday, newCase };
}
