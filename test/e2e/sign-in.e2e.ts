import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { baseUrl, launch, signIn } from '../support/browser.js';

// Each demo user (one per role) signs in and sees only their role's navigation.
const EXPECTED: Record<string, { email: string; sees: string[]; hidden: string[] }> = {
  admin: { email: 'admin@quillfern-endo.test', sees: ['Today', 'Users and roles', 'Audit log'], hidden: [] },
  manager: { email: 'manager@quillfern-endo.test', sees: ['Today'], hidden: ['Users and roles', 'Audit log'] },
  endodontist: { email: 'endo@quillfern-endo.test', sees: ['Today'], hidden: ['Users and roles', 'Audit log'] },
  assistant: { email: 'assistant@quillfern-endo.test', sees: ['Today'], hidden: ['Users and roles', 'Audit log'] },
  frontdesk: { email: 'frontdesk@quillfern-endo.test', sees: ['Today'], hidden: ['Users and roles', 'Audit log'] },
};

describe('sign-in and the shell', () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launch();
  });
  afterAll(async () => browser?.close());

  it('shows the sign-in page to a visitor', async () => {
    const page = await browser.newPage();
    await page.goto(`${baseUrl()}/`);
    await page.waitForURL(/\/sign-in$/);
    expect(await page.getByRole('heading', { name: 'Sign in' }).isVisible()).toBe(true);
    await page.close();
  });

  it('refuses a wrong password with a message', async () => {
    const page = await browser.newPage();
    await page.goto(`${baseUrl()}/sign-in`);
    await page.getByLabel('E-mail').fill('frontdesk@quillfern-endo.test');
    await page.locator('input[type=password]').fill('wrong-password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByRole('alert').waitFor();
    expect(await page.getByRole('alert').textContent()).toContain('not right');
    await page.close();
  });

  for (const [role, exp] of Object.entries(EXPECTED)) {
    it(`${role} sees only their navigation`, async () => {
      const context = await browser.newContext();
      const page = await context.newPage();
      await signIn(page, exp.email);
      const nav = page.getByRole('navigation', { name: 'Main' });
      await nav.waitFor();
      for (const label of exp.sees) expect(await nav.getByText(label, { exact: true }).count(), label).toBe(1);
      for (const label of exp.hidden) expect(await nav.getByText(label, { exact: true }).count(), label).toBe(0);
      if (role !== 'admin') {
        await page.goto(`${baseUrl()}/admin/users`);
        await page.getByText('Not available for your role').waitFor();
      }
      await context.close();
    });
  }

  it('keeps the session across a reload and signs out', async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signIn(page, 'admin@quillfern-endo.test');
    await page.goto(`${baseUrl()}/admin/users`);
    await page.getByRole('heading', { name: 'Users and roles' }).waitFor();
    await page.reload();
    await page.getByRole('heading', { name: 'Users and roles' }).waitFor();
    await page.getByRole('button', { name: 'Account menu' }).click();
    await page.getByRole('menuitem', { name: 'Sign out' }).click();
    await page.waitForURL(/\/sign-in$/);
    await page.goto(`${baseUrl()}/admin/users`);
    await page.waitForURL(/\/sign-in$/);
    await context.close();
  });
});
