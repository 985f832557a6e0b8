import { chromium, type Browser, type Page } from 'playwright-core';
import { inject } from 'vitest';

export const DEMO_PASSWORD = 'ostium-demo-2026';

/** Debian's Chromium, headless, with the flags this closed network needs. */
export function launch(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
}

export const baseUrl = () => inject('baseUrl');

export async function signIn(page: Page, email: string, password = DEMO_PASSWORD) {
  await page.goto(`${baseUrl()}/sign-in`);
  await page.getByLabel('E-mail').fill(email);
  await page.locator('input[type=password]').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
}
