// Patients with their own numbers and visits, and signed inbound texts, for the replies, visit-page and
// waitlist-offer API tests.
import { signTwilioRequest } from '@ostium/sms-fake';
import { randomBytes } from 'node:crypto';
import { DateTime } from 'luxon';
import { MessagingClock } from '../../src/messaging/messaging-clock.service.js';
import { OutboxDispatcherService } from '../../src/messaging/outbox-dispatcher.service.js';
import { at, schedulingFixture, ZONE, type SchedulingFixture } from './scheduling-fixture.js';
import type { TestApp } from './test-app.js';

export const INBOUND_PATH = '/api/sms/inbound';

let counter = 0;

export interface PatientCase {
  patientId: number;
  caseId: number;
  referralId: number;
  /** E.164, as stored. */
  phone: string;
  name: string;
}

export interface RepliesWorld {
  f: SchedulingFixture;
  /** A new patient with a number of its own (NANP fictional 555-01xx in `areaCode`) and one case. */
  patient: (opts?: { consent?: boolean; phone?: string; email?: string | null; assessed?: boolean; timeZone?: string }) => Promise<PatientCase>;
  /** Books one visit of the case on the fixture's chair 2 with operator 1, local times in America/New_York. */
  book: (caseId: number, day: string, from: string, to: string, opts?: { chairId?: number; operatorId?: number }) => Promise<{ id: number; version: number; start: string; state: string }>;
}

export async function repliesWorld(t: TestApp, name: string, areaCode: string): Promise<RepliesWorld> {
  const f = await schedulingFixture(t, name, 2);
  const desk = await t.as('frontdesk');
  const endo = await t.as('endodontist');
  let line = 100;
  const patient: RepliesWorld['patient'] = async (opts = {}) => {
    counter++;
    const phone = opts.phone ?? `+1${areaCode}55501${String(line++ - 100).padStart(2, '0')}`;
    if (line > 200) throw new Error('out of fictional numbers for this area code');
    const lastName = `${name}-Quarrie-${counter}`;
    const res = await desk.post('/api/referrals').send({
      patient: {
        firstName: 'Ansel',
        lastName,
        dateOfBirth: `1975-0${(counter % 9) + 1}-1${counter % 10}`,
        phone,
        ...(opts.email !== null ? { email: opts.email ?? `ansel.${counter}@example.com` } : {}),
        smsConsent: opts.consent ?? true,
        ...(opts.consent ?? true ? { smsConsentSource: 'intake form' } : {}),
        ...(opts.timeZone ? { timeZone: opts.timeZone } : {}),
      },
      referringDentist: { name: `Dr. ${name} Referrer ${counter}`, practiceName: `${name} Dental ${counter}`, email: `ref${counter}@example.com` },
      locationId: f.locationId,
      urgency: 'routine',
      procedure: 'initial',
      notation: 'fdi',
      teeth: [{ tooth: '14' }],
    });
    if (res.status !== 201) throw new Error(`referral: ${res.status} ${JSON.stringify(res.body)}`);
    const caseId = res.body.cases[0].id as number;
    if (opts.assessed) {
      const sheet = await endo.patch(`/api/cases/${caseId}`).send({ assessment: {} });
      if (sheet.status !== 200) throw new Error(`case sheet: ${sheet.status} ${JSON.stringify(sheet.body)}`);
    }
    return { patientId: res.body.patient.id ?? res.body.patientId, caseId, referralId: res.body.id, phone, name: `Ansel ${lastName}` };
  };
  const book: RepliesWorld['book'] = async (caseId, day, from, to, opts = {}) => {
    const res = await desk.post('/api/appointments').send({
      caseId,
      visits: [{ start: at(day, from), end: at(day, to), chairId: opts.chairId ?? f.chair2, operatorId: opts.operatorId ?? f.operators[0] }],
    });
    if (res.status !== 201) throw new Error(`booking: ${res.status} ${JSON.stringify(res.body)}`);
    return res.body.appointments[0];
  };
  return { f, patient, book };
}

export interface InboundOptions {
  from: string;
  body: string;
  sid?: string;
  accountSid?: string;
  /** Sign with another token. */
  signWith?: string;
  /** Change the body after signing (a tampered request). */
  tamperBody?: string;
  /** Sign over this URL instead of the configured public URL. */
  signUrl?: string;
  noSignature?: boolean;
}

export const newSid = () => `SM${randomBytes(16).toString('hex')}`;

/** The provider's inbound webhook as it posts it (form fields as the SMS fake sends them), signed. */
export function inbound(t: TestApp, o: InboundOptions) {
  const sid = o.sid ?? newSid();
  const params: Record<string, string> = {
    ToCountry: 'US',
    SmsMessageSid: sid,
    NumMedia: '0',
    SmsSid: sid,
    SmsStatus: 'received',
    Body: o.body,
    FromCountry: 'US',
    To: t.config.sms.fromNumber,
    NumSegments: '1',
    MessageSid: sid,
    AccountSid: o.accountSid ?? t.config.sms.accountSid,
    From: o.from,
    ApiVersion: '2010-04-01',
  };
  const url = o.signUrl ?? `${t.config.publicUrl}${INBOUND_PATH}`;
  const signature = signTwilioRequest(o.signWith ?? t.config.sms.authToken, url, params);
  const sent = o.tamperBody !== undefined ? { ...params, Body: o.tamperBody } : params;
  const req = t.http().post(INBOUND_PATH).type('form').send(sent);
  return o.noSignature ? req : req.set('X-Twilio-Signature', signature);
}

/** Now, when the New York clock reads inside the 08:00–21:00 texting window; else the window's next 10:00 (within a day). */
export function textingNow(): Date {
  const now = DateTime.now().setZone(ZONE);
  if (now.hour >= 8 && now.hour < 21) return now.toJSDate();
  const ten = now.set({ hour: 10, minute: 0, second: 0, millisecond: 0 });
  return (now.hour >= 21 ? ten.plus({ days: 1 }) : ten).toJSDate();
}

/** Fixes the messaging clock (outbox, replies, waitlist offers) at `at`, or lets it run again with null. */
export function setClock(t: TestApp, at: Date | null) {
  const clock = t.app.get(MessagingClock);
  clock.now = at ? () => new Date(at.getTime()) : () => new Date();
}

/** Runs the outbox job (off in tests) until nothing due is left, at the messaging clock's now or at `now`. */
export async function drain(t: TestApp, now?: Date) {
  const job = t.app.get(OutboxDispatcherService);
  const at = now ?? t.app.get(MessagingClock).now();
  let sent = 0;
  for (let i = 0; i < 20; i++) {
    const r = await job.drainOnce(at);
    sent += r.sent;
    if (r.claimed === 0) break;
  }
  return sent;
}
