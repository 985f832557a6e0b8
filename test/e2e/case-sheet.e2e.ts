import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { apiAs } from '../support/api.js';
import { baseUrl, launch, signIn } from '../support/browser.js';

const minutes = (text: string | null) => Number((text ?? '').match(/(\d+)\s*min/)?.[1]);

describe('case sheet', () => {
  let browser: Browser;
  let referralId: number;
  beforeAll(async () => {
    browser = await launch();
    const desk = await apiAs('frontdesk@quillfern-endo.test');
    const locations = await desk.get<{ id: number }[]>('/locations');
    const ref = await desk.post<{ id: number }>('/referrals', {
      patient: { firstName: 'Anselm', lastName: 'Bracegirdle', dateOfBirth: '1969-10-21' },
      referringDentist: { name: 'Dr. Wilhelmina Tarrant', email: 'tarrant@example.com' },
      locationId: locations[0].id,
      urgency: 'routine',
      procedure: 'initial',
      notation: 'fdi',
      teeth: [{ tooth: '46' }],
    });
    referralId = ref.id;
  });
  afterAll(async () => browser?.close());

  it('an endodontist sets curvature 35°, sees the level go high and the minutes rise, adjusts with a reason and saves', async () => {
    const page = await browser.newPage({ viewport: { width: 1400, height: 1100 } });
    await signIn(page, 'endo@quillfern-endo.test');
    await page.goto(`${baseUrl()}/referrals/${referralId}`);
    await page.getByRole('link', { name: /Case sheet for tooth 46/ }).click();
    await page.waitForURL(/\/cases\/\d+$/);
    const card = page.getByRole('region', { name: 'Chair-time estimate' });
    await card.getByTestId('total-minutes').waitFor();
    const before = minutes(await card.getByTestId('total-minutes').textContent());
    expect(await card.getByRole('img', { name: /Difficulty: (low|moderate)/ }).count()).toBeGreaterThan(0);

    await page.getByLabel('Curvature in degrees').fill('35');
    await card.getByRole('img', { name: 'Difficulty: high' }).waitFor();
    await page.waitForFunction(() => !document.querySelector('[aria-label="Chair-time estimate"][aria-busy="true"]'));
    const after = minutes(await card.getByTestId('total-minutes').textContent());
    expect(after).toBeGreaterThan(before);
    expect(minutes(await card.getByTestId('breakdown-sum').textContent())).toBe(after);

    await page.getByRole('button', { name: /Adjust minutes/ }).click();
    const editor = page.getByRole('form', { name: 'Adjust chair time' });
    const visit1 = editor.getByLabel('Visit 1 minutes');
    await visit1.fill(String(Math.min(120, after + 10)));
    await editor.getByLabel(/Reason for the change/).fill('Limited opening in the afternoon; needs rests');
    await editor.getByRole('button', { name: 'Apply adjustment' }).click();
    await card.getByTestId('booked-total').waitFor();

    await page.getByRole('button', { name: 'Save and mark planned' }).click();
    const endo = await apiAs('endo@quillfern-endo.test');
    const caseId = Number(page.url().split('/').pop());
    let sheet: { status: string; override: { reason: string } | null; estimate: { level: string } | null } = { status: '', override: null, estimate: null };
    for (let i = 0; i < 25 && sheet.status !== 'planned'; i++) {
      sheet = await endo.get(`/cases/${caseId}`);
      if (sheet.status !== 'planned') await new Promise((r) => setTimeout(r, 200));
    }
    expect(sheet.status).toBe('planned');
    expect(sheet.estimate?.level).toBe('high');
    expect(sheet.override?.reason).toBe('Limited opening in the afternoon; needs rests');
    await page.close();
  });
});
