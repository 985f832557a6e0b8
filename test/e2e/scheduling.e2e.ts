import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { apiAs } from '../support/api.js';
import { baseUrl, launch, signIn } from '../support/browser.js';

interface Sheet { id: number; bookedMinutesPerVisit: number[] | null }
interface Appointment { id: number; start: string; end: string; chairId: number; operatorId: number; visitIndex: number }

describe('finding times, booking and the Chair board', () => {
  let browser: Browser;
  let molarCaseId: number;
  let molarVisits: number;
  let incisorCaseId: number;
  beforeAll(async () => {
    browser = await launch();
    const desk = await apiAs('frontdesk@quillfern-endo.test');
    const endo = await apiAs('endo@quillfern-endo.test');
    const locations = await desk.get<{ id: number; name: string }[]>('/locations');
    const riverside = locations.find((l) => l.name === 'Riverside')!;
    const ref = await desk.post<{ cases: { id: number; toothFdi: string }[] }>('/referrals', {
      patient: { firstName: 'Isolde', lastName: 'Featherstonhaugh', dateOfBirth: '1975-06-30' },
      referringDentist: { name: 'Dr. Barnaby Quell', email: 'quell@example.com' },
      locationId: riverside.id,
      urgency: 'soon',
      procedure: 'retreatment',
      notation: 'fdi',
      teeth: [{ tooth: '37' }, { tooth: '11', procedure: 'initial' }],
    });
    molarCaseId = ref.cases.find((c) => c.toothFdi === '37')!.id;
    incisorCaseId = ref.cases.find((c) => c.toothFdi === '11')!.id;
    // The endodontist's case sheet: a curved, calcified molar with a ledge (two visits, microscope).
    const sheet = await endo.patch<Sheet>(`/cases/${molarCaseId}`, { assessment: { canalVisibility: 'high' }, facts: { curvatureDegrees: 35, complications: ['ledge'] }, markPlanned: true });
    // Retreatment and high difficulty split it (estimator.md "two visits also when"); the demo's learned
    // minutes may make one visit too long as well and add a third: the plan says how many.
    molarVisits = sheet.bookedMinutesPerVisit!.length;
    expect(molarVisits).toBeGreaterThanOrEqual(2);
    await endo.patch<Sheet>(`/cases/${incisorCaseId}`, { markPlanned: true });
  });
  afterAll(async () => browser?.close());

  it('the front desk books the molar’s visits (two or more) from the case sheet in three clicks, 7–21 days apart with the same endodontist', async () => {
    const page = await browser.newPage({ viewport: { width: 1400, height: 1000 } });
    await signIn(page, 'frontdesk@quillfern-endo.test');
    await page.goto(`${baseUrl()}/cases/${molarCaseId}`);
    await page.getByRole('link', { name: 'Find times' }).click();
    await page.getByRole('article', { name: 'Proposal 1' }).waitFor({ timeout: 20_000 });
    await page.getByRole('button', { name: 'Book proposal 1' }).click();
    await page.getByRole('link', { name: /Open the Chair board on/ }).click();
    await page.waitForURL(/\/board\?/);
    await page.getByRole('group', { name: 'Chairs' }).waitFor();
    await page.getByText(/Featherstonhaugh/).first().waitFor();

    const desk = await apiAs('frontdesk@quillfern-endo.test');
    const from = new Date(Date.now() - 86_400_000).toISOString();
    const to = new Date(Date.now() + 100 * 86_400_000).toISOString();
    const mine = (await desk.get<(Appointment & { caseId: number; microscopeId: number | null })[]>(`/appointments?from=${from}&to=${to}`)).filter((a) => a.caseId === molarCaseId);
    expect(mine).toHaveLength(molarVisits);
    const visits = mine.sort((a, b) => a.visitIndex - b.visitIndex);
    for (const [i, v] of visits.entries()) {
      expect(v.microscopeId).not.toBeNull();
      expect(v.operatorId).toBe(visits[0]!.operatorId);
      if (i === 0) continue;
      const days = (Date.parse(v.start) - Date.parse(visits[i - 1]!.start)) / 86_400_000;
      expect(days).toBeGreaterThanOrEqual(6.5); // 7 calendar days at the location (a DST change moves the hour)
      expect(days).toBeLessThanOrEqual(21.5);
    }
    await page.close();
  });

  it('a block dragged onto a busy time is refused with the reason and put back', async () => {
    const desk = await apiAs('frontdesk@quillfern-endo.test');
    const from = new Date(Date.now() - 86_400_000).toISOString();
    const to = new Date(Date.now() + 100 * 86_400_000).toISOString();
    const first = (await desk.get<(Appointment & { caseId: number })[]>(`/appointments?from=${from}&to=${to}`)).find((a) => a.caseId === molarCaseId && a.visitIndex === 0)!;
    // Book the incisor on the same chair inside opening hours: 30 min after the molar's first visit,
    // or, when that visit ends late in the day, 90 min before it starts.
    const endHour = Number(new Intl.DateTimeFormat('en-GB', { timeZone: 'America/New_York', hour: '2-digit', hour12: false }).format(new Date(first.end)));
    const start = endHour < 13 ? new Date(Date.parse(first.end) + 30 * 60_000) : new Date(Date.parse(first.start) - 90 * 60_000);
    const end = new Date(start.getTime() + 60 * 60_000);
    await desk.post('/appointments', { caseId: incisorCaseId, visits: [{ start: start.toISOString(), end: end.toISOString(), chairId: first.chairId, operatorId: first.operatorId }] });

    const page = await browser.newPage({ viewport: { width: 1400, height: 1400 } });
    await signIn(page, 'frontdesk@quillfern-endo.test');
    const day = first.start.slice(0, 10);
    const locations = await desk.get<{ id: number; name: string; timeZone: string }[]>('/locations');
    const riverside = locations.find((l) => l.name === 'Riverside')!;
    const localDay = new Intl.DateTimeFormat('en-CA', { timeZone: riverside.timeZone }).format(new Date(first.start));
    await page.goto(`${baseUrl()}/board?date=${localDay || day}&locationId=${riverside.id}`);
    const molarBlock = page.locator('.ostium-block', { hasText: 'Featherstonhaugh · 18' }).first();
    const incisorBlock = page.locator('.ostium-block', { hasText: 'Featherstonhaugh · 8' }).first();
    await molarBlock.waitFor();
    await incisorBlock.waitFor();
    const a = (await molarBlock.boundingBox())!;
    const b = (await incisorBlock.boundingBox())!;
    const columns = page.getByRole('group', { name: 'Chairs' });
    // Positions relative to the board (the refusal's message above it shifts the page down).
    const offset = async () => (await molarBlock.boundingBox())!.y - (await columns.boundingBox())!.y;
    const before = await offset();
    await page.mouse.move(a.x + a.width / 2, a.y + 12);
    await page.mouse.down();
    await page.mouse.move(a.x + a.width / 2, a.y + 40, { steps: 5 });
    await page.mouse.move(b.x + b.width / 2, b.y + 12, { steps: 15 });
    await page.mouse.up();
    await page.getByText('Not moved: the time is taken').waitFor({ timeout: 15_000 });
    await page.waitForTimeout(500);
    expect(Math.round(await offset())).toBe(Math.round(before));
    const still = await desk.get<Appointment>(`/appointments/${first.id}`);
    expect(still.start).toBe(first.start);
    await page.close();
  });
});
