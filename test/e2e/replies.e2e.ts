import { startSmsFake } from '@ostium/sms-fake';
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { apiAs } from '../support/api.js';
import { baseUrl, launch, signIn } from '../support/browser.js';

interface BoardAppointment {
  id: number;
  start: string;
  state: string;
  locationId: number;
  patient: { id: number; name: string };
}
interface Patient { id: number; lastName: string; phone: string | null; smsConsent: boolean }

// The provider signs an inbound webhook with the account's auth token (references.md: request
// validation); the stand-in signs with the same local token the built server was started with.
const ACCOUNT_SID = process.env.TWILIO_ACCOUNT_SID ?? 'AC00000000000000000000000000000000';
const AUTH_TOKEN = process.env.TWILIO_AUTH_TOKEN ?? 'local-fake-auth-token';

describe('a patient confirms by text', () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launch();
  });
  afterAll(async () => browser?.close());

  it('a "C" reply turns the block on the Chair board to confirmed', async () => {
    const desk = await apiAs('frontdesk@quillfern-endo.test');
    const from = new Date(Date.now() + 60 * 60_000).toISOString();
    const to = new Date(Date.now() + 60 * 86_400_000).toISOString();
    const upcoming = (await desk.get<BoardAppointment[]>(`/appointments?from=${from}&to=${to}`)).sort((a, b) => a.start.localeCompare(b.start));
    // The reply is matched to the patient's next visit: pick a patient whose next visit is unconfirmed.
    let target: { appointment: BoardAppointment; patient: Patient } | null = null;
    for (const a of upcoming) {
      const next = upcoming.find((b) => b.patient.id === a.patient.id)!;
      if (next.id !== a.id || a.state !== 'booked') continue;
      const patient = await desk.get<Patient>(`/patients/${a.patient.id}`);
      if (patient.phone) {
        target = { appointment: a, patient };
        break;
      }
    }
    expect(target, 'the demo has an unconfirmed upcoming visit of a patient with a phone').not.toBeNull();
    const { appointment, patient } = target!;

    const page = await browser.newPage({ viewport: { width: 1400, height: 1200 } });
    await signIn(page, 'frontdesk@quillfern-endo.test');
    const locations = await desk.get<{ id: number; timeZone: string }[]>('/locations');
    const zone = locations.find((l) => l.id === appointment.locationId)!.timeZone;
    const localDay = new Intl.DateTimeFormat('en-CA', { timeZone: zone }).format(new Date(appointment.start));
    await page.goto(`${baseUrl()}/board?date=${localDay}&locationId=${appointment.locationId}`);
    const block = page.locator('.ostium-block', { hasText: patient.lastName }).first();
    await block.waitFor();
    // innerText carries the badge's upper-case styling, so the state is matched without case.
    await expect.poll(() => block.innerText()).toMatch(/unconfirmed/i);

    const fake = await startSmsFake({ port: 0, accountSid: ACCOUNT_SID, authToken: AUTH_TOKEN, inboundUrl: `${baseUrl()}/api/sms/inbound` });
    try {
      const answer = await fake.reply({ from: patient.phone!, body: 'C' });
      expect(answer.status).toBe(200);
    } finally {
      await fake.close();
    }

    const after = await desk.get<BoardAppointment>(`/appointments/${appointment.id}`);
    expect(after.state).toBe('confirmed');
    await page.reload();
    const confirmed = page.locator('.ostium-block', { hasText: patient.lastName }).first();
    await confirmed.waitFor();
    await expect.poll(() => confirmed.innerText(), { timeout: 10_000 }).toMatch(/(^|\s)confirmed/i);
    expect(await confirmed.innerText()).not.toMatch(/unconfirmed/i);
    await page.close();
  });
});
