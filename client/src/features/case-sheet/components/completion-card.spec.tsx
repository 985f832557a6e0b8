import { ROLES, type CaseCompletionView, type CompleteCaseRequest } from '@ostium/shared';
import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { sessionStore } from '../../../lib/session';
import { mockFetch, renderPage, renderRoutes } from '../../../test/render';
import { caseSheetRoutes } from '../routes';
import { caseSheet, estimate, FACTORS, practice, signInAs } from '../test/case-sheet.fixtures';
import { CompletionCard } from './completion-card';

function view(over: Partial<CaseCompletionView> = {}): CaseCompletionView {
  return {
    caseId: 7,
    referralId: 12,
    caseStatus: 'in_treatment',
    timeZone: 'America/New_York',
    visits: [
      { appointmentId: 41, visitIndex: 0, date: '2026-11-24', startTime: '09:00', endTime: '10:30', start: '2026-11-24T14:00:00.000Z', end: '2026-11-24T15:30:00.000Z', endodontist: 'Dr. Test endodontist', locationName: 'Riverside' },
      { appointmentId: 42, visitIndex: 1, date: '2026-12-01', startTime: '09:00', endTime: '10:00', start: '2026-12-01T14:00:00.000Z', end: '2026-12-01T15:00:00.000Z', endodontist: 'Dr. Test endodontist', locationName: 'Riverside' },
    ],
    openVisits: [],
    canComplete: true,
    blockedBy: null,
    defaultRecallPlan: [6, 12],
    completion: null,
    ...over,
  };
}

function completed(body: CompleteCaseRequest): CaseCompletionView {
  return view({
    caseStatus: 'completed',
    canComplete: false,
    blockedBy: 'The case is completed',
    completion: {
      findings: body.findings,
      recallPlan: (body.recallPlan ?? []).map((months) => ({ months, dueOn: months === 6 ? '2027-06-01' : '2027-12-01' })),
      sendReport: body.sendReport ?? true,
      treatmentEndedOn: '2026-12-01',
      completedAt: '2026-12-02T10:00:00.000Z',
      completedBy: 'Dr. Test endodontist',
      report: body.sendReport === false ? null : { id: 88, kind: 'completion_report', to: 'referrer@example.com', subject: 'Completion report', status: 'queued', detail: null, at: '2026-12-02T10:00:00.000Z', sentAt: null },
    },
  });
}

describe('CompletionCard', () => {
  afterEach(() => {
    sessionStore.set(null);
    vi.restoreAllMocks();
  });

  it.each(ROLES)('shows on the case sheet only to the endodontist (role %s)', async (role) => {
    signInAs(role);
    const calls = mockFetch({
      'GET /api/cases/7': () => ({ status: 200, body: caseSheet({ status: 'in_treatment', estimate: estimate() }) }),
      'GET /api/estimates/factors': () => ({ status: 200, body: FACTORS }),
      'GET /api/practice': () => ({ status: 200, body: practice('universal') }),
      'GET /api/users': () => ({ status: 200, body: [] }),
      'POST /api/estimates': () => ({ status: 200, body: estimate() }),
      'GET /api/cases/7/completion': () => ({ status: 200, body: view() }),
    });
    renderRoutes([{ path: '/', children: caseSheetRoutes }], '/cases/7');
    // shared ACCESS.completionReport: the endodontist only; the assistant does not see case sheets at all.
    if (role === 'assistant') {
      expect(await screen.findByText('Not available for your role')).toBeInTheDocument();
      expect(calls.some((c) => c.key === 'GET /api/cases/7/completion')).toBe(false);
      return;
    }
    await screen.findByRole('heading', { name: /Robin Example · tooth 19/ });
    if (role === 'endodontist') {
      expect(await screen.findByRole('region', { name: 'Finish treatment' })).toBeInTheDocument();
      expect(await screen.findByLabelText(/Findings for the referring dentist/)).toBeInTheDocument();
    } else {
      await screen.findByRole('region', { name: 'Chair-time estimate' });
      expect(screen.queryByRole('region', { name: 'Finish treatment' })).toBeNull();
      expect(calls.some((c) => c.key === 'GET /api/cases/7/completion')).toBe(false);
    }
  });

  it('sends the findings, the recall plan and the report choice, then shows the letter’s state and its PDF', async () => {
    signInAs('endodontist');
    const user = userEvent.setup();
    const calls = mockFetch({
      'GET /api/cases/7/completion': () => ({ status: 200, body: view() }),
      'POST /api/cases/7/completion': (b) => ({ status: 201, body: completed(b as CompleteCaseRequest) }),
      'GET /api/letters/88/pdf': () => ({ status: 200, body: {} }),
    });
    const tab = { location: { href: '' }, close: vi.fn() };
    vi.spyOn(window, 'open').mockReturnValue(tab as unknown as Window);
    renderPage(<CompletionCard caseId={7} />);
    const visits = await screen.findByRole('list', { name: 'Visits done' });
    expect(within(visits).getAllByRole('listitem').map((li) => li.textContent)).toEqual([
      'Tue 24 Nov 2026, 09:00–10:30 · Dr. Test endodontist · Riverside',
      'Tue 1 Dec 2026, 09:00–10:00 · Dr. Test endodontist · Riverside',
    ]);
    // The estimate's recall months start the plan; due dates count from the last visit (1 Dec 2026).
    expect(screen.getByText('Reviews due 1 Jun 2027, 1 Dec 2027')).toBeInTheDocument();
    expect(screen.getByLabelText('Send the report to the referring dentist')).toBeChecked();
    await user.type(screen.getByLabelText(/Findings for the referring dentist/), 'Three canals found and filled; MB2 located under the microscope.');
    await user.click(screen.getByRole('button', { name: 'Finish and send the report' }));
    await waitFor(() =>
      expect(calls.find((c) => c.key === 'POST /api/cases/7/completion')?.body).toEqual({ findings: 'Three canals found and filled; MB2 located under the microscope.', recallPlan: [6, 12], sendReport: true }),
    );
    const state = await screen.findByTestId('report-state');
    expect(within(state).getByText('Queued')).toBeInTheDocument();
    expect(state).toHaveTextContent('to referrer@example.com');
    expect(screen.getByTestId('saved-findings')).toHaveTextContent('Three canals found and filled');
    expect(screen.getByText(/Recall:/).parentElement).toHaveTextContent('6 months (Tue 1 Jun 2027), 12 months (Wed 1 Dec 2027)');
    await user.click(within(state).getByRole('button', { name: /Open the report \(PDF\)/ }));
    await waitFor(() => expect(calls.some((c) => c.key === 'GET /api/letters/88/pdf')).toBe(true));
    await waitFor(() => expect(tab.location.href).toMatch(/^blob:/));
  });

  it('finishes without a report when the box is cleared', async () => {
    signInAs('endodontist');
    const user = userEvent.setup();
    const calls = mockFetch({
      'GET /api/cases/7/completion': () => ({ status: 200, body: view() }),
      'POST /api/cases/7/completion': (b) => ({ status: 201, body: completed(b as CompleteCaseRequest) }),
    });
    renderPage(<CompletionCard caseId={7} />);
    await user.type(await screen.findByLabelText(/Findings for the referring dentist/), 'Healed.');
    await user.click(screen.getByLabelText('Send the report to the referring dentist'));
    await user.click(screen.getByRole('button', { name: 'Finish treatment' }));
    await waitFor(() => expect((calls.find((c) => c.key === 'POST /api/cases/7/completion')?.body as CompleteCaseRequest).sendReport).toBe(false));
    expect(await screen.findByText('No report was sent to the referring dentist.')).toBeInTheDocument();
    // Not sent, so it can still be changed and sent.
    expect(screen.getByRole('button', { name: 'Change and send the report' })).toBeInTheDocument();
  });

  it('asks for findings before calling the server', async () => {
    signInAs('endodontist');
    const user = userEvent.setup();
    const calls = mockFetch({ 'GET /api/cases/7/completion': () => ({ status: 200, body: view() }) });
    renderPage(<CompletionCard caseId={7} />);
    await user.click(await screen.findByRole('button', { name: 'Finish and send the report' }));
    expect(screen.getByText('Write the findings')).toBeInTheDocument();
    expect(calls.some((c) => c.key === 'POST /api/cases/7/completion')).toBe(false);
  });

  it('says what keeps the case open and leaves the form off', async () => {
    signInAs('endodontist');
    mockFetch({
      'GET /api/cases/7/completion': () => ({
        status: 200,
        body: view({ canComplete: false, blockedBy: 'A visit is still booked', openVisits: [{ appointmentId: 43, visitIndex: 2, state: 'booked', start: '2026-12-14T14:00:00.000Z', description: 'visit 3 on Mon 14 Dec 2026 at 09:00 is still booked' }] }),
      }),
    });
    renderPage(<CompletionCard caseId={7} />);
    const alert = await screen.findByRole('status');
    expect(alert).toHaveTextContent('A visit is still booked');
    expect(alert).toHaveTextContent('visit 3 on Mon 14 Dec 2026 at 09:00 is still booked');
    expect(screen.getByLabelText(/Findings for the referring dentist/)).toBeDisabled();
    expect(screen.getByRole('button', { name: 'Finish and send the report' })).toBeDisabled();
  });

  it('shows a sent report without a way to change it', async () => {
    signInAs('endodontist');
    const sent = completed({ findings: 'Done.', recallPlan: [12], sendReport: true });
    sent.completion!.report = { ...sent.completion!.report!, status: 'sent', sentAt: '2026-12-02T10:01:00.000Z' };
    mockFetch({ 'GET /api/cases/7/completion': () => ({ status: 200, body: sent }) });
    renderPage(<CompletionCard caseId={7} />);
    expect(within(await screen.findByTestId('report-state')).getByText('Sent')).toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'Change and send the report' })).toBeNull();
    expect(screen.queryByLabelText(/Findings for the referring dentist/)).toBeNull();
  });

  it('shows a conflict from the server', async () => {
    signInAs('endodontist');
    const user = userEvent.setup();
    mockFetch({
      'GET /api/cases/7/completion': () => ({ status: 200, body: view() }),
      'POST /api/cases/7/completion': () => ({ status: 409, body: { statusCode: 409, message: 'visit 2 on Tue 1 Dec 2026 at 09:00 is still seated', errors: [{ field: 'status', message: 'visit 2 on Tue 1 Dec 2026 at 09:00 is still seated' }] } }),
    });
    renderPage(<CompletionCard caseId={7} />);
    await user.type(await screen.findByLabelText(/Findings for the referring dentist/), 'Done.');
    await user.click(screen.getByRole('button', { name: 'Finish and send the report' }));
    const message = await screen.findByText('visit 2 on Tue 1 Dec 2026 at 09:00 is still seated');
    expect(message.closest('[role="alert"]')).toHaveTextContent('Not finished');
  });
});
