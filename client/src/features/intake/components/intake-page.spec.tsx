import type { CreateReferralRequest, LocationSummary, Patient, PracticeSummary, ReferringDentist } from '@ostium/shared';
import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { sessionStore } from '../../../lib/session';
import { mockFetch, renderRoutes, type MockCall } from '../../../test/render';
import { IntakePage } from './intake-page';
import { todayIn } from '../intake-form.util';

const practice: PracticeSummary = {
  id: 1,
  name: 'Harbourlight Endodontics',
  phone: '+15555550100',
  email: 'desk@example.com',
  settings: { toothNotation: 'universal', bookingGridMinutes: 15, lateCancellationHours: 24 },
};
const location = (id: number, name: string): LocationSummary => ({ id, name, address: null, phone: null, timeZone: 'America/New_York', openingHours: [], chairs: [], microscopes: [] });
const ana: Patient = {
  id: 7,
  firstName: 'Ana',
  lastName: 'Lark',
  dateOfBirth: '1984-03-02',
  phone: '+15555550142',
  email: 'ana.lark@example.com',
  preferredChannel: 'text',
  smsConsent: true,
  smsConsentAt: '2026-01-05T10:00:00Z',
  smsConsentSource: 'intake form',
  timeZone: null,
  notes: null,
  createdAt: '2026-01-05T10:00:00Z',
};
const dentist: ReferringDentist = {
  id: 3,
  name: 'Dr. Ines Marlow',
  practiceName: 'Marlow Family Dental',
  email: 'office@marlow.example.com',
  phone: '+15555550170',
  address: null,
  letterChannel: 'email',
  notes: null,
  referralCount: 12,
  createdAt: '2025-06-01T10:00:00Z',
};
const found = <T,>(items: T[]) => ({ status: 200, body: items });
const created = { id: 41, patient: { id: 7, name: 'Ana Lark', dateOfBirth: '1984-03-02' }, cases: [{ id: 1 }, { id: 2 }] };

type Answers = Parameters<typeof mockFetch>[0];
const base = (extra: Answers = {}): Answers => ({
  'GET /api/practice': () => ({ status: 200, body: practice }),
  'GET /api/locations': () => ({ status: 200, body: [location(1, 'Harbour Street'), location(2, 'Mill Lane')] }),
  'GET /api/patients': (_b, c) => found(c.query.get('q')?.toLowerCase().startsWith('lar') ? [ana] : []),
  'GET /api/referring-dentists': (_b, c) => found(c.query.get('q')?.toLowerCase().includes('marl') ? [dentist] : []),
  ...extra,
});

// Searches wait out a debounce and a request; on a busy test machine that can pass the default second.
const findOption = (name: RegExp) => screen.findByRole('option', { name }, { timeout: 4000 });

const posts = (calls: MockCall[]) => calls.filter((c) => c.key === 'POST /api/referrals').map((c) => c.body as CreateReferralRequest);

function renderIntake() {
  return renderRoutes(
    [
      { path: '/intake', element: <IntakePage /> },
      { path: '/referrals/:id', element: <p>referral page</p> },
    ],
    '/intake',
  );
}

async function pickExistingPatient() {
  await userEvent.type(await screen.findByRole('combobox', { name: 'Patient' }), 'Lark');
  await userEvent.click(await findOption(/Lark, Ana/));
  expect(screen.getByLabelText('Chosen patient')).toHaveTextContent('Ana Lark');
}

async function pickExistingDentist() {
  await userEvent.type(screen.getByRole('combobox', { name: 'Referring dentist' }), 'Marlow');
  await userEvent.click(await findOption(/Dr. Ines Marlow/));
}

async function enterNewPatient() {
  await userEvent.type(await screen.findByRole('combobox', { name: 'Patient' }), 'Ana Lark');
  await userEvent.click(await findOption(/New patient “Ana Lark”/));
  // The typed name is split into the new patient's fields.
  expect(screen.getByLabelText(/First name/)).toHaveValue('Ana');
  expect(screen.getByLabelText(/Last name/)).toHaveValue('Lark');
  fireEvent.change(screen.getByLabelText(/Date of birth/), { target: { value: '1984-03-02' } });
  await userEvent.type(screen.getByLabelText('Phone'), '555-0142');
}

describe('IntakePage', { timeout: 20_000 }, () => {
  beforeEach(() => sessionStore.set({ accessToken: 't', user: { id: 2, email: 'desk@example.com', name: 'Desk', role: 'frontdesk' } }));
  afterEach(() => sessionStore.set(null));

  it('sends the referral with the chosen records, teeth in the practice notation and the uploaded file, then opens it', async () => {
    const calls = mockFetch(
      base({
        'POST /api/attachments': () => ({
          status: 201,
          body: { id: 501, referralId: null, fileName: 'bitewing.png', mimeType: 'image/png', sizeBytes: 4, kind: 'radiograph', createdAt: '2026-02-02T09:00:00Z' },
        }),
        'POST /api/referrals': () => ({ status: 201, body: created }),
      }),
    );
    const { router } = renderIntake();
    await pickExistingPatient();
    await pickExistingDentist();
    await userEvent.click(screen.getByRole('radio', { name: 'Urgent' }));
    await userEvent.click(screen.getByRole('radio', { name: 'Retreatment' }));
    await userEvent.type(screen.getByLabelText('Tooth numbers (Universal)'), '19, 30');
    await userEvent.type(screen.getByLabelText("Referrer's reason"), 'Lingering pain to cold');

    const input = document.querySelector<HTMLInputElement>('input[type="file"]')!;
    await userEvent.upload(input, new File([new Uint8Array([0x89, 0x50, 0x4e, 0x47])], 'bitewing.png', { type: 'image/png' }));
    const row = await screen.findByRole('listitem', { name: 'bitewing.png' });
    expect(await within(row).findByText('Uploaded')).toBeInTheDocument();
    const upload = calls.find((c) => c.key === 'POST /api/attachments')!;
    expect(upload.body).toEqual({ kind: 'radiograph', file: { name: 'bitewing.png', type: 'image/png', size: 4 } });
    expect(upload.headers.authorization).toBe('Bearer t');

    await userEvent.click(screen.getByRole('button', { name: 'Save referral' }));
    await waitFor(() => expect(router.state.location.pathname).toBe('/referrals/41'));
    expect(posts(calls)).toEqual([
      {
        receivedOn: todayIn('America/New_York'),
        locationId: 1,
        urgency: 'urgent',
        procedure: 'retreatment',
        reason: 'Lingering pain to cold',
        notes: null,
        notation: 'universal',
        // Universal 19 and 30 are FDI 36 and 46 (references.md, ISO 3950 / HL7 crosswalk); sent as typed.
        teeth: [{ tooth: '19' }, { tooth: '30' }],
        attachmentIds: [501],
        patientId: 7,
        referringDentistId: 3,
      },
    ]);
  });

  it('takes patient and referrer from the keyboard: Enter picks the best match and moves on', async () => {
    mockFetch(base());
    renderIntake();
    await userEvent.type(await screen.findByRole('combobox', { name: 'Patient' }), 'Lark');
    await findOption(/Lark, Ana/);
    await userEvent.keyboard('{Enter}');
    expect(screen.getByLabelText('Chosen patient')).toHaveTextContent('Ana Lark');
    await waitFor(() => expect(screen.getByRole('combobox', { name: 'Referring dentist' })).toHaveFocus());
    await userEvent.keyboard('Marlow');
    await findOption(/Dr. Ines Marlow/);
    await userEvent.keyboard('{Enter}');
    expect(screen.getByLabelText('Chosen referring dentist')).toHaveTextContent('Dr. Ines Marlow');
    await waitFor(() => expect(screen.getByLabelText('Received on')).toHaveFocus());
  });

  it('saves with Ctrl+Enter from inside a field', async () => {
    const calls = mockFetch(base({ 'POST /api/referrals': () => ({ status: 201, body: created }) }));
    const { router } = renderIntake();
    await pickExistingPatient();
    await pickExistingDentist();
    await userEvent.type(screen.getByLabelText('Tooth numbers (Universal)'), 'A');
    await userEvent.keyboard('{Control>}{Enter}{/Control}');
    await waitFor(() => expect(router.state.location.pathname).toBe('/referrals/41'));
    expect(posts(calls)).toHaveLength(1);
    // Universal A = FDI 55 (references.md, ISO 3950 / HL7 crosswalk check), sent as typed.
    expect(posts(calls)[0]!.teeth).toEqual([{ tooth: 'A' }]);
  });

  it('does not call the server until a patient, a referrer and a tooth are given', async () => {
    const calls = mockFetch(base());
    renderIntake();
    await screen.findByRole('combobox', { name: 'Patient' });
    await userEvent.click(screen.getByRole('button', { name: 'Save referral' }));
    expect(await screen.findByText('Find the patient, or choose “New patient”')).toBeInTheDocument();
    expect(screen.getByText('Find the referring dentist, or choose “New referring dentist”')).toBeInTheDocument();
    expect(screen.getByText('Pick at least one tooth')).toBeInTheDocument();
    expect(posts(calls)).toHaveLength(0);
  });

  it("puts the server's field errors on the matching inputs", async () => {
    const calls = mockFetch(
      base({
        'POST /api/referrals': () => ({
          status: 400,
          body: {
            statusCode: 400,
            message: 'patient.phone: not a phone number; tooth 19 already has an open case',
            errors: [
              { field: 'patient.phone', message: 'patient.phone: not a phone number' },
              { field: 'teeth.0.tooth', message: 'tooth 19 already has an open case' },
              { field: 'referringDentist.email', message: 'referringDentist.email must be an email' },
            ],
          },
        }),
      }),
    );
    renderIntake();
    await enterNewPatient();
    await userEvent.type(screen.getByRole('combobox', { name: 'Referring dentist' }), 'Orrin Vale');
    await userEvent.click(await findOption(/New referring dentist “Orrin Vale”/));
    expect(screen.getByLabelText(/Dentist's name/)).toHaveValue('Orrin Vale');
    await userEvent.type(screen.getByLabelText("Dentist's e-mail"), 'vale@example.com');
    await userEvent.type(screen.getByLabelText('Tooth numbers (Universal)'), '19');
    await userEvent.click(screen.getByRole('button', { name: 'Save referral' }));

    const phone = screen.getByLabelText('Phone');
    await waitFor(() => expect(phone).toHaveAttribute('aria-invalid', 'true'));
    expect(phone).toHaveAccessibleDescription(expect.stringContaining('not a phone number'));
    expect(screen.getByLabelText('Tooth numbers (Universal)')).toHaveAccessibleDescription(expect.stringContaining('tooth 19 already has an open case'));
    expect(screen.getByLabelText("Dentist's e-mail")).toHaveAccessibleDescription(expect.stringContaining('must be an email'));
    // Nothing typed is lost.
    expect(phone).toHaveValue('555-0142');
    expect(screen.getByLabelText(/First name/)).toHaveValue('Ana');
    expect(posts(calls)[0]!.patient).toEqual({
      firstName: 'Ana',
      lastName: 'Lark',
      dateOfBirth: '1984-03-02',
      phone: '555-0142',
      email: null,
      preferredChannel: 'text',
      smsConsent: false,
      smsConsentSource: null,
    });
    expect(posts(calls)[0]!.referringDentist).toEqual({ name: 'Orrin Vale', practiceName: null, email: 'vale@example.com', phone: null, letterChannel: 'email' });
  });

  describe('a new patient who is already on file (409)', () => {
    const duplicate = (calls: () => MockCall[]) =>
      base({
        'POST /api/referrals': (body) =>
          (body as CreateReferralRequest).patient && !(body as CreateReferralRequest).patient!.confirmNew
            ? { status: 409, body: { statusCode: 409, message: 'A patient with this name and date of birth exists', existing: [ana] } }
            : { status: 201, body: { ...created, id: calls().length } },
      });

    async function reachDuplicate() {
      await enterNewPatient();
      await pickExistingDentist();
      await userEvent.type(screen.getByLabelText('Tooth numbers (Universal)'), '8');
      await userEvent.click(screen.getByRole('button', { name: 'Save referral' }));
      const alert = await screen.findByRole('alert', { name: /may already be on file/ });
      expect(alert).toHaveTextContent('A patient with this name and date of birth exists');
      expect(await within(alert).findByText(/born Mar 2, 1984/)).toBeInTheDocument();
      return alert;
    }

    it('offers the existing record and saves with it', async () => {
      let calls: MockCall[] = [];
      calls = mockFetch(duplicate(() => calls));
      const { router } = renderIntake();
      const alert = await reachDuplicate();
      await userEvent.click(within(alert).getByRole('button', { name: /Use Ana Lark/ }));
      await waitFor(() => expect(router.state.location.pathname).toMatch(/^\/referrals\/\d+$/));
      const [first, second] = posts(calls);
      expect(first!.patient).toBeDefined();
      expect(second!.patientId).toBe(7);
      expect(second!.patient).toBeUndefined();
      // Universal 8 = FDI 11 (references.md crosswalk check); sent in the practice notation.
      expect(second!.teeth).toEqual([{ tooth: '8' }]);
    });

    it('saves a different person as new when the desk confirms it', async () => {
      let calls: MockCall[] = [];
      calls = mockFetch(duplicate(() => calls));
      const { router } = renderIntake();
      const alert = await reachDuplicate();
      await userEvent.click(within(alert).getByRole('button', { name: /different person/ }));
      await waitFor(() => expect(router.state.location.pathname).toMatch(/^\/referrals\/\d+$/));
      expect(posts(calls)[1]!.patient).toMatchObject({ firstName: 'Ana', lastName: 'Lark', confirmNew: true });
    });
  });

  it('shows why the server refused an upload and keeps the rest of the form', async () => {
    const calls = mockFetch(
      base({
        'POST /api/attachments': () => ({ status: 415, body: { statusCode: 415, message: 'scan.jpg is not a JPEG, PNG or PDF by its content (found an executable)' } }),
        'POST /api/referrals': () => ({ status: 201, body: created }),
      }),
    );
    const { router } = renderIntake();
    await pickExistingPatient();
    await pickExistingDentist();
    await userEvent.type(screen.getByLabelText('Tooth numbers (Universal)'), '3');
    const input = document.querySelector<HTMLInputElement>('input[type="file"]')!;
    // A renamed program: the name and declared type say JPEG, the bytes say otherwise ("MZ").
    await userEvent.upload(input, new File([new Uint8Array([0x4d, 0x5a, 0x90, 0x00])], 'scan.jpg', { type: 'image/jpeg' }));
    const row = await screen.findByRole('listitem', { name: 'scan.jpg' });
    expect(await within(row).findByText(/found an executable/)).toBeInTheDocument();
    expect(screen.getByLabelText('Chosen patient')).toHaveTextContent('Ana Lark');
    expect(screen.getByLabelText('Tooth numbers (Universal)')).toHaveValue('3');

    await userEvent.click(screen.getByRole('button', { name: 'Save referral' }));
    await waitFor(() => expect(router.state.location.pathname).toBe('/referrals/41'));
    expect(posts(calls)[0]!.attachmentIds).toEqual([]);
  });

  it('refuses a file over 20 MB before uploading it', async () => {
    const calls = mockFetch(base());
    renderIntake();
    await screen.findByRole('combobox', { name: 'Patient' });
    const big = new File([new Uint8Array(8)], 'ct-scan.png', { type: 'image/png' });
    Object.defineProperty(big, 'size', { value: 21 * 1024 * 1024 });
    await userEvent.upload(document.querySelector<HTMLInputElement>('input[type="file"]')!, big);
    const row = await screen.findByRole('listitem', { name: 'ct-scan.png' });
    expect(within(row).getByText(/Too large: 21.0 MB; the limit is 20 MB/)).toBeInTheDocument();
    expect(calls.some((c) => c.key === 'POST /api/attachments')).toBe(false);
  });
});
