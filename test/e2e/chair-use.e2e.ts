import { readFile } from 'node:fs/promises';
import Papa from 'papaparse';
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { apiAs } from '../support/api.js';
import { launch, signIn } from '../support/browser.js';

interface UseFigure { openMinutes: number; bookedMinutes: number; share: number | null; actualOpenMinutes: number; actualMinutes: number; actualShare: number | null }
interface ChairUseReport { totals: UseFigure; byChair: (UseFigure & { chairId: number; chairName: string })[] }

const tenth = (n: number) => (Math.round(n * 10) / 10).toFixed(1);

describe('Chair use', () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launch();
  });
  afterAll(async () => browser?.close());

  it('a manager filters one chair, downloads the chair table as CSV, and the file holds the table’s numbers', async () => {
    const page = await browser.newPage({ viewport: { width: 1400, height: 1000 }, acceptDownloads: true });
    await signIn(page, 'manager@quillfern-endo.test');
    await page.getByRole('link', { name: 'Chair use', exact: true }).click();
    await page.waitForURL(/\/reports\/chair-use/);
    const table = page.getByRole('table', { name: 'Chair use by chair', exact: true });
    await table.waitFor({ timeout: 20_000 });

    await page.getByRole('combobox', { name: 'Chair', exact: true }).click();
    await page.getByRole('option', { name: 'Riverside 2', exact: true }).click();
    await page.waitForURL(/chairId=\d+/);
    // Runs in the page; typed by hand because this project compiles without the DOM library.
    type Row = { querySelectorAll(selector: string): ArrayLike<{ textContent: string | null }> };
    const rowsOf = () => table.locator('tr').evaluateAll((rows: Row[]) => rows.map((r) => Array.from(r.querySelectorAll('th, td')).map((c) => (c.textContent ?? '').trim())));
    // Header, the one chair, the totals row.
    await expect.poll(async () => (await rowsOf()).map((r) => r[0]), { timeout: 20_000 }).toEqual(['Chair', 'Riverside 2', 'All chairs']);
    const shown = await rowsOf();

    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Download CSV — Chair use by chair', exact: true }).click()]);
    const params = new URL(page.url()).searchParams;
    const from = params.get('from');
    const to = params.get('to');
    // The range is in the file name: the one in the address when set, else the default 8 weeks.
    expect(download.suggestedFilename()).toMatch(/^chair-use-by-chair_\d{4}-\d{2}-\d{2}_to_\d{4}-\d{2}-\d{2}\.csv$/);
    if (from && to) expect(download.suggestedFilename()).toBe(`chair-use-by-chair_${from}_to_${to}.csv`);
    const text = (await readFile((await download.path())!, 'utf8')).replace(/^\ufeff/, '');
    const file = Papa.parse<string[]>(text, { skipEmptyLines: true }).data;
    expect(file).toEqual(shown);

    // The numbers are the server's: the same report asked for directly, in hours and one-decimal percentages.
    const [, rangeFrom, rangeTo] = /_(\d{4}-\d{2}-\d{2})_to_(\d{4}-\d{2}-\d{2})\.csv$/.exec(download.suggestedFilename())!;
    const chairId = params.get('chairId');
    const manager = await apiAs('manager@quillfern-endo.test');
    const report = await manager.get<ChairUseReport>(`/reports/chair-use?from=${rangeFrom}&to=${rangeTo}&chairId=${chairId}&locationId=${params.get('locationId')}`);
    expect(report.byChair.map((c) => c.chairName)).toEqual(['Riverside 2']);
    const c = report.byChair[0]!;
    // The demo's past months hold visits on every chair (seeds: the demo history), so the figures are not all zero.
    expect(c.openMinutes).toBeGreaterThan(0);
    expect(c.bookedMinutes).toBeGreaterThan(0);
    expect(file[1]).toEqual([
      'Riverside 2',
      'Riverside',
      tenth(c.openMinutes / 60),
      tenth(c.bookedMinutes / 60),
      c.share === null ? 'no open time' : tenth(c.share * 100),
      tenth(c.actualOpenMinutes / 60),
      tenth(c.actualMinutes / 60),
      c.actualShare === null ? (c.actualOpenMinutes === 0 ? 'no done days' : 'no open time') : tenth(c.actualShare * 100),
    ]);
    await page.close();
  });
});
