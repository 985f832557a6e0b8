import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { baseUrl, launch, signIn } from '../support/browser.js';
import { tinyPng } from '../support/files.js';

const inbox = `http://127.0.0.1:${process.env.MAIL_WEB_PORT ?? 1081}/api/email`;

describe('intake, start to finish', () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launch();
  });
  afterAll(async () => browser?.close());

  it('the front desk enters a referral with two teeth and a radiograph and finds it in the queue', async () => {
    const page = await browser.newPage({ viewport: { width: 1400, height: 1000 } });
    await signIn(page, 'frontdesk@quillfern-endo.test');
    const started = Date.now();
    await page.goto(`${baseUrl()}/intake`);

    await page.getByRole('combobox', { name: 'Patient' }).fill('Ferelith Quade');
    await page.getByRole('option', { name: /New patient “Ferelith Quade”/ }).click();
    await page.getByLabel('Date of birth').fill('1984-03-09');
    await page.getByLabel('Phone', { exact: true }).fill('(202) 555-0177');

    await page.getByRole('combobox', { name: 'Referring dentist' }).fill('Farrow');
    await page.getByRole('option', { name: /Ottilie Farrow/ }).first().click();

    await page.getByLabel('Tooth numbers (Universal)').fill('19, 30');
    await page.getByRole('button', { name: /Tooth 19 \(FDI 36\)/ }).waitFor();
    expect(await page.getByRole('button', { name: /Tooth 19 \(FDI 36\)/ }).getAttribute('aria-pressed')).toBe('true');

    await page.locator('input[type=file]').setInputFiles({ name: 'bitewing-19.png', mimeType: 'image/png', buffer: tinyPng() });
    await page.getByRole('listitem', { name: 'bitewing-19.png' }).waitFor();
    await page.getByRole('button', { name: 'Save referral' }).click();
    await page.waitForURL(/\/referrals\/\d+$/);
    const seconds = (Date.now() - started) / 1000;
    console.log(`intake: referral with two teeth and a radiograph entered in ${seconds.toFixed(1)} s of browser time`);
    const referralId = page.url().split('/').pop();

    await page.getByRole('heading', { name: /Ferelith Quade/ }).waitFor();
    const cases = page.getByRole('table', { name: 'Cases' });
    expect(await cases.getByRole('row').count()).toBe(3); // header + two teeth
    await page.getByRole('img', { name: /bitewing-19\.png/ }).first().waitFor();

    // Newest first: the referral just taken is on top.
    await page.goto(`${baseUrl()}/referrals?sort=received&order=desc`);
    const firstRow = page.getByRole('row').nth(1);
    await firstRow.getByText('Ferelith Quade').waitFor();
    await firstRow.click();
    await page.waitForURL(new RegExp(`/referrals/${referralId}$`));

    // The referring dentist's acknowledgement reached the local inbox.
    let found = false;
    for (let i = 0; i < 25 && !found; i++) {
      const mails = (await (await fetch(inbox)).json()) as { subject: string; text?: string; to: { address: string }[] }[];
      found = mails.some((m) => (m.text ?? '').includes('Ferelith Quade'));
      if (!found) await new Promise((r) => setTimeout(r, 200));
    }
    expect(found).toBe(true);
    await page.close();
  });
});
