import type { UpdateAppointmentRequest } from '@ostium/shared';
import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { sessionStore } from '../../../lib/session';
import { mockFetch, renderPage, renderRoutes, type MockCall } from '../../../test/render';
import { practice, signInAs } from '../../case-sheet/test/case-sheet.fixtures';
import { makeLookup } from '../board.util';
import { chairBoardRoutes } from '../routes';
import { appointment, ENDODONTISTS, location } from '../test/scheduling.fixtures';
import { useBoardChange, type BoardChange } from '../use-board-change';
import { ChangeProblemAlert } from './change-problem-alert';

const OTHER = appointment({ id: 9, version: 1, patient: { id: 8, name: 'Sam Example' }, toothFdi: '11', chairId: 2, microscopeId: null, level: 'low', state: 'confirmed', start: '2026-03-09T14:00:00.000Z', end: '2026-03-09T15:00:00.000Z' });
const CONFLICT = { statusCode: 409, message: 'The time is taken', conflicts: [{ visitIndex: 0, resource: 'chair', resourceId: 2, appointmentId: 9, start: OTHER.start, end: OTHER.end }] };

function serve(patch: (body: UpdateAppointmentRequest) => { status: number; body?: unknown } = () => ({ status: 409, body: CONFLICT })) {
  return mockFetch({
    'GET /api/waitlist/fits': () => ({
      status: 200,
      body: [{ id: 1, caseId: 30, patient: { id: 31, name: 'Kim Example' }, toothFdi: '46', minutesPerVisit: [60], needsMicroscope: false, createdAt: '2026-03-01T00:00:00Z', fit: { start: '2026-03-09T13:00:00.000Z', end: '2026-03-09T14:00:00.000Z', chairId: 1, operatorId: 5 } }],
    }),
    'GET /api/locations': () => ({ status: 200, body: [location()] }),
    'GET /api/practice': () => ({ status: 200, body: practice('universal') }),
    'GET /api/users': () => ({ status: 200, body: ENDODONTISTS }),
    'GET /api/appointments': () => ({ status: 200, body: [appointment(), OTHER, appointment({ id: 50, state: 'cancelled', patient: { id: 9, name: 'Gone Example' } })] }),
    'PATCH /api/appointments/41': (body) => patch(body as UpdateAppointmentRequest),
  });
}

const calls = (all: MockCall[], key: string) => all.filter((c) => c.key === key);

describe('BoardPage', () => {
  afterEach(() => sessionStore.set(null));

  it('draws one column per chair from one query of the day, with labelled blocks', async () => {
    signInAs('frontdesk');
    const all = serve();
    renderRoutes([{ path: '/', children: chairBoardRoutes }], '/board?date=2026-03-09&locationId=1');

    const chairs = await screen.findByRole('group', { name: 'Chairs' });
    expect(await within(chairs).findByLabelText(/^Robin Example, tooth 19, Root canal therapy, 09:00 to 10:55, Chair 1, unconfirmed/)).toBeInTheDocument();
    expect(within(chairs).getByLabelText(/^Sam Example, tooth 8, .*10:00 to 11:00, Chair 2, confirmed/)).toBeInTheDocument();
    // Cancelled visits free their time and are not drawn.
    expect(within(chairs).queryByText(/Gone Example/)).toBeNull();
    expect(chairs.querySelectorAll('.ostium-board-calendar')).toHaveLength(2);
    // The state reads as a word, not only as a colour.
    expect(within(chairs).getByText('Unconfirmed')).toBeInTheDocument();
    expect(within(chairs).getByText('Confirmed')).toBeInTheDocument();

    const gets = calls(all, 'GET /api/appointments');
    expect(gets).toHaveLength(1);
    // The New York day of 9 March 2026 (EDT, −4) as a UTC window.
    expect(Object.fromEntries(gets[0]!.query)).toEqual({ from: '2026-03-09T04:00:00.000Z', to: '2026-03-10T04:00:00.000Z', locationId: '1' });
  });

  it('opens a block for details and confirms it with the version it read', async () => {
    signInAs('frontdesk');
    const all = serve((b) => ({ status: 200, body: appointment({ version: b.version + 1, state: 'confirmed', confirmedAt: '2026-03-08T12:00:00.000Z' }) }));
    renderRoutes([{ path: '/', children: chairBoardRoutes }], '/board?date=2026-03-09&locationId=1');
    const block = await screen.findByLabelText(/^Robin Example, tooth 19/);
    await userEvent.click(block);
    const details = await screen.findByRole('table', { name: 'Visit details' });
    expect(within(details).getByText('Dr. Test Endodontist')).toBeInTheDocument();
    expect(within(details).getByText('Scope A')).toBeInTheDocument();
    await userEvent.click(screen.getByRole('button', { name: 'Confirm' }));
    await waitFor(() => expect(calls(all, 'PATCH /api/appointments/41')).toHaveLength(1));
    expect(calls(all, 'PATCH /api/appointments/41')[0]!.body).toEqual({ version: 3, state: 'confirmed' });
  });

  it('cancels with a reason and lists the waitlisted patients who fit the freed time', async () => {
    signInAs('frontdesk');
    const all = serve((b) => ({ status: 200, body: appointment({ version: b.version + 1, state: 'cancelled', cancellation: { byName: 'Desk', reason: b.reason!, at: '2026-03-08T12:00:00Z', noticeHours: 25 } }) }));
    renderRoutes([{ path: '/', children: chairBoardRoutes }], '/board?date=2026-03-09&locationId=1');
    await userEvent.click(await screen.findByLabelText(/^Robin Example, tooth 19/));
    await userEvent.click(await screen.findByRole('button', { name: 'Cancel visit…' }));
    const cancel = screen.getByRole('button', { name: 'Cancel this visit' });
    expect(cancel).toBeDisabled();
    await userEvent.type(screen.getByLabelText(/Reason for cancelling/), 'Patient is travelling');
    await userEvent.click(cancel);
    const freed = await screen.findByRole('region', { name: 'Waitlist for the freed time' });
    expect(calls(all, 'PATCH /api/appointments/41')[0]!.body).toEqual({ version: 3, state: 'cancelled', reason: 'Patient is travelling' });
    // FDI 46 is Universal 30 (references.md, "Tooth numbering").
    expect(await within(freed).findByText(/tooth 30 · 60 min/)).toBeInTheDocument();
    expect(within(freed).getByRole('link', { name: 'Find times' })).toHaveAttribute('href', '/cases/30/find-times');
    expect(Object.fromEntries(calls(all, 'GET /api/waitlist/fits')[0]!.query)).toEqual({ appointmentId: '41' });
  });

  it('a move to a busy chair from the drawer is refused with the conflict named', async () => {
    signInAs('frontdesk');
    const all = serve();
    renderRoutes([{ path: '/', children: chairBoardRoutes }], '/board?date=2026-03-09&locationId=1');
    await userEvent.click(await screen.findByLabelText(/^Robin Example, tooth 19/));
    const form = await screen.findByRole('form', { name: 'Move or resize' });
    await userEvent.click(within(form).getByRole('combobox', { name: 'Chair' }));
    await userEvent.click(await screen.findByRole('option', { name: 'Chair 2' }));
    await userEvent.click(within(form).getByRole('button', { name: 'Move visit' }));
    const alert = await screen.findByRole('alert');
    expect(alert).toHaveTextContent('Not moved: the time is taken');
    expect(alert).toHaveTextContent('Chair 2 is taken 10:00–11:00 by Sam Example (visit #9)');
    // Moving off chair 1 leaves its fixed microscope behind: only the chair changes.
    expect(calls(all, 'PATCH /api/appointments/41')[0]!.body).toEqual({ version: 3, chairId: 2 });
  });
});

function MoveHarness({ change }: { change: BoardChange }) {
  const lookup = makeLookup({ notation: 'universal', locations: [location()], operators: ENDODONTISTS, appointments: [appointment(), OTHER] });
  const board = useBoardChange(lookup);
  return (
    <>
      <button type="button" onClick={() => void board.apply(change)}>
        drop
      </button>
      <ChangeProblemAlert problem={board.problem} />
    </>
  );
}

describe('useBoardChange', () => {
  afterEach(() => sessionStore.set(null));

  it('on a 409 for a drag onto another chair, puts the block back and names the conflict', async () => {
    signInAs('frontdesk');
    const all = serve();
    const revert = vi.fn();
    // What BoardCalendar hands over when a block from chair 1 lands on chair 2 at 10:15 local.
    renderPage(<MoveHarness change={{ appointment: appointment(), start: '2026-03-09T14:15:00.000Z', end: '2026-03-09T16:10:00.000Z', chairId: 2, revert }} />);
    await userEvent.click(screen.getByRole('button', { name: 'drop' }));
    const alert = await screen.findByRole('alert');
    expect(revert).toHaveBeenCalledTimes(1);
    expect(alert).toHaveTextContent('Chair 2 is taken 10:00–11:00 by Sam Example (visit #9)');
    expect(alert).toHaveTextContent('The visit was put back where it was.');
    expect(calls(all, 'PATCH /api/appointments/41')[0]!.body).toEqual({ version: 3, start: '2026-03-09T14:15:00.000Z', end: '2026-03-09T16:10:00.000Z', chairId: 2 });
  });

  it('keeps the block where it was dropped when the server accepts', async () => {
    signInAs('frontdesk');
    serve((b) => ({ status: 200, body: appointment({ version: b.version + 1, start: b.start!, end: b.end! }) }));
    const revert = vi.fn();
    renderPage(<MoveHarness change={{ appointment: appointment(), start: '2026-03-09T13:30:00.000Z', end: '2026-03-09T15:25:00.000Z', revert }} />);
    await userEvent.click(screen.getByRole('button', { name: 'drop' }));
    await waitFor(() => expect(screen.queryByRole('alert')).toBeNull());
    expect(revert).not.toHaveBeenCalled();
  });
});
