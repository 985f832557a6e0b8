import type { CaseSheet, EstimateRequest, UpdateCaseSheetRequest } from '@ostium/shared';
import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it } from 'vitest';
import { sessionStore } from '../../../lib/session';
import { mockFetch, renderRoutes, type MockCall } from '../../../test/render';
import { caseSheetRoutes } from '../routes';
import { caseSheet, estimate, FACTORS, highEstimate, practice, signInAs } from '../test/case-sheet.fixtures';
import { CAUTION } from './estimate-card';

const ENDODONTIST = { id: 5, email: 'endo@example.com', name: 'Dr. Test endodontist', role: 'endodontist', active: true, lastSignInAt: null, createdAt: '2026-01-01T00:00:00Z' };

function serve(sheet: CaseSheet = caseSheet()) {
  return mockFetch({
    'GET /api/cases/7': () => ({ status: 200, body: sheet }),
    'GET /api/estimates/factors': () => ({ status: 200, body: FACTORS }),
    'GET /api/practice': () => ({ status: 200, body: practice('universal') }),
    'GET /api/users': () => ({ status: 200, body: [ENDODONTIST] }),
    // Stands in for the server's estimator: a curvature over 30° makes the case high (design/estimator.md).
    'POST /api/estimates': (body) => ({ status: 200, body: ((body as EstimateRequest).facts?.curvatureDegrees ?? 0) > 30 ? highEstimate() : estimate() }),
    'PATCH /api/cases/7': (body) => {
      const b = body as UpdateCaseSheetRequest;
      const est = (b.facts?.curvatureDegrees ?? 0) > 30 ? highEstimate() : estimate();
      const override = b.override ? { ...b.override, byUserId: 5, byName: 'Dr. Test endodontist', at: '2026-12-02T10:00:00.000Z' } : null;
      return {
        status: 200,
        body: caseSheet({ status: 'planned', assessment: b.assessment, facts: b.facts, estimate: est, tableVersion: 2, override, bookedMinutesPerVisit: override?.minutesPerVisit ?? est.visits.map((v) => v.minutes) }),
      };
    },
  });
}

const open = () => renderRoutes([{ path: '/', children: caseSheetRoutes }, { path: '/referrals/:id', element: <p>referral page</p> }], '/cases/7');
const lastBody = (calls: MockCall[], key: string) => calls.filter((c) => c.key === key).at(-1)?.body;
const card = () => screen.getByRole('region', { name: 'Chair-time estimate' });

describe('CaseSheetPage', () => {
  afterEach(() => sessionStore.set(null));

  it('shows the tooth in the practice notation, the level with its reasons, the visits and a breakdown that adds up', async () => {
    signInAs('frontdesk');
    const calls = serve();
    open();
    // Universal 19 is FDI 36 (design/references.md, "Tooth numbering").
    expect(await screen.findByRole('heading', { name: /Robin Example · tooth 19/ })).toHaveTextContent('FDI 36');
    expect(screen.getByRole('link', { name: 'Referral #12' })).toHaveAttribute('href', '/referrals/12');

    const est = await screen.findByRole('region', { name: 'Chair-time estimate' });
    expect(within(est).getByRole('img', { name: 'Difficulty: moderate' })).toBeInTheDocument();
    expect(within(est).getByTestId('level-reasons')).toHaveTextContent('Set by: Position in the arch');
    expect(within(est).getByText(/Consider a cone-beam CT/)).toBeInTheDocument();
    const visits = within(est).getByRole('table', { name: 'Visits' });
    expect(within(visits).getByText('Access, cleaning and shaping, root canal filling')).toBeInTheDocument();
    expect(within(est).getByTestId('total-minutes')).toHaveTextContent('115 min');
    // 90 + 23 + 2: the lines add up to the total, and the sheet shows the sum.
    expect(within(est).getByTestId('breakdown-sum')).toHaveTextContent('115 min');
    expect(within(est).getByLabelText('equals the total')).toBeInTheDocument();
    expect(within(est).getByText(/3 canals assumed, the usual count for a lower left first molar/)).toBeInTheDocument();
    expect(within(est).getByText('Estimate table version 2')).toBeInTheDocument();
    // ISO 3630-1: size 10 is purple, size 25 red (design/references.md, "Instruments").
    const tray = within(est).getByRole('list', { name: 'Tray list' });
    expect([...tray.querySelectorAll('[data-colour]')].map((e) => e.getAttribute('data-colour'))).toEqual(['purple', 'red']);
    expect(within(est).getByText(CAUTION)).toBeInTheDocument();
    // The arch position comes from the tooth until someone rates it.
    expect(screen.getByText('from tooth 19')).toBeInTheDocument();
    // The preview names the stored FDI tooth and its notation.
    expect(lastBody(calls, 'POST /api/estimates')).toMatchObject({ tooth: '36', notation: 'fdi', procedure: 'initial' });
    // Not an endodontist: no adjust control.
    expect(screen.queryByRole('button', { name: /Adjust minutes/ })).toBeNull();
  });

  it('a rating sent through the three-choice control reaches the preview and the PATCH, without an override', async () => {
    signInAs('frontdesk');
    const user = userEvent.setup();
    const calls = serve();
    open();
    await screen.findByRole('region', { name: 'Chair-time estimate' });
    await user.click(within(screen.getByRole('radiogroup', { name: 'Isolation' })).getByRole('radio', { name: 'Moderate' }));
    await waitFor(() => expect(lastBody(calls, 'POST /api/estimates')).toMatchObject({ assessment: { isolation: 'moderate' } }));
    await user.click(screen.getByRole('button', { name: 'Save and mark planned' }));
    await waitFor(() => expect(calls.some((c) => c.key === 'PATCH /api/cases/7')).toBe(true));
    expect(lastBody(calls, 'PATCH /api/cases/7')).toEqual({
      procedure: 'initial',
      canals: null,
      assessment: { isolation: 'moderate' },
      facts: {},
      operatorId: null,
      markPlanned: true,
    });
  });

  it('an endodontist sets curvature 35°, sees the level go high and the minutes rise, adjusts with a required reason, and saves', async () => {
    signInAs('endodontist');
    const user = userEvent.setup();
    const calls = serve();
    open();
    await screen.findByRole('region', { name: 'Chair-time estimate' });
    expect(within(card()).getByTestId('total-minutes')).toHaveTextContent('115 min');

    await user.type(screen.getByLabelText('Curvature in degrees'), '35');
    await waitFor(() => expect(within(card()).getByRole('img', { name: 'Difficulty: high' })).toBeInTheDocument());
    expect(lastBody(calls, 'POST /api/estimates')).toMatchObject({ facts: { curvatureDegrees: 35 } });
    expect(within(card()).getByTestId('total-minutes')).toHaveTextContent('150 min');
    expect(within(card()).getByTestId('breakdown-sum')).toHaveTextContent('150 min');
    expect(within(card()).getByTestId('level-reasons')).toHaveTextContent('Set by: Canal and root shape');
    expect(within(card()).getByText(/7–21 days after visit 1/)).toBeInTheDocument();
    expect(within(card()).getAllByRole('img', { name: 'Microscope needed' })).toHaveLength(2);
    // The row shows the derived level and why it cannot be chosen by hand.
    const shape = screen.getByRole('radiogroup', { name: 'Canal and root shape' });
    expect(shape).toHaveAttribute('aria-readonly', 'true');
    expect(within(shape).getByRole('radio', { name: 'High' })).toHaveAttribute('aria-checked', 'true');
    expect(screen.getByText('set by curvature 35°')).toBeInTheDocument();

    await user.click(screen.getByRole('button', { name: /Adjust minutes/ }));
    const editor = screen.getByRole('form', { name: 'Adjust chair time' });
    const first = within(editor).getByLabelText('Visit 1 minutes');
    await user.clear(first);
    await user.type(first, '100');
    await user.click(within(editor).getByRole('button', { name: 'Apply adjustment' }));
    expect(within(editor).getByText('Give the reason for the change')).toBeInTheDocument();
    expect(within(card()).queryByText('Booked')).toBeNull();

    await user.type(within(editor).getByLabelText(/Reason for the change/), 'Patient tires quickly; split the long visit');
    await user.click(within(editor).getByRole('button', { name: 'Apply adjustment' }));
    expect(screen.queryByRole('form', { name: 'Adjust chair time' })).toBeNull();
    // Both figures: the estimate and what will be booked.
    expect(within(card()).getByText('Booked')).toBeInTheDocument();
    expect(within(card()).getByTestId('total-minutes')).toHaveTextContent('150 min');
    expect(within(card()).getByTestId('booked-total')).toHaveTextContent('160 min');

    await user.click(screen.getByRole('button', { name: 'Save and mark planned' }));
    await waitFor(() => expect(calls.some((c) => c.key === 'PATCH /api/cases/7')).toBe(true));
    expect(lastBody(calls, 'PATCH /api/cases/7')).toEqual({
      procedure: 'initial',
      canals: null,
      assessment: {},
      facts: { curvatureDegrees: 35 },
      operatorId: null,
      markPlanned: true,
      override: { minutesPerVisit: [100, 60], reason: 'Patient tires quickly; split the long visit' },
    });
    // The saved sheet comes back: the adjustment now names who made it.
    await waitFor(() => expect(within(card()).getByText(/Patient tires quickly/)).toHaveTextContent('Dr. Test endodontist'));
  }, 20_000);

  it('shows a saved adjustment to every role, with who made it', async () => {
    signInAs('manager');
    const est = estimate();
    serve(
      caseSheet({
        estimate: est,
        tableVersion: 2,
        override: { minutesPerVisit: [130], reason: 'Very anxious patient', byUserId: 5, byName: 'Dr. Test endodontist', at: '2026-12-01T08:00:00.000Z' },
        bookedMinutesPerVisit: [130],
      }),
    );
    open();
    const c = await screen.findByRole('region', { name: 'Chair-time estimate' });
    expect(within(c).getByTestId('booked-total')).toHaveTextContent('130 min');
    expect(within(c).getByTestId('total-minutes')).toHaveTextContent('115 min');
    expect(within(c).getByText(/Very anxious patient/)).toHaveTextContent('Dr. Test endodontist');
    expect(screen.queryByRole('button', { name: /Adjust minutes/ })).toBeNull();
  });

  it('keeps an impossible calcified count out of the preview and says why', async () => {
    signInAs('endodontist');
    const user = userEvent.setup();
    const calls = serve();
    open();
    await screen.findByRole('region', { name: 'Chair-time estimate' });
    await user.type(screen.getByLabelText('Canals'), '2');
    await user.type(screen.getByLabelText('Calcified canals'), '3');
    expect(await screen.findByText('More than the 2 canals of the case')).toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Save and mark planned' })).toBeDisabled();
    await new Promise((r) => setTimeout(r, 400));
    expect(calls.filter((c) => c.key === 'POST /api/estimates').some((c) => (c.body as EstimateRequest).facts?.calcifiedCanals === 3)).toBe(false);
  });
});
