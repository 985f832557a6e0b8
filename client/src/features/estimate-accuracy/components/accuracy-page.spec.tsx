import type { CellAccuracy } from '@ostium/shared';
import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it } from 'vitest';
import { sessionStore } from '../../../lib/session';
import { mockFetch, renderRoutes, type MockFilePart } from '../../../test/render';
import { caseSheetRoutes } from '../../case-sheet/routes';
import { practice, signInAs } from '../../case-sheet/test/case-sheet.fixtures';

const CELLS: CellAccuracy[] = [
  { procedure: 'retreatment', toothGroup: 'molar', level: 'high', count: 30, before: { meanAbsoluteError: 28.4, bias: 21.2 }, after: { meanAbsoluteError: 11.7, bias: -1.3 } },
  { procedure: 'initial', toothGroup: 'anterior', level: 'low', count: 10, before: { meanAbsoluteError: 8, bias: -6 }, after: { meanAbsoluteError: 5.5, bias: 0.04 } },
];

const csv = (text: string) => new File([text], 'history.csv', { type: 'text/csv' });
const open = () => renderRoutes([{ path: '/', children: caseSheetRoutes }], '/estimates/accuracy');

describe('AccuracyPage', () => {
  afterEach(() => sessionStore.set(null));

  it('lists every cell with count, error and bias before and after, in product order', async () => {
    signInAs('endodontist');
    mockFetch({ 'GET /api/estimates/accuracy': () => ({ status: 200, body: CELLS }), 'GET /api/practice': () => ({ status: 200, body: practice('fdi') }) });
    open();
    const t = await screen.findByRole('table', { name: 'Accuracy per cell' });
    const rows = within(t).getAllByRole('row').slice(2);
    expect(rows.map((r) => within(r).getAllByRole('cell').map((c) => c.textContent))).toEqual([
      ['Root canal therapy', 'anterior', 'Low', '10', '8.0', '5.5', '−6.0', '0.0'],
      ['Retreatment', 'molar', 'High', '30', '28.4', '11.7', '+21.2', '−1.3'],
    ]);
    // Visit-weighted: (8 × 10 + 28.4 × 30) / 40 = 23.3 before, (5.5 × 10 + 11.7 × 30) / 40 = 10.15 after.
    expect(screen.getByText('23.3 min')).toBeInTheDocument();
    expect(screen.getByText('10.2 min')).toBeInTheDocument();
    // Endodontists read the report but do not import.
    expect(screen.queryByRole('region', { name: 'Import visit history' })).toBeNull();
  });

  it('refuses the front desk', async () => {
    signInAs('frontdesk');
    mockFetch({});
    open();
    expect(screen.getByText('Not available for your role')).toBeInTheDocument();
  });

  it('says what to do when there are no visits yet', async () => {
    signInAs('manager');
    mockFetch({ 'GET /api/estimates/accuracy': () => ({ status: 200, body: [] }), 'GET /api/practice': () => ({ status: 200, body: practice('fdi') }) });
    open();
    expect(await screen.findByText('No completed visits yet')).toBeInTheDocument();
    expect(screen.getByText(/Import past visits from a CSV file below/)).toBeInTheDocument();
  });

  it('a bad file imports nothing and lists the problems line by line', async () => {
    signInAs('manager');
    const user = userEvent.setup();
    const calls = mockFetch({
      'GET /api/estimates/accuracy': () => ({ status: 200, body: [] }),
      'GET /api/practice': () => ({ status: 200, body: practice('universal') }),
      'POST /api/visit-history/import': () => ({
        status: 400,
        body: {
          statusCode: 400,
          message: 'Nothing imported: 2 line(s) have problems (line 3, line 5)',
          errors: [
            { field: 'line 5', message: 'level must be low, moderate or high' },
            { field: 'line 3', message: 'date must be YYYY-MM-DD' },
            { field: 'line 3', message: 'actual_minutes must be a whole number from 5 to 600' },
          ],
        },
      }),
    });
    const { container } = open();
    await screen.findByRole('region', { name: 'Import visit history' });
    await user.upload(container.querySelector('input[type="file"]') as HTMLInputElement, csv('date,tooth\n'));
    await user.click(screen.getByRole('button', { name: 'Import' }));
    const list = await screen.findByRole('list', { name: 'Problems by line' });
    expect(within(list).getAllByRole('listitem').map((li) => li.textContent)).toEqual([
      'Line 3: date must be YYYY-MM-DD; actual_minutes must be a whole number from 5 to 600',
      'Line 5: level must be low, moderate or high',
    ]);
    expect(screen.getByText('Nothing imported')).toBeInTheDocument();
    const post = calls.find((c) => c.key === 'POST /api/visit-history/import')!;
    expect((post.body as Record<string, MockFilePart>).file).toMatchObject({ name: 'history.csv' });
    // The file's tooth numbers are read in the practice's notation unless told otherwise.
    expect(post.query.get('notation')).toBe('universal');
  });

  it('a good file shows how many visits came in and the refreshed report', async () => {
    signInAs('admin');
    const user = userEvent.setup();
    mockFetch({
      'GET /api/estimates/accuracy': () => ({ status: 200, body: [] }),
      'GET /api/practice': () => ({ status: 200, body: practice('fdi') }),
      'POST /api/visit-history/import': () => ({ status: 201, body: { imported: 40, accuracy: CELLS } }),
    });
    const { container } = open();
    expect(await screen.findByText('No completed visits yet')).toBeInTheDocument();
    await user.upload(container.querySelector('input[type="file"]') as HTMLInputElement, csv('date,tooth,procedure,canals,level,operator_email,actual_minutes\n'));
    await user.click(screen.getByRole('button', { name: 'Import' }));
    expect(await screen.findByText('Imported 40 visits')).toBeInTheDocument();
    await waitFor(() => expect(screen.getByRole('table', { name: 'Accuracy per cell' })).toBeInTheDocument());
    expect(screen.queryByText('No completed visits yet')).toBeNull();
  });
});
