import type { LocationResource, OperatorSchedule, WorkingRuleInput } from '@ostium/shared';
import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it } from 'vitest';
import { sessionStore } from '../../../lib/session';
import { mockFetch, renderRoutes, type MockCall } from '../../../test/render';
import { signInAs } from '../../case-sheet/test/case-sheet.fixtures';
import { chairBoardRoutes } from '../../chair-board/routes';
import { ENDODONTISTS, location } from '../../chair-board/test/scheduling.fixtures';

const LOCATION: LocationResource = { ...location(), closures: [{ id: 3, locationId: 1, date: '2026-12-25', reason: 'Public holiday' }] };
const SCHEDULE: OperatorSchedule = {
  operatorId: 5,
  name: 'Dr. Test Endodontist',
  workingRules: [{ id: 11, operatorId: 5, locationId: 1, rrule: 'FREQ=WEEKLY;BYDAY=TU,TH', start: '08:00', end: '16:30', breaks: [{ start: '12:00', end: '12:45' }] }],
  timeOff: [],
  holds: [{ id: 21, operatorId: 5, locationId: 1, rrule: 'FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR', start: '15:30', end: '16:00', opensEveningBeforeAt: '18:00' }],
};

function serve() {
  return mockFetch({
    'GET /api/scheduling/resources': () => ({ status: 200, body: { locations: [LOCATION], operators: [SCHEDULE, { operatorId: 6, name: ENDODONTISTS[1]!.name, workingRules: [], timeOff: [], holds: [] }] } }),
    'POST /api/operators/5/working-rules': (b) => ({ status: 201, body: { id: 12, operatorId: 5, ...(b as WorkingRuleInput) } }),
    'POST /api/locations/1/closures': (b) => ({ status: 201, body: { id: 4, locationId: 1, ...(b as object) } }),
    'PUT /api/chairs/2': (b) => ({ status: 200, body: { id: 2, locationId: 1, ...(b as object) } }),
  });
}

const open = () => renderRoutes([{ path: '/', children: chairBoardRoutes }], '/settings/resources');
const body = (calls: MockCall[], key: string) => calls.filter((c) => c.key === key).at(-1)?.body;

describe('ResourcesPage', () => {
  afterEach(() => sessionStore.set(null));

  it('the weekday picker writes BYDAY=MO,WE into a new working rule', async () => {
    signInAs('admin');
    const calls = serve();
    open();
    await userEvent.click(await screen.findByRole('tab', { name: 'Endodontist schedules' }));
    const existing = await screen.findByRole('form', { name: 'working rule Tue, Thu' });
    expect(within(existing).getByRole('button', { name: 'Tuesday' })).toHaveAttribute('aria-pressed', 'true');
    expect(within(existing).getByRole('button', { name: 'Monday' })).toHaveAttribute('aria-pressed', 'false');

    const form = screen.getByRole('form', { name: 'new working rule' });
    // Picked out of order on purpose: the rule lists days in week order (RFC 5545 BYDAY).
    await userEvent.click(within(form).getByRole('button', { name: 'Wednesday' }));
    await userEvent.click(within(form).getByRole('button', { name: 'Monday' }));
    expect(within(form).getByLabelText('Rule as saved')).toHaveTextContent('FREQ=WEEKLY;BYDAY=MO,WE');
    await userEvent.type(within(form).getByLabelText('Lunch from'), '12:00');
    await userEvent.type(within(form).getByLabelText('Lunch to'), '12:45');
    await userEvent.click(within(form).getByRole('button', { name: 'Add rule' }));
    await waitFor(() =>
      expect(body(calls, 'POST /api/operators/5/working-rules')).toEqual({ locationId: 1, rrule: 'FREQ=WEEKLY;BYDAY=MO,WE', start: '08:00', end: '16:30', breaks: [{ start: '12:00', end: '12:45' }] }),
    );
  });

  it('shows holds in words and a location’s closures, and adds a closure with its reason', async () => {
    signInAs('admin');
    const calls = serve();
    open();
    const closures = await screen.findByRole('region', { name: 'Closures' });
    expect(within(closures).getByText('Public holiday')).toBeInTheDocument();
    const add = within(closures).getByRole('form', { name: 'Add a closure' });
    await userEvent.type(within(add).getByLabelText(/Date/), '2026-07-03');
    await userEvent.type(within(add).getByLabelText(/Reason/), 'Staff training');
    await userEvent.click(within(add).getByRole('button', { name: 'Add closure' }));
    await waitFor(() => expect(body(calls, 'POST /api/locations/1/closures')).toEqual({ date: '2026-07-03', reason: 'Staff training' }));

    await userEvent.click(screen.getByRole('tab', { name: 'Endodontist schedules' }));
    const holds = await screen.findByRole('region', { name: 'Emergency holds' });
    expect(within(holds).getByText('Mon, Tue, Wed, Thu, Fri')).toBeInTheDocument();
    expect(within(holds).getByText('opens 18:00 the day before')).toBeInTheDocument();
  });

  it('fixes a microscope to a chair', async () => {
    signInAs('admin');
    const calls = serve();
    open();
    await userEvent.click(await screen.findByRole('tab', { name: 'Chairs and microscopes' }));
    await userEvent.click(await screen.findByRole('combobox', { name: 'Fixed microscope of Chair 2' }));
    // Only fixed microscopes may be bolted to a chair; the mobile one is not offered.
    expect(screen.queryByRole('option', { name: 'Scope B' })).toBeNull();
    await userEvent.click(await screen.findByRole('option', { name: 'Scope A' }));
    await userEvent.click(screen.getByRole('button', { name: 'Save Chair 2' }));
    await waitFor(() => expect(body(calls, 'PUT /api/chairs/2')).toEqual({ name: 'Chair 2', fixedMicroscopeId: 1 }));
  });
});
