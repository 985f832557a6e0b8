import type { PublicVisitView } from '@ostium/shared';
import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { mockFetch, renderRoutes } from '../../../test/render';
import { publicVisitRoutes } from '../routes';

const TOKEN = 'aB3-xY9_q';

function view(over: Partial<PublicVisitView> = {}): PublicVisitView {
  return {
    practiceName: 'Quillfern Endodontics',
    practicePhone: '+12025550100',
    locationName: 'Riverside',
    when: 'Thursday 3 December 2026, 9:30 AM',
    start: '2026-12-03T14:30:00.000Z',
    state: 'booked',
    canConfirm: true,
    canAskToReschedule: true,
    ...over,
  };
}

const open = () => renderRoutes(publicVisitRoutes, `/v/${TOKEN}`);

describe('PublicVisitPage', () => {
  it('shows only the practice, the visit’s time and place, and the two buttons', async () => {
    mockFetch({ [`GET /api/public/visits/${TOKEN}`]: () => ({ status: 200, body: view() }) });
    open();
    expect(await screen.findByRole('heading', { name: 'Thursday 3 December 2026, 9:30 AM' })).toBeInTheDocument();
    expect(screen.getByText('Your visit at Quillfern Endodontics')).toBeInTheDocument();
    expect(screen.getByText('Riverside')).toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Confirm' })).toBeEnabled();
    expect(screen.getByRole('button', { name: 'I need another time' })).toBeEnabled();
    // NANP 555-01xx fictional number, shown nationally and dialled as stored.
    expect(screen.getByRole('link', { name: '(202) 555-0100' })).toHaveAttribute('href', 'tel:+12025550100');
    expect(screen.getByText('Ostium')).toBeInTheDocument();
    // No navigation, no sign-in, no account menu.
    expect(screen.queryByRole('navigation')).toBeNull();
    expect(screen.queryByLabelText('Account menu')).toBeNull();
  });

  it('dials a phone number the server sent formatted for reading', async () => {
    mockFetch({ [`GET /api/public/visits/${TOKEN}`]: () => ({ status: 200, body: view({ practicePhone: '(202) 555-0100' }) }) });
    open();
    expect(await screen.findByRole('link', { name: '(202) 555-0100' })).toHaveAttribute('href', 'tel:2025550100');
  });

  it('confirms and thanks the patient', async () => {
    const calls = mockFetch({
      [`GET /api/public/visits/${TOKEN}`]: () => ({ status: 200, body: view() }),
      [`POST /api/public/visits/${TOKEN}`]: () => ({ status: 200, body: view({ state: 'confirmed', canConfirm: false }) }),
    });
    const user = userEvent.setup();
    open();
    await user.click(await screen.findByRole('button', { name: 'Confirm' }));
    expect(await screen.findByText('Thank you, your visit is confirmed')).toBeInTheDocument();
    expect(calls.find((c) => c.key === `POST /api/public/visits/${TOKEN}`)!.body).toEqual({ action: 'confirm' });
    expect(screen.queryByRole('button', { name: 'Confirm' })).toBeNull();
    // Sent without a session: the page never asks for one.
    expect(calls.every((c) => !c.headers.authorization)).toBe(true);
  });

  it('asks for another time', async () => {
    const calls = mockFetch({
      [`GET /api/public/visits/${TOKEN}`]: () => ({ status: 200, body: view() }),
      [`POST /api/public/visits/${TOKEN}`]: () => ({ status: 200, body: view({ state: 'reschedule_requested', canConfirm: false, canAskToReschedule: false }) }),
    });
    const user = userEvent.setup();
    open();
    await user.click(await screen.findByRole('button', { name: 'I need another time' }));
    expect(await screen.findByText('Thank you, we will be in touch')).toBeInTheDocument();
    expect(calls.find((c) => c.key === `POST /api/public/visits/${TOKEN}`)!.body).toEqual({ action: 'reschedule' });
    expect(screen.queryByRole('button', { name: 'I need another time' })).toBeNull();
    expect(screen.queryByRole('button', { name: 'Confirm' })).toBeNull();
  });

  it.each([
    // A confirmed visit may still ask for another time (server/src/replies/public-visits.service.ts).
    ['Your visit is already confirmed', view({ state: 'confirmed', canConfirm: false })],
    ['This visit was cancelled', view({ state: 'cancelled', canConfirm: false, canAskToReschedule: false })],
    ['This visit has already passed', view({ state: 'past', canConfirm: false, canAskToReschedule: false })],
  ])('says “%s” for that state, without the buttons it does not allow', async (title, v) => {
    mockFetch({ [`GET /api/public/visits/${TOKEN}`]: () => ({ status: 200, body: v }) });
    open();
    expect(await screen.findByText(title)).toBeInTheDocument();
    if (!v.canConfirm) expect(screen.queryByRole('button', { name: 'Confirm' })).toBeNull();
    if (!v.canAskToReschedule) expect(screen.queryByRole('button', { name: 'I need another time' })).toBeNull();
  });

  it('says when a link has expired', async () => {
    mockFetch({ [`GET /api/public/visits/${TOKEN}`]: () => ({ status: 410, body: { statusCode: 410, message: 'This link has expired' } }) });
    open();
    expect(await screen.findByText('This link has expired')).toBeInTheDocument();
    expect(screen.queryByRole('button')).toBeNull();
  });

  it('says when a link is not one of ours', async () => {
    mockFetch({ [`GET /api/public/visits/${TOKEN}`]: () => ({ status: 404, body: { statusCode: 404, message: 'No such visit link' } }) });
    open();
    expect(await screen.findByText('This link does not work')).toBeInTheDocument();
  });

  it('shows the server’s refusal of an action', async () => {
    mockFetch({
      [`GET /api/public/visits/${TOKEN}`]: () => ({ status: 200, body: view() }),
      [`POST /api/public/visits/${TOKEN}`]: () => ({ status: 409, body: { statusCode: 409, message: 'This visit was cancelled in the meantime' } }),
    });
    const user = userEvent.setup();
    open();
    await user.click(await screen.findByRole('button', { name: 'Confirm' }));
    await waitFor(() => expect(screen.getByRole('alert')).toHaveTextContent('This visit was cancelled in the meantime'));
  });
});
