import type { BookAppointmentsRequest, TimeFinderApiRequest, TimeFinderApiResponse } from '@ostium/shared';
import { notifications } from '@mantine/notifications';
import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it } from 'vitest';
import { sessionStore } from '../../../lib/session';
import { mockFetch, renderRoutes, type MockCall } from '../../../test/render';
import { caseSheet, highEstimate, practice, signInAs } from '../../case-sheet/test/case-sheet.fixtures';
import { chairBoardRoutes } from '../../chair-board/routes';
import { appointment, ENDODONTISTS, location } from '../../chair-board/test/scheduling.fixtures';
import { FindTimesButton } from './find-times-button';

// Two two-visit series for a high-difficulty molar: the second 14 and 8 days after the first, same endodontist.
const PROPOSALS: TimeFinderApiResponse = {
  proposals: [
    {
      visits: [
        { start: '2026-03-09T13:00:00.000Z', end: '2026-03-09T14:30:00.000Z', chairId: 1, operatorId: 5, microscopeId: 1 },
        { start: '2026-03-23T13:00:00.000Z', end: '2026-03-23T14:30:00.000Z', chairId: 1, operatorId: 5, microscopeId: 1 },
      ],
      gapMinutesLeft: 0,
      reasons: ['earliest start', 'touches the start of the day'],
    },
    {
      visits: [
        { start: '2026-03-10T18:00:00.000Z', end: '2026-03-10T19:30:00.000Z', chairId: 2, operatorId: 6, microscopeId: 2 },
        { start: '2026-03-18T18:00:00.000Z', end: '2026-03-18T19:30:00.000Z', chairId: 2, operatorId: 6, microscopeId: 2 },
      ],
      gapMinutesLeft: 20,
      reasons: ['afternoon as preferred'],
    },
  ],
};

function serve(opts: { search?: TimeFinderApiResponse; book?: (call: MockCall) => { status: number; body?: unknown } } = {}) {
  return mockFetch({
    'GET /api/cases/7': () => ({ status: 200, body: caseSheet({ status: 'planned', estimate: highEstimate(), bookedMinutesPerVisit: [90, 90] }) }),
    'GET /api/locations': () => ({ status: 200, body: [location()] }),
    'GET /api/practice': () => ({ status: 200, body: practice('universal') }),
    'GET /api/users': () => ({ status: 200, body: ENDODONTISTS }),
    'POST /api/time-finder': () => ({ status: 200, body: opts.search ?? PROPOSALS }),
    'POST /api/appointments': (_b, call) =>
      opts.book?.(call) ?? {
        status: 201,
        body: { appointments: (call.body as BookAppointmentsRequest).visits.map((v, i) => appointment({ id: 60 + i, visitIndex: i, start: v.start, end: v.end, chairId: v.chairId, operatorId: v.operatorId, microscopeId: v.microscopeId ?? null })) },
      },
  });
}

const open = () => renderRoutes([{ path: '/', children: chairBoardRoutes }, { path: '/board', element: <p>board</p> }], '/cases/7/find-times');
const posts = (calls: MockCall[], key: string) => calls.filter((c) => c.key === key);

describe('FindTimesPage', () => {
  afterEach(() => {
    sessionStore.set(null);
    // The toast store is global: a "Booked" toast must not linger into the next test.
    notifications.clean();
  });

  it('lists each series with day, time, chair, endodontist, microscope, spacing, gap and reasons', async () => {
    signInAs('frontdesk');
    const calls = serve();
    open();
    const first = await screen.findByRole('article', { name: 'Proposal 1' });
    // 13:00Z on 9 March 2026 is 09:00 in New York (EDT, −4, after the 8 March change; references.md "Calendars").
    expect(within(first).getByText('Mon 9 Mar 2026, 09:00–10:30')).toBeInTheDocument();
    expect(within(first).getByText('14 days after visit 1')).toBeInTheDocument();
    expect(within(first).getAllByText(/Chair 1 · Dr. Test Endodontist · Scope A/)).toHaveLength(2);
    expect(within(first).getByText('Leaves no gap')).toBeInTheDocument();
    expect(within(first).getByText('touches the start of the day')).toBeInTheDocument();
    const second = screen.getByRole('article', { name: 'Proposal 2' });
    expect(within(second).getByText('Leaves a 20-min gap')).toBeInTheDocument();
    expect(within(second).getByText('8 days after visit 1')).toBeInTheDocument();
    expect(posts(calls, 'POST /api/time-finder')[0]!.body).toEqual({ caseId: 7, limit: 5, locationId: 1 });
  });

  it('sends the patient preferences to the time finder', async () => {
    signInAs('frontdesk');
    const calls = serve();
    open();
    await screen.findByRole('article', { name: 'Proposal 1' });
    await userEvent.click(screen.getByRole('checkbox', { name: 'Wednesday' }));
    await userEvent.click(screen.getByRole('checkbox', { name: 'Monday' }));
    await userEvent.click(screen.getByRole('radio', { name: 'Afternoon' }));
    await waitFor(() => expect((posts(calls, 'POST /api/time-finder').at(-1)!.body as TimeFinderApiRequest).preferences).toEqual({ weekdays: [1, 3], partOfDay: 'afternoon' }));
  });

  it('books the chosen proposal with an Idempotency-Key, then links to the board day', async () => {
    signInAs('frontdesk');
    const calls = serve();
    open();
    await userEvent.click(await screen.findByRole('button', { name: 'Book proposal 2' }));
    const done = await screen.findByRole('status');
    const booking = posts(calls, 'POST /api/appointments');
    expect(booking).toHaveLength(1);
    expect(booking[0]!.body).toEqual({ caseId: 7, visits: PROPOSALS.proposals[1]!.visits });
    expect(booking[0]!.headers['idempotency-key']).toMatch(/^[0-9a-f-]{32,36}$/);
    expect(done).toHaveTextContent('Visit 1: Tue 10 Mar 2026, 14:00–15:30 · Chair 2');
    expect(within(done).getByRole('link', { name: /Open the Chair board on Tue 10 Mar 2026/ })).toHaveAttribute('href', '/board?date=2026-03-10&locationId=1');
    // Booked: the other proposals can no longer be booked from this page.
    expect(screen.getByRole('button', { name: 'Book proposal 1' })).toBeDisabled();
  });

  it('a retry of the same proposal after a failed answer sends the same key', async () => {
    signInAs('frontdesk');
    let n = 0;
    // The first answer is lost (server unreachable); the retry succeeds.
    const calls = serve({ book: (call) => (n++ === 0 ? { status: 503, body: { statusCode: 503, message: 'Try again' } } : { status: 201, body: { appointments: [appointment({ start: (call.body as BookAppointmentsRequest).visits[0]!.start })] } }) });
    open();
    await userEvent.click(await screen.findByRole('button', { name: 'Book proposal 1' }));
    expect(await screen.findByRole('alert')).toHaveTextContent('Try again');
    await userEvent.click(await screen.findByRole('button', { name: 'Book proposal 1' }));
    await screen.findByRole('status');
    const [a, b] = posts(calls, 'POST /api/appointments');
    expect(a!.headers['idempotency-key']).toBeTruthy();
    expect(b!.headers['idempotency-key']).toBe(a!.headers['idempotency-key']);
  });

  it('names the conflict when the slot was taken meanwhile', async () => {
    signInAs('frontdesk');
    serve({
      book: () => ({ status: 409, body: { statusCode: 409, message: 'Visit 2 collides with a booking', conflicts: [{ visitIndex: 1, resource: 'microscope', resourceId: 1, appointmentId: 77, start: '2026-03-23T13:30:00.000Z', end: '2026-03-23T14:00:00.000Z' }] } }),
    });
    open();
    await userEvent.click(await screen.findByRole('button', { name: 'Book proposal 1' }));
    const alert = await screen.findByRole('alert');
    expect(alert).toHaveTextContent('Visit 2 collides with a booking');
    expect(alert).toHaveTextContent('Microscope Scope A is taken 09:30–10:00 by visit #77');
  });

  it('says clearly why nothing could be placed', async () => {
    signInAs('frontdesk');
    serve({ search: { proposals: [], unplaceable: { reason: 'no microscope free inside the interval' } } });
    open();
    const alert = await screen.findByRole('alert');
    expect(alert).toHaveTextContent('No time found');
    expect(alert).toHaveTextContent('No microscope free inside the interval.');
  });
});

describe('FindTimesButton', () => {
  afterEach(() => sessionStore.set(null));

  it('links to the case’s proposals for those who book, and is absent for others', () => {
    signInAs('frontdesk');
    const { unmount } = renderRoutes([{ path: '*', element: <FindTimesButton caseId={7} /> }]);
    expect(screen.getByRole('link', { name: 'Find times' })).toHaveAttribute('href', '/cases/7/find-times');
    unmount();
    signInAs('assistant');
    renderRoutes([{ path: '*', element: <FindTimesButton caseId={7} /> }]);
    expect(screen.queryByRole('link', { name: 'Find times' })).toBeNull();
  });
});
