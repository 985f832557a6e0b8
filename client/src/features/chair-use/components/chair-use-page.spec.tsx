import { REPORT_DEFINITIONS, ROLES } from '@ostium/shared';
import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import Papa from 'papaparse';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { navFor } from '../../../app/navigation';
import { sessionStore } from '../../../lib/session';
import { mockFetch, renderRoutes, type MockCall } from '../../../test/render';
import { chairUseRoutes } from '../routes';
import {
  accuracyReport,
  attendanceReport,
  backlogReport,
  chairUseReport,
  emptyChairUse,
  ENDODONTISTS,
  LOCATIONS,
  noOpenTimeResponse,
  operatorUseReport,
  PRACTICE,
  referralsReport,
  signInAs,
  whatIfResponse,
} from '../test/reports.fixtures';
import { ChairUsePage } from './chair-use-page';

const REPORTS = ['chair-use', 'operator-use', 'attendance', 'referrals', 'estimate-accuracy', 'backlog'] as const;
type Answers = Parameters<typeof mockFetch>[0];

const answers = (over: Answers = {}): Answers => ({
  'GET /api/locations': () => ({ status: 200, body: LOCATIONS }),
  'GET /api/users': () => ({ status: 200, body: ENDODONTISTS }),
  'GET /api/practice': () => ({ status: 200, body: PRACTICE }),
  'GET /api/reports/chair-use': () => ({ status: 200, body: chairUseReport() }),
  'GET /api/reports/operator-use': () => ({ status: 200, body: operatorUseReport() }),
  'GET /api/reports/attendance': () => ({ status: 200, body: attendanceReport() }),
  'GET /api/reports/referrals': () => ({ status: 200, body: referralsReport() }),
  'GET /api/reports/estimate-accuracy': () => ({ status: 200, body: accuracyReport() }),
  'GET /api/reports/backlog': () => ({ status: 200, body: backlogReport() }),
  'POST /api/reports/backlog/what-if': () => ({ status: 200, body: whatIfResponse() }),
  ...over,
});

const RANGE_QUERY = 'from=2026-10-26&to=2026-11-08';
const open = (path = `/reports/chair-use?${RANGE_QUERY}`) => renderRoutes([{ path: '/', children: chairUseRoutes }], path);
const section = (name: string) => screen.getByRole('region', { name });
const cells = (table: HTMLElement) => within(table).getAllByRole('row').map((r) => Array.from(r.querySelectorAll('th, td')).map((c) => c.textContent));
const lastCall = (calls: MockCall[], key: string) => calls.filter((c) => c.key === key).at(-1)!;

describe('ChairUsePage', () => {
  beforeEach(() => signInAs('manager'));
  afterEach(() => {
    sessionStore.set(null);
    vi.restoreAllMocks();
  });

  it('defaults to the last 8 full weeks on the location’s clock and asks every report for them', async () => {
    const calls = mockFetch(answers());
    // Wednesday Dec 2, 2026, 10:00 in New York.
    renderRoutes([{ path: '/reports/chair-use', element: <ChairUsePage now={new Date('2026-12-02T15:00:00Z')} /> }], '/reports/chair-use');
    expect(await screen.findByText('Oct 5 – Nov 29, 2026 · All locations, all endodontists')).toBeInTheDocument();
    await waitFor(() => expect(calls.filter((c) => c.key.startsWith('GET /api/reports/')).length).toBe(6));
    for (const name of REPORTS) {
      const q = lastCall(calls, `GET /api/reports/${name}`).query;
      expect(Object.fromEntries(q), name).toEqual({ from: '2026-10-05', to: '2026-11-29' });
    }
  });

  it('keeps the filters in the address and sends them to every report; a location drops a chair of another', async () => {
    const user = userEvent.setup();
    const calls = mockFetch(answers());
    const { router } = open();
    await screen.findByRole('table', { name: 'Chair use by chair' });

    await user.click(screen.getByRole('combobox', { name: 'Chair' }));
    await user.click(await screen.findByRole('option', { name: 'Mill 1' }));
    // Picking a chair picks its location too.
    await waitFor(() => expect(new URLSearchParams(router.state.location.search).get('chairId')).toBe('3'));
    expect(Object.fromEntries(new URLSearchParams(router.state.location.search))).toEqual({ from: '2026-10-26', to: '2026-11-08', chairId: '3', locationId: '2' });
    await waitFor(() => {
      for (const name of REPORTS) expect(Object.fromEntries(lastCall(calls, `GET /api/reports/${name}`).query), name).toEqual({ from: '2026-10-26', to: '2026-11-08', locationId: '2', chairId: '3' });
    });

    await user.click(screen.getByRole('combobox', { name: 'Endodontist' }));
    await user.click(await screen.findByRole('option', { name: 'Dr. Second Endodontist' }));
    await waitFor(() => expect(lastCall(calls, 'GET /api/reports/attendance').query.get('operatorId')).toBe('6'));
    expect(screen.getByText('Oct 26 – Nov 8, 2026 · Mill 1, Dr. Second Endodontist')).toBeInTheDocument();

    await user.click(screen.getByRole('combobox', { name: 'Location' }));
    await user.click(await screen.findByRole('option', { name: 'Harbour Street' }));
    await waitFor(() => expect(Object.fromEntries(new URLSearchParams(router.state.location.search))).toEqual({ from: '2026-10-26', to: '2026-11-08', locationId: '1', operatorId: '6' }));
    await waitFor(() => expect(Object.fromEntries(lastCall(calls, 'GET /api/reports/chair-use').query)).toEqual({ from: '2026-10-26', to: '2026-11-08', locationId: '1', operatorId: '6' }));

    await user.click(screen.getByRole('button', { name: 'Reset filters' }));
    await waitFor(() => expect(router.state.location.search).toBe(''));
  });

  it('shows chair time: shares with their parts, weeks in order, chairs with totals, the heat map and its table', async () => {
    const user = userEvent.setup();
    mockFetch(answers());
    open();
    await screen.findByRole('table', { name: 'Chair use by chair' });
    const s = section('Chair time');
    // 4000 of 6000 open minutes booked; 3420 of 5400 used on done days.
    expect(within(within(s).getByRole('figure', { name: 'Booked share' })).getByText('66.7 %')).toBeInTheDocument();
    expect(within(s).getByText('66.7 h booked of 100.0 h open')).toBeInTheDocument();
    expect(within(within(s).getByRole('figure', { name: 'Actual share' })).getByText('63.3 %')).toBeInTheDocument();
    expect(within(s).getByText('57.0 h used of 90.0 h open, on days whose visits are done')).toBeInTheDocument();
    expect(cells(within(s).getByRole('table', { name: 'Chair use by week' })).slice(1)).toEqual([
      ['Oct 26', '50.0', '35.0', '70.0', '50.0', '30.0', '60.0'],
      ['Nov 2', '50.0', '31.7', '63.3', '40.0', '27.0', '67.5'],
      ['Whole range', '100.0', '66.7', '66.7', '90.0', '57.0', '63.3'],
    ]);
    expect(cells(within(s).getByRole('table', { name: 'Chair use by location' })).slice(1, 3)).toEqual([
      ['Harbour Street', '80.0', '50.0', '62.5', '70.0', '42.0', '60.0'],
      ['Mill Lane', '20.0', '16.7', '83.3', '20.0', '15.0', '75.0'],
    ]);

    const grid = within(s).getByRole('img', { name: /Booked share by weekday and hour/ });
    expect(Array.from(grid.querySelectorAll('[data-shade]')).map((c) => [c.textContent, c.getAttribute('data-shade')])).toEqual([
      ['83.3', '9'],
      ['50.0', '5'],
      ['11.1', '1'],
      ['100.0', '9'],
    ]);
    await user.click(within(s).getByRole('button', { name: 'Show as a table' }));
    expect(cells(within(s).getByRole('table', { name: 'Booked share by weekday and hour' })).slice(1)).toEqual([
      ['Monday', '08:00–09:00', '3.0', '2.5', '83.3'],
      ['Monday', '09:00–10:00', '3.0', '1.5', '50.0'],
      ['Tuesday', '08:00–09:00', '3.0', '0.3', '11.1'],
      ['Friday', '13:00–14:00', '1.0', '1.0', '100.0'],
    ]);
  });

  it('downloads each table as CSV holding exactly the table’s cells, named with the range', async () => {
    const user = userEvent.setup();
    const blobs: Blob[] = [];
    const names: string[] = [];
    URL.createObjectURL = vi.fn((b: Blob) => {
      blobs.push(b);
      return 'blob:report';
    });
    URL.revokeObjectURL = vi.fn();
    vi.spyOn(HTMLAnchorElement.prototype, 'click').mockImplementation(function (this: HTMLAnchorElement) {
      names.push(this.download);
    });
    mockFetch(answers());
    open();
    for (const title of ['Chair use by chair', 'Referrals by referring dentist and month', 'Confirmation by reminders sent before it', 'Overrun days']) {
      const table = await screen.findByRole('table', { name: title });
      await user.click(screen.getByRole('button', { name: `Download CSV — ${title}` }));
      const text = (await blobs.at(-1)!.text()).replace(/^\ufeff/, '');
      const parsed = Papa.parse<string[]>(text, { skipEmptyLines: true }).data;
      expect(parsed, title).toEqual(cells(table));
    }
    expect(names).toEqual([
      'chair-use-by-chair_2026-10-26_to_2026-11-08.csv',
      'referrals-by-dentist-and-month_2026-10-26_to_2026-11-08.csv',
      'confirmation-by-reminders_2026-10-26_to_2026-11-08.csv',
      'overrun-days_2026-10-26_to_2026-11-08.csv',
    ]);
    // The chair table's file, line by line, as a spreadsheet would get it.
    expect((await blobs[0]!.text()).replace(/^\ufeff/, '').split('\r\n')[1]).toBe('Chair 1,Harbour Street,40.0,30.0,75.0,35.0,24.5,70.0');
  });

  it('shows endodontists, attendance, referrals and estimate accuracy with their figures', async () => {
    mockFetch(answers());
    open();
    await screen.findByRole('table', { name: 'Use by endodontist' });

    const endo = section('Endodontists');
    expect(within(within(endo).getByRole('figure', { name: 'Clinical share' })).getByText('67.9 %')).toBeInTheDocument();
    expect(cells(within(endo).getByRole('table', { name: 'Use by endodontist' })).slice(1)).toEqual([
      ['Dr. Test Endodontist', '40.0', '25.0', '62.5'],
      ['Dr. Second Endodontist', '30.0', '22.5', '75.0'],
      ['All endodontists', '70.0', '47.5', '67.9'],
    ]);

    const att = section('Attendance');
    expect(within(within(att).getByRole('figure', { name: 'No-shows' })).getByText('7.5 % of 40 visits')).toBeInTheDocument();
    expect(within(att).getByText(/under 48 h notice \(4 cancelled earlier, not counted\)/)).toBeInTheDocument();
    expect(within(att).getByText(/5 visits still booked or confirmed, with no outcome yet, are not counted/)).toBeInTheDocument();
    expect(within(within(att).getByRole('figure', { name: 'Same-day fills' })).getByText('1')).toBeInTheDocument();
    expect(within(within(att).getByRole('figure', { name: 'Confirmation rate' })).getByText('78.9 %')).toBeInTheDocument();
    expect(cells(within(att).getByRole('table', { name: 'What became of the visits' })).slice(1)).toEqual([
      ['Attended', '35', '87.5'],
      ['No-show', '3', '7.5'],
      ['Late cancellation (under 48 h notice)', '2', '5.0'],
      ['All visits', '40', '100.0'],
    ]);
    expect(cells(within(att).getByRole('table', { name: 'Confirmation by reminders sent before it' })).slice(1).map((r) => r[2])).toEqual(['33.4', '33.3', '33.3', '0.0', '100.0']);

    const ref = section('Referrals');
    expect(within(within(ref).getByRole('figure', { name: 'Referrals received' })).getByText('7')).toBeInTheDocument();
    expect(within(within(ref).getByRole('figure', { name: 'Lead time, median' })).getByText('12.0 days')).toBeInTheDocument();
    expect(within(ref).getByText('90th percentile 27.0 days, over 5 referrals')).toBeInTheDocument();
    expect(within(ref).getByText('median wait 9.0 days, longest 31.0 days')).toBeInTheDocument();
    const levels = within(ref).getByRole('table', { name: 'Cases by difficulty' });
    expect(cells(levels).slice(1)).toEqual([
      ['Low', '3', '42.8'],
      ['Moderate', '2', '28.6'],
      ['High', '1', '14.3'],
      ['Not yet triaged', '1', '14.3'],
      ['All cases', '7', '100.0'],
    ]);
    // The difficulty badge carries shape and colour as well as the word.
    expect(within(levels).getByRole('img', { name: 'Difficulty: high' })).toBeInTheDocument();
    expect(cells(within(ref).getByRole('table', { name: 'Referrals waiting to be booked' })).slice(1)).toEqual([
      ['Received, to triage', '1'],
      ['Triaged, to plan', '1'],
      ['Planned, to book', '2'],
      ['All waiting', '4'],
    ]);

    const acc = section('Estimate accuracy');
    expect(within(within(acc).getByRole('figure', { name: 'Error, table alone' })).getByText('13.6 min')).toBeInTheDocument();
    expect(within(within(acc).getByRole('figure', { name: 'Error, after calibration' })).getByText('7.6 min')).toBeInTheDocument();
    // 13.6 − 7.6 as shown, not 13.62 − 7.56 = 6.06 → 6.1, so the card's arithmetic holds.
    expect(within(acc).getByText('−6.0 min against the table alone')).toBeInTheDocument();
    expect(cells(within(acc).getByRole('table', { name: 'Estimate error by difficulty' })).slice(1)).toEqual([
      ['Low', '20', '9.4', '5.1'],
      ['Moderate', '12', '16.2', '9.8'],
      ['High', '6', '27.5', '13.0'],
      ['All visits', '38', '13.6', '7.6'],
    ]);
    expect(cells(within(acc).getByRole('table', { name: 'Estimate error by endodontist' })).slice(1, 3)).toEqual([
      ['Dr. Test Endodontist', '22', '14.0', '7.2'],
      ['Dr. Second Endodontist', '16', '13.1', '8.0'],
    ]);
    expect(cells(within(acc).getByRole('table', { name: 'Estimate error by month' })).slice(1)).toEqual([
      ['Oct 2026', '20', '14.1', '8.3'],
      ['Nov 2026', '18', '13.1', '6.7'],
    ]);
    // 21:25Z on Oct 29, 2026 is 17:25 in New York (daylight time until Nov 1).
    expect(cells(within(acc).getByRole('table', { name: 'Overrun days' })).slice(1)).toEqual([['Thu, Oct 29, 2026', 'Chair 1', '17:00', '17:25', '25']]);
  });

  it('forecasts the backlog with one more chair day a week and shows before → after', async () => {
    const user = userEvent.setup();
    const calls = mockFetch(answers());
    open(`/reports/chair-use?${RANGE_QUERY}&locationId=1`);
    const b = await waitFor(() => section('Backlog forecast'));
    await within(b).findByRole('table', { name: 'Backlog by difficulty and location' });
    expect(within(within(b).getByRole('figure', { name: 'Weeks of backlog' })).getByText('0.9 weeks')).toBeInTheDocument();
    expect(within(b).getByText('18.5 h of chair time to book')).toBeInTheDocument();
    expect(cells(within(b).getByRole('table', { name: 'Backlog by difficulty and location' })).slice(1)).toEqual([
      ['Harbour Street', 'Low', '4', '5.0', '0.3'],
      ['Harbour Street', 'Moderate', '3', '5.5', '0.3'],
      ['Harbour Street', 'High', '2', '6.3', '0.3'],
      ['Mill Lane', 'Not yet triaged', '1', '1.7', '0.1'],
      ['All locations', 'All levels', '10', '18.5', '0.9'],
    ]);

    expect(within(b).getByRole('textbox', { name: 'Chair days per week' })).toHaveValue('1');
    await user.click(within(b).getByRole('button', { name: 'Forecast with this change' }));
    const result = await within(b).findByRole('region', { name: 'Forecast with the change' });
    expect(lastCall(calls, 'POST /api/reports/backlog/what-if').body).toEqual({ locationId: 1, from: '2026-10-26', to: '2026-11-08', chairDaysPerWeek: 1, operatorDaysPerWeek: 0 });
    // Weeks to two decimals in the what-if; the change is that of the figures as shown (0.93 → 0.66).
    expect(within(result).getByText('0.93 weeks')).toBeInTheDocument();
    expect(within(result).getByText('0.66 weeks')).toBeInTheDocument();
    expect(within(result).getByText('(−0.27)')).toBeInTheDocument();
    expect(within(result).getByText('1.20 weeks')).toBeInTheDocument();
    expect(within(result).getByText('(−0.30)')).toBeInTheDocument();
    expect(within(result).getByText(/One chair day stands for 8.0 h of open chair time and one endodontist day for 7.5 h of working time, over the next 12 weeks/)).toBeInTheDocument();
    expect(cells(within(result).getByRole('table', { name: 'Backlog now and with the change' })).slice(1, 3)).toEqual([
      ['Weeks of backlog', '0.93', '0.66', '−0.27'],
      ['Lead time to a first visit (weeks)', '1.20', '0.90', '−0.30'],
    ]);
  });

  it('says "no open time" when the change leaves no free chair time', async () => {
    const user = userEvent.setup();
    const calls = mockFetch(answers({ 'POST /api/reports/backlog/what-if': () => ({ status: 200, body: noOpenTimeResponse() }) }));
    open();
    const input = await screen.findByRole('textbox', { name: 'Chair days per week' });
    await user.clear(input);
    await user.type(input, '-5');
    await user.click(screen.getByRole('button', { name: 'Forecast with this change' }));
    expect(await screen.findByText('No open time')).toBeInTheDocument();
    expect(lastCall(calls, 'POST /api/reports/backlog/what-if').body).toEqual({ from: '2026-10-26', to: '2026-11-08', chairDaysPerWeek: -5, operatorDaysPerWeek: 0 });
    const table = screen.getByRole('table', { name: 'Backlog now and with the change' });
    expect(cells(table)[1]).toEqual(['Weeks of backlog', '0.93', 'no open time', '—']);
  });

  it('shows each figure’s definition on hover', async () => {
    const user = userEvent.setup();
    mockFetch(answers());
    open();
    await screen.findByRole('table', { name: 'Chair use by chair' });
    const label = within(within(section('Chair time')).getByRole('figure', { name: 'Booked share' })).getByText('Booked share');
    await user.hover(label);
    expect(await screen.findByRole('tooltip')).toHaveTextContent(REPORT_DEFINITIONS.chairUse);
    await user.unhover(label);
    await user.hover(within(section('Backlog forecast')).getByRole('columnheader', { name: 'Weeks of backlog' }).querySelector('[data-definition]')!);
    await waitFor(() => expect(screen.getByRole('tooltip')).toHaveTextContent(REPORT_DEFINITIONS.backlog));
  });

  it('says what to do when a range holds no visits, and shows a failed report’s reason with a retry', async () => {
    const user = userEvent.setup();
    let attendanceCalls = 0;
    mockFetch(
      answers({
        'GET /api/reports/chair-use': () => ({ status: 200, body: emptyChairUse() }),
        'GET /api/reports/attendance': () => {
          attendanceCalls++;
          return { status: 400, body: { statusCode: 400, message: 'to must be at most 366 days after from', errors: [{ field: 'to', message: 'to must be at most 366 days after from' }] } };
        },
      }),
    );
    open();
    const chair = await waitFor(() => section('Chair time'));
    expect(await within(chair).findByText('No visits in this range')).toBeInTheDocument();
    expect(within(chair).getByText('Widen the dates or pick another chair.')).toBeInTheDocument();
    expect(within(chair).queryByRole('table')).toBeNull();

    const alert = await within(section('Attendance')).findByRole('alert');
    expect(alert).toHaveTextContent('Could not load attendance');
    expect(alert).toHaveTextContent('to must be at most 366 days after from');
    const before = attendanceCalls;
    await user.click(within(alert).getByRole('button', { name: 'Try again' }));
    await waitFor(() => expect(attendanceCalls).toBe(before + 1));
  });

  it('shows skeletons while reports load', async () => {
    mockFetch(answers({ 'GET /api/reports/referrals': () => new Promise(() => {}) as never }));
    open();
    await screen.findByRole('table', { name: 'Chair use by chair' });
    expect(within(section('Referrals')).getByLabelText('Loading')).toHaveAttribute('aria-busy', 'true');
  });

  it('prints a one-page summary of the key figures', async () => {
    const user = userEvent.setup();
    const print = vi.fn();
    window.print = print;
    mockFetch(answers());
    const { container } = open();
    await screen.findByRole('table', { name: 'Backlog by difficulty and location' });
    await user.click(screen.getByRole('button', { name: 'Print summary' }));
    expect(print).toHaveBeenCalledOnce();
    const summary = container.querySelector('.ostium-print-summary')!;
    expect(summary.querySelector('header')).toHaveTextContent('Example Endodontics · Oct 26 – Nov 8, 2026 · All locations, all endodontists');
    const figures = Object.fromEntries(Array.from(summary.querySelectorAll('dl div')).map((d) => [d.querySelector('dt')!.textContent, d.querySelector('dd strong')!.textContent]));
    expect(figures).toMatchObject({
      'Booked share': '66.7 %',
      'Actual share': '63.3 %',
      'Clinical share': '67.9 %',
      'No-shows': '3',
      'Confirmation rate': '78.9 %',
      'Lead time, median': '12.0 days',
      'Error, after calibration': '7.6 min',
      'Weeks of backlog': '0.9 weeks',
    });
    // The week table (two weeks and the whole range) and the chair table (three chairs and all).
    expect(Array.from(summary.querySelectorAll('table')).map((t) => t.querySelectorAll('tbody tr').length)).toEqual([3, 4]);
  });

  it('is for managers and administrators only', async () => {
    for (const role of ROLES) {
      const shown = navFor(role).some((i) => i.to === '/reports/chair-use' && i.label === 'Chair use');
      expect(shown, role).toBe(role === 'manager' || role === 'admin');
    }
    signInAs('frontdesk');
    const calls = mockFetch(answers());
    open();
    expect(screen.getByText('Not available for your role')).toBeInTheDocument();
    expect(calls.filter((c) => c.key.startsWith('GET /api/reports/'))).toEqual([]);
  });
});
