import type { ReferringDentist } from '@ostium/shared';
import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it } from 'vitest';
import { sessionStore } from '../../../lib/session';
import { mockFetch, renderPage, type MockCall } from '../../../test/render';
import { ReferringDentistsPage } from './referring-dentists-page';

const dentist = (id: number, name: string, referralCount: number): ReferringDentist => ({
  id,
  name,
  practiceName: 'Marlow Family Dental',
  email: `${id}@marlow.example.com`,
  phone: null,
  address: null,
  letterChannel: 'email',
  notes: null,
  referralCount,
  createdAt: '2025-06-01T10:00:00Z',
});
const ines = dentist(3, 'Dr. Ines Marlow', 12);
const twin = dentist(8, 'Dr. I. Marlow', 2);

const answers = {
  'GET /api/referring-dentists': (_b: unknown, c: MockCall) => {
    const q = c.query.get('q')?.toLowerCase();
    const items = [ines, twin].filter((d) => !q || d.name.toLowerCase().includes(q));
    return { status: 200, body: items };
  },
  'POST /api/referring-dentists/3/merge': () => ({ status: 201, body: { ...ines, referralCount: 14 } }),
};
const signIn = (role: 'frontdesk' | 'manager') => sessionStore.set({ accessToken: 't', user: { id: 2, email: 'u@example.com', name: 'U', role } });

describe('ReferringDentistsPage', { timeout: 15_000 }, () => {
  afterEach(() => sessionStore.set(null));

  it('searches on the server', async () => {
    signIn('manager');
    const calls = mockFetch(answers);
    renderPage(<ReferringDentistsPage />);
    await screen.findByRole('table', { name: 'Referring dentists' });
    await userEvent.type(screen.getByLabelText('Search referring dentists'), 'nobody');
    expect(await screen.findByText('No referring dentist matches “nobody”')).toBeInTheDocument();
    expect(calls.at(-1)!.query.get('q')).toBe('nobody');
    // Reading roles cannot merge.
    expect(screen.queryByRole('button', { name: /Merge/ })).toBeNull();
  });

  it('merges a duplicate record into the one to keep', async () => {
    signIn('frontdesk');
    const calls = mockFetch(answers);
    renderPage(<ReferringDentistsPage />);
    await userEvent.click(await screen.findByRole('button', { name: 'Merge Dr. I. Marlow into another record' }));
    const dialog = await screen.findByRole('dialog');
    expect(dialog).toHaveTextContent('The 2 referrals of Dr. I. Marlow');
    await userEvent.click(within(dialog).getByRole('combobox', { name: 'Record to keep' }));
    // The record being merged away is not offered as its own target.
    expect(within(dialog).queryByRole('option', { name: /Dr. I. Marlow/ })).toBeNull();
    await userEvent.click(await within(dialog).findByRole('option', { name: /Dr. Ines Marlow/ }));
    await userEvent.click(within(dialog).getByRole('button', { name: 'Merge into Dr. Ines Marlow' }));
    await waitFor(() => expect(calls.find((c) => c.key === 'POST /api/referring-dentists/3/merge')?.body).toEqual({ otherId: 8 }));
    await waitFor(() => expect(screen.queryByRole('dialog')).toBeNull());
  });
});
