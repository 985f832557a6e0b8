import type { EstimateTable } from '@ostium/shared';
import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it } from 'vitest';
import { sessionStore } from '../../../lib/session';
import { mockFetch, renderPage } from '../../../test/render';
import { signInAs } from '../../case-sheet/test/case-sheet.fixtures';
import { info, table } from '../test/estimate-table.fixtures';
import { EstimateTablePage } from './estimate-table-page';

const ADMIN = { id: 1, email: 'admin@example.com', name: 'Alex Admin', role: 'admin', active: true, lastSignInAt: null, createdAt: '2026-01-01T00:00:00Z' };

function serve(put: (body: unknown) => { status: number; body?: unknown } = (b) => ({ status: 200, body: { ...info(3), table: { ...(b as EstimateTable), version: 3 } } })) {
  return mockFetch({
    'GET /api/settings/estimate-table': () => ({ status: 200, body: info(2) }),
    'GET /api/users': () => ({ status: 200, body: [ADMIN] }),
    'PUT /api/settings/estimate-table': put,
  });
}

const field = (label: string) => screen.getByLabelText(label) as HTMLInputElement;

describe('EstimateTablePage', () => {
  afterEach(() => sessionStore.set(null));

  it('shows the numbers grouped, with the version history', async () => {
    signInAs('admin');
    serve();
    renderPage(<EstimateTablePage />);
    expect(await screen.findByText('Version 2')).toBeInTheDocument();
    expect(field('Root canal therapy, retreatment, molar').value).toBe('90');
    expect(field('Apical surgery, molar').value).toBe('120');
    expect(field('Canals the base covers, premolar').value).toBe('2');
    expect(field('High').value).toBe('1.5');
    expect(field('Booking quantile').value).toBe('0.5');
    const history = screen.getByRole('region', { name: 'Version history' });
    expect(within(history).getByText('v2')).toBeInTheDocument();
    await waitFor(() => expect(within(history).getAllByText('Alex Admin')).toHaveLength(1));
  });

  it('refuses multipliers that fall from moderate to high and empty numbers, without calling the server', async () => {
    signInAs('admin');
    const user = userEvent.setup();
    const calls = serve();
    renderPage(<EstimateTablePage />);
    await screen.findByText('Version 2');
    await user.clear(field('High'));
    await user.type(field('High'), '1.1');
    await user.clear(field('Turnover after a visit'));
    await user.click(screen.getByRole('button', { name: 'Save as version 3' }));
    expect(await screen.findByText('Multipliers must not decrease from low to high')).toBeInTheDocument();
    expect(screen.getByText('Enter a number')).toBeInTheDocument();
    expect(calls.some((c) => c.key === 'PUT /api/settings/estimate-table')).toBe(false);
  });

  it('saves the whole table as a new version', async () => {
    signInAs('admin');
    const user = userEvent.setup();
    const calls = serve();
    renderPage(<EstimateTablePage />);
    await screen.findByText('Version 2');
    await user.clear(field('Root canal therapy, retreatment, molar'));
    await user.type(field('Root canal therapy, retreatment, molar'), '95');
    await user.click(screen.getByRole('button', { name: 'Save as version 3' }));
    await waitFor(() => expect(calls.some((c) => c.key === 'PUT /api/settings/estimate-table')).toBe(true));
    const expected = table(2);
    expected.base.initial.molar = 95;
    expect(calls.find((c) => c.key === 'PUT /api/settings/estimate-table')!.body).toEqual(expected);
    expect(await screen.findByText('Version 3')).toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Save as version 4' })).toBeDisabled();
  });

  it('shows the server’s errors on the field its table.<path> names, and the rest in the banner', async () => {
    signInAs('admin');
    const user = userEvent.setup();
    serve(() => ({
      status: 400,
      body: {
        statusCode: 400,
        message: 'table.base.initial.molar: must be a number ≥ 0',
        errors: [
          { field: 'table.base.initial.molar', message: 'must be a number ≥ 0' },
          { field: 'table.tray.glidePath', message: 'table.tray.glidePath is missing' },
        ],
      },
    }));
    renderPage(<EstimateTablePage />);
    await screen.findByText('Version 2');
    await user.type(field('Each extra canal'), '0');
    await user.click(screen.getByRole('button', { name: 'Save as version 3' }));
    expect(await screen.findByText('must be a number ≥ 0')).toBeInTheDocument();
    expect(field('Root canal therapy, retreatment, molar')).toHaveAttribute('aria-invalid', 'true');
    expect(screen.getByText('tray.glidePath: table.tray.glidePath is missing')).toBeInTheDocument();
  });
});
