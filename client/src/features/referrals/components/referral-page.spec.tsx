import type { Referral } from '@ostium/shared';
import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it } from 'vitest';
import { sessionStore } from '../../../lib/session';
import { mockFetch, renderRoutes } from '../../../test/render';
import { ReferralPage } from './referral-page';

const referral: Referral = {
  id: 41,
  receivedOn: '2026-01-12',
  status: 'received',
  urgency: 'urgent',
  procedure: 'retreatment',
  patient: { id: 7, name: 'Ana Lark', dateOfBirth: '1984-03-02' },
  referringDentist: { id: 3, name: 'Dr. Ines Marlow', practiceName: 'Marlow Family Dental' },
  location: { id: 1, name: 'Harbour Street' },
  teeth: ['36', '46'],
  waitingDays: 2,
  reason: 'Lingering pain to cold',
  notes: null,
  statusReason: null,
  cases: [
    { id: 1, referralId: 41, toothFdi: '36', procedure: 'retreatment', status: 'received', level: 'high', estimatedMinutes: 150, visitCount: 2 },
    { id: 2, referralId: 41, toothFdi: '46', procedure: 'retreatment', status: 'received', level: null, estimatedMinutes: null, visitCount: null },
  ],
  attachments: [
    { id: 9, referralId: 41, fileName: 'bitewing.png', mimeType: 'image/png', sizeBytes: 20480, kind: 'radiograph', createdAt: '2026-01-12T09:00:00Z' },
    { id: 10, referralId: 41, fileName: 'letter.pdf', mimeType: 'application/pdf', sizeBytes: 51200, kind: 'letter', createdAt: '2026-01-12T09:00:00Z' },
  ],
  history: [{ status: 'received', reason: null, at: '2026-01-12T09:01:00Z', byUserId: 2, byName: 'Desk Person' }],
  letters: [{ id: 5, kind: 'acknowledgement', to: 'office@marlow.example.com', subject: 'Referral received', status: 'sent', detail: null, at: '2026-01-12T09:01:05Z' }],
  patientDetail: {
    id: 7,
    firstName: 'Ana',
    lastName: 'Lark',
    dateOfBirth: '1984-03-02',
    phone: '+15555550142',
    email: null,
    preferredChannel: 'text',
    smsConsent: true,
    smsConsentAt: '2026-01-12T09:00:00Z',
    smsConsentSource: 'verbal at desk',
    timeZone: 'America/New_York',
    notes: null,
    createdAt: '2026-01-12T09:00:00Z',
  },
  referringDentistDetail: {
    id: 3,
    name: 'Dr. Ines Marlow',
    practiceName: 'Marlow Family Dental',
    email: 'office@marlow.example.com',
    phone: null,
    address: null,
    letterChannel: 'email',
    notes: null,
    referralCount: 12,
    createdAt: '2025-06-01T10:00:00Z',
  },
};

const answers = (extra = {}) => ({
  'GET /api/practice': () => ({ status: 200, body: { id: 1, name: 'P', phone: null, email: null, settings: { toothNotation: 'universal', bookingGridMinutes: 15, lateCancellationHours: 24 } } }),
  'GET /api/referrals/41': () => ({ status: 200, body: referral }),
  'GET /api/attachments/9/content': () => ({ status: 200, body: 'png bytes' }),
  ...extra,
});

const signIn = (role: 'frontdesk' | 'endodontist') => sessionStore.set({ accessToken: 't', user: { id: 2, email: 'u@example.com', name: 'U', role } });
const renderReferral = () => renderRoutes([{ path: '/referrals/:id', element: <ReferralPage /> }], '/referrals/41');

describe('ReferralPage', () => {
  afterEach(() => sessionStore.set(null));

  it('shows cases in the practice notation with FDI beside, the thumbnail fetched with the token, history and letters', async () => {
    signIn('endodontist');
    const calls = mockFetch(answers());
    renderReferral();
    const cases = await screen.findByRole('table', { name: 'Cases' });
    const rows = within(cases).getAllByRole('row').slice(1);
    // FDI 36 = Universal 19, FDI 46 = Universal 30 (references.md, ISO 3950 / HL7 crosswalk).
    expect(rows[0]).toHaveTextContent(/19\s*FDI 36\s*lower left first molar/);
    expect(within(rows[0]!).getByRole('img', { name: 'Difficulty: high' })).toBeInTheDocument();
    expect(rows[0]).toHaveTextContent('150 min in 2 visits');
    expect(rows[1]).toHaveTextContent(/30\s*FDI 46/);
    expect(rows[1]).toHaveTextContent('not assessed yet');

    const img = await screen.findByRole('img', { name: 'Radiograph bitewing.png' });
    expect(img.getAttribute('src')).toMatch(/^blob:/);
    const download = calls.find((c) => c.key === 'GET /api/attachments/9/content');
    expect(download?.headers.authorization).toBe('Bearer t');
    // The PDF is not downloaded until it is opened.
    expect(calls.some((c) => c.key === 'GET /api/attachments/10/content')).toBe(false);
    expect(screen.getByRole('button', { name: 'Open letter.pdf' })).toBeInTheDocument();

    expect(screen.getByRole('region', { name: 'Status history' })).toHaveTextContent('Desk Person');
    expect(screen.getByRole('region', { name: 'Letters' })).toHaveTextContent(/Acknowledgement.*office@marlow\.example\.com.*sent/);
    // Reading roles see no status actions.
    expect(screen.queryByRole('button', { name: 'Mark triaged' })).toBeNull();
  });

  it('marks a referral triaged', async () => {
    signIn('frontdesk');
    const calls = mockFetch(answers({ 'PATCH /api/referrals/41/status': () => ({ status: 200, body: { ...referral, status: 'triaged' } }) }));
    renderReferral();
    await userEvent.click(await screen.findByRole('button', { name: 'Mark triaged' }));
    await waitFor(() => expect(calls.find((c) => c.key === 'PATCH /api/referrals/41/status')?.body).toEqual({ status: 'triaged' }));
    expect(await screen.findByRole('button', { name: 'Decline' })).toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'Mark triaged' })).toBeNull();
  });

  it('asks for a reason before declining', async () => {
    signIn('frontdesk');
    const calls = mockFetch(
      answers({ 'PATCH /api/referrals/41/status': (b: unknown) => ({ status: 200, body: { ...referral, status: 'declined', statusReason: (b as { reason: string }).reason } }) }),
    );
    renderReferral();
    await userEvent.click(await screen.findByRole('button', { name: 'Decline' }));
    const dialog = await screen.findByRole('dialog');
    await userEvent.click(within(dialog).getByRole('button', { name: 'Decline' }));
    expect(await within(dialog).findByText('Give a reason')).toBeInTheDocument();
    expect(calls.some((c) => c.key === 'PATCH /api/referrals/41/status')).toBe(false);
    await userEvent.type(within(dialog).getByLabelText(/Reason/), 'Outside our scope: implant planning');
    await userEvent.click(within(dialog).getByRole('button', { name: 'Decline' }));
    await waitFor(() =>
      expect(calls.find((c) => c.key === 'PATCH /api/referrals/41/status')?.body).toEqual({ status: 'declined', reason: 'Outside our scope: implant planning' }),
    );
    expect(await screen.findByText('Outside our scope: implant planning')).toBeInTheDocument();
  });
});
