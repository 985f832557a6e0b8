import { REFERRAL_STATUSES, type ReferralListItem, type ReferralQueuePage as QueuePage, type ReferralStatus } from '@ostium/shared';
import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { sessionStore } from '../../../lib/session';
import { mockFetch, renderRoutes, type MockCall } from '../../../test/render';
import { ReferralQueuePage } from './referral-queue-page';

const counts = Object.fromEntries(REFERRAL_STATUSES.map((s, i) => [s, i * 3 + 1])) as Record<ReferralStatus, number>;
const item = (id: number, over: Partial<ReferralListItem> = {}): ReferralListItem => ({
  id,
  receivedOn: '2026-01-12',
  status: 'received',
  urgency: 'soon',
  procedure: 'retreatment',
  patient: { id: 7, name: 'Ana Lark', dateOfBirth: '1984-03-02' },
  referringDentist: { id: 3, name: 'Dr. Ines Marlow', practiceName: 'Marlow Family Dental' },
  location: { id: 1, name: 'Harbour Street' },
  teeth: ['36', '46'],
  waitingDays: 21,
  ...over,
});
const queue = (items: ReferralListItem[], total = items.length): QueuePage => ({ items, total, page: 1, pageSize: 25, countsByStatus: counts });

const answers = (items: ReferralListItem[], total?: number) => ({
  'GET /api/practice': () => ({ status: 200, body: { id: 1, name: 'P', phone: null, email: null, settings: { toothNotation: 'universal', bookingGridMinutes: 15, lateCancellationHours: 24 } } }),
  'GET /api/locations': () => ({
    status: 200,
    body: [1, 2].map((id) => ({ id, name: id === 1 ? 'Harbour Street' : 'Mill Lane', address: null, phone: null, timeZone: 'UTC', openingHours: [], chairs: [], microscopes: [] })),
  }),
  'GET /api/referring-dentists': () => ({ status: 200, body: [] }),
  'GET /api/referrals': (_b: unknown, c: MockCall) => ({ status: 200, body: { ...queue(items, total), page: Number(c.query.get('page') ?? 1) } }),
});

const queueCalls = (calls: MockCall[]) => calls.filter((c) => c.key === 'GET /api/referrals');
const lastQuery = (calls: MockCall[]) => Object.fromEntries(queueCalls(calls).at(-1)!.query);

function renderQueue(path = '/referrals') {
  return renderRoutes(
    [
      { path: '/referrals', element: <ReferralQueuePage /> },
      { path: '/referrals/:id', element: <p>referral page</p> },
    ],
    path,
  );
}

describe('ReferralQueuePage', { timeout: 15_000 }, () => {
  beforeEach(() => sessionStore.set({ accessToken: 't', user: { id: 2, email: 'desk@example.com', name: 'Desk', role: 'frontdesk' } }));
  afterEach(() => sessionStore.set(null));

  it('asks for the open referrals, longest waiting first, and shows the counts per status', async () => {
    const calls = mockFetch(answers([item(41), item(40, { urgency: 'urgent', status: 'triaged', waitingDays: 3 })]));
    renderQueue();
    const table = await screen.findByRole('table', { name: 'Referrals' });
    // Waiting longest first: the server orders `waiting` by the date received, oldest first.
    expect(lastQuery(calls)).toEqual({ status: 'received,triaged,planned,booked,in_treatment', sort: 'waiting', order: 'asc', page: '1', pageSize: '25' });
    expect(screen.getByRole('columnheader', { name: /Waiting/ })).toHaveAttribute('aria-sort', 'descending');
    const chips = screen.getByRole('group', { name: 'Status' });
    expect(within(chips).getByLabelText(/Received/)).toBeChecked();
    expect(within(chips).getByLabelText(/In treatment/)).toBeChecked();
    expect(within(chips).getByLabelText(/Completed/)).not.toBeChecked();
    for (const s of ['Received 1', 'Triaged 4', 'Planned 7', 'Booked 10', 'Cancelled 25']) expect(chips).toHaveTextContent(s);
    const rows = within(table).getAllByRole('row').slice(1);
    expect(rows).toHaveLength(2);
    // FDI 36 and 46 shown as Universal 19 and 30 (references.md, ISO 3950 / HL7 crosswalk), FDI in small print.
    expect(rows[0]).toHaveTextContent(/19\s*FDI 36/);
    expect(rows[0]).toHaveTextContent(/30\s*FDI 46/);
    expect(within(rows[0]!).getByLabelText('waiting 21 days')).toBeInTheDocument();
  });

  it('passes every filter to the server in the query string and keeps it in the address bar', async () => {
    const calls = mockFetch(answers([item(41)]));
    const { router } = renderQueue();
    await screen.findByRole('table', { name: 'Referrals' });

    await userEvent.click(screen.getByLabelText(/Triaged/));
    await waitFor(() => expect(lastQuery(calls).status).toBe('received,planned,booked,in_treatment'));

    await userEvent.click(screen.getByRole('combobox', { name: 'Urgency' }));
    await userEvent.click(await screen.findByRole('option', { name: 'Urgent' }));
    await waitFor(() => expect(lastQuery(calls).urgency).toBe('urgent'));

    await userEvent.click(screen.getByRole('combobox', { name: 'Location' }));
    await userEvent.click(await screen.findByRole('option', { name: 'Mill Lane' }));
    await waitFor(() => expect(lastQuery(calls).locationId).toBe('2'));

    fireEvent.change(screen.getByLabelText('Received from'), { target: { value: '2026-01-01' } });
    await waitFor(() => expect(lastQuery(calls).from).toBe('2026-01-01'));

    await userEvent.type(screen.getByRole('textbox', { name: 'Patient' }), 'Lark');
    await waitFor(() => expect(lastQuery(calls).q).toBe('Lark'));

    await userEvent.click(screen.getByRole('button', { name: /Patient/ }));
    await waitFor(() => expect(lastQuery(calls)).toMatchObject({ sort: 'patient', order: 'asc' }));
    expect(screen.getByRole('columnheader', { name: /Patient/ })).toHaveAttribute('aria-sort', 'ascending');

    expect(lastQuery(calls)).toEqual({
      status: 'received,planned,booked,in_treatment',
      urgency: 'urgent',
      locationId: '2',
      from: '2026-01-01',
      q: 'Lark',
      sort: 'patient',
      order: 'asc',
      page: '1',
      pageSize: '25',
    });
    expect(Object.fromEntries(new URLSearchParams(router.state.location.search))).toMatchObject({ urgency: 'urgent', locationId: '2', q: 'Lark', sort: 'patient' });
  });

  it('reads its filters from the address, "any status" included, and pages on the server', async () => {
    const calls = mockFetch(answers(Array.from({ length: 25 }, (_, i) => item(100 + i)), 60));
    renderQueue('/referrals?status=all&referringDentistId=3&urgency=soon');
    await screen.findByRole('table', { name: 'Referrals' });
    expect(lastQuery(calls)).toEqual({ referringDentistId: '3', urgency: 'soon', sort: 'waiting', order: 'asc', page: '1', pageSize: '25' });
    expect(screen.getByText('1–25 of 60')).toBeInTheDocument();
    await userEvent.click(screen.getByRole('button', { name: 'Page 2' }));
    await waitFor(() => expect(lastQuery(calls).page).toBe('2'));
  });

  it('opens the referral from its row', async () => {
    mockFetch(answers([item(41)]));
    const { router } = renderQueue();
    const table = await screen.findByRole('table', { name: 'Referrals' });
    await userEvent.click(within(table).getByText('Harbour Street'));
    await waitFor(() => expect(router.state.location.pathname).toBe('/referrals/41'));
    expect(router.state.location.state).toEqual({ from: '/referrals' });
  });

  it('says what to do when nothing is waiting', async () => {
    mockFetch(answers([]));
    renderQueue();
    expect(await screen.findByText('No referrals are waiting')).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'Take a referral' })).toHaveAttribute('href', '/intake');
  });
});
