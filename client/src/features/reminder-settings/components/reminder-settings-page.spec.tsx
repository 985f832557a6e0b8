import type { ReminderSettings, TemplatePreviewRequest } from '@ostium/shared';
import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it } from 'vitest';
import { sessionStore } from '../../../lib/session';
import { mockFetch, renderRoutes, type MockCall } from '../../../test/render';
import { signInAs } from '../../case-sheet/test/case-sheet.fixtures';
import { reminderSettingsRoutes } from '../routes';
import { location } from '../../replies/test/replies.fixtures';
import { preview, response } from '../test/reminder-settings.fixtures';

type Answer = (body: unknown) => { status: number; body?: unknown };

function serve(opts: { put?: Answer; preview?: Answer; version?: () => number } = {}) {
  return mockFetch({
    'GET /api/settings/reminders': () => ({ status: 200, body: response(opts.version?.() ?? 2) }),
    'GET /api/locations': () => ({ status: 200, body: [location()] }),
    'PUT /api/settings/reminders': opts.put ?? ((b) => ({ status: 200, body: { ...response(3), settings: (b as { settings: ReminderSettings }).settings } })),
    'POST /api/settings/reminders/preview': opts.preview ?? (() => ({ status: 200, body: preview() })),
  });
}

const open = () => renderRoutes([{ path: '/', children: reminderSettingsRoutes }], '/settings/reminders');
const field = (label: string) => screen.getByLabelText(label) as HTMLInputElement;
const of = (calls: MockCall[], key: string) => calls.filter((c) => c.key === key);

describe('ReminderSettingsPage', () => {
  afterEach(() => sessionStore.set(null));

  it('shows the rules, quiet hours and caps, and says why they exist', async () => {
    signInAs('admin');
    serve();
    open();
    const rules = await screen.findByRole('table', { name: 'Reminder rules' });
    expect(within(rules).getAllByRole('row')).toHaveLength(4);
    expect(field('Text 48 h before: hours before').value).toBe('48');
    // A rule that fires on booking has no lead time to set.
    expect(screen.queryByLabelText('Booking e-mail: hours before')).toBeNull();
    expect(field('Text 24 h before: only if unconfirmed')).toBeChecked();
    expect(field('Text 48 h before: only if unconfirmed')).not.toBeChecked();
    expect(field('Booking e-mail: calendar file')).toBeChecked();
    // A calendar file only rides on an e-mail.
    expect(field('Text 24 h before: calendar file')).toBeDisabled();
    expect(field('Texts from').value).toBe('08:00');
    expect(field('Texts until').value).toBe('21:00');
    expect(field('Texts a day, at most').value).toBe('1');
    expect(field('Texts a week, at most').value).toBe('3');
    // references.md "Messages": 47 CFR 64.1200(c)(1) calling hours; (a)(9)(iv) one a day, three a week.
    const limits = screen.getByRole('region', { name: 'Quiet hours and caps' });
    expect(limits).toHaveTextContent('47 CFR 64.1200(c)(1)');
    expect(limits).toHaveTextContent('one text a day and three a week');
    expect(screen.getByText(/Texts carry no clinical detail/)).toBeInTheDocument();
    expect(screen.getByText('Version 2')).toBeInTheDocument();
    // 15:00 UTC is 10:00 in New York in December (EST, UTC−5; IANA tz database via luxon).
    expect(await screen.findByText('saved 1 Dec 2026, 10:00 by Alex Admin')).toBeInTheDocument();
  });

  it('inserts a placeholder chip at the cursor, replacing the selection', async () => {
    signInAs('admin');
    serve();
    const user = userEvent.setup();
    open();
    const body = (await screen.findByLabelText('Message')) as HTMLTextAreaElement;
    expect(body.value).toBe('{practice}: visit {date} {time} at {location}. {confirmHint} {optOut}');
    // Cursor right after "visit ".
    body.setSelectionRange(18, 18);
    await user.click(screen.getByRole('button', { name: '{time}' }));
    expect(body.value).toBe('{practice}: visit {time}{date} {time} at {location}. {confirmHint} {optOut}');
    // A selection is replaced: select "{location}".
    const at = body.value.indexOf('{location}');
    body.setSelectionRange(at, at + '{location}'.length);
    await user.click(screen.getByRole('button', { name: '{practice}' }));
    expect(body.value).toBe('{practice}: visit {time}{date} {time} at {practice}. {confirmHint} {optOut}');
  });

  it('previews the template through the server once typing rests, with its count by encoding and its problems', async () => {
    signInAs('admin');
    const calls = serve({
      preview: (b) => {
        const req = b as TemplatePreviewRequest;
        return req.body.includes('{optOut}')
          ? { status: 200, body: preview() }
          : { status: 200, body: preview({ text: 'Quillfern Endodontics: visit Thu 3 Dec 09:30 at Riverside. Reply C to confirm, R for another time. Olá', encoding: 'UCS-2', characters: 102, limit: 70, segments: 2, fitsOneSegment: false, problems: ['a text must say how to opt out: add {optOut}', 'too long for one text: 102 of 70 (UCS-2)'] }) };
      },
    });
    const user = userEvent.setup();
    open();
    const region = await screen.findByRole('region', { name: 'Preview' });
    expect(await within(region).findByTestId('preview-count')).toHaveTextContent('115 / 160 · GSM-7 · 1 segment');
    expect(within(region).getByText('Ready to use')).toBeInTheDocument();
    expect(of(calls, 'POST /api/settings/reminders/preview')[0]!.body).toEqual({ channel: 'sms', subject: null, body: '{practice}: visit {date} {time} at {location}. {confirmHint} {optOut}' });

    const body = screen.getByLabelText('Message') as HTMLTextAreaElement;
    await user.clear(body);
    await user.type(body, '{{practice}: visit {{date} {{time} at {{location}. {{confirmHint} Olá');
    await waitFor(() => expect(within(region).getByTestId('preview-count')).toHaveTextContent('102 / 70 · UCS-2 · 2 segments'));
    const problems = within(region).getByRole('list', { name: 'Problems' });
    expect(within(problems).getAllByRole('listitem').map((li) => li.textContent)).toEqual(['a text must say how to opt out: add {optOut}', 'too long for one text: 102 of 70 (UCS-2)']);
    // Debounced: dozens of keystrokes, a couple of calls, the last with the whole text.
    const sent = of(calls, 'POST /api/settings/reminders/preview');
    expect(sent.length).toBeLessThanOrEqual(6);
    expect((sent.at(-1)!.body as TemplatePreviewRequest).body).toBe('{practice}: visit {date} {time} at {location}. {confirmHint} Olá');
  });

  it('previews an e-mail template with its subject', async () => {
    signInAs('admin');
    const calls = serve({ preview: () => ({ status: 200, body: preview({ subject: 'Your visit at Quillfern Endodontics', text: 'Your visit is on Thu 3 Dec at 09:30, Riverside.' }) }) });
    const user = userEvent.setup();
    open();
    await user.click(await screen.findByRole('listitem', { name: 'Booking e-mail' }));
    expect(await screen.findByTestId('preview-subject')).toHaveTextContent('Your visit at Quillfern Endodontics');
    await waitFor(() => expect(of(calls, 'POST /api/settings/reminders/preview').at(-1)!.body).toEqual({ channel: 'email', subject: 'Your visit at {practice}', body: 'Your visit is on {date} at {time}, {location}.\n\n{confirmLink}' }));
    expect(screen.queryByTestId('preview-count')).toBeNull();
  });

  it('saves the settings with the version it read', async () => {
    signInAs('admin');
    const calls = serve();
    const user = userEvent.setup();
    open();
    await user.clear(await screen.findByLabelText('Text 48 h before: hours before'));
    await user.type(field('Text 48 h before: hours before'), '72');
    await user.click(screen.getByRole('button', { name: 'Save' }));
    await waitFor(() => expect(of(calls, 'PUT /api/settings/reminders')).toHaveLength(1));
    const sent = of(calls, 'PUT /api/settings/reminders')[0]!.body as { settings: ReminderSettings; version: number };
    expect(sent.version).toBe(2);
    expect(sent.settings.rules[1]).toMatchObject({ id: 'text-48h', hoursBefore: 72 });
    expect(await screen.findByText('Version 3')).toBeInTheDocument();
  });

  it('refuses an empty lead time before asking the server', async () => {
    signInAs('admin');
    const calls = serve();
    const user = userEvent.setup();
    open();
    await user.clear(await screen.findByLabelText('Text 24 h before: hours before'));
    await user.click(screen.getByRole('button', { name: 'Save' }));
    expect(await screen.findByText('Whole hours, 1 to 336')).toBeInTheDocument();
    expect(of(calls, 'PUT /api/settings/reminders')).toHaveLength(0);
  });

  it('shows the server’s field errors at their fields and the rest in the banner', async () => {
    signInAs('admin');
    serve({
      put: () => ({
        status: 400,
        body: {
          statusCode: 400,
          message: 'Some settings are not valid',
          errors: [
            { field: 'settings.rules.1.hoursBefore', message: 'must not be more than 336' },
            { field: 'settings.quietHours.end', message: 'texts may not go after 21:00' },
            { field: 'settings.templates.0.body', message: 'a text must say how to opt out: add {optOut}' },
            { field: 'settings.retention', message: 'is not a setting' },
          ],
        },
      }),
    });
    const user = userEvent.setup();
    open();
    fireEvent.change(await screen.findByLabelText('Texts until'), { target: { value: '21:30' } });
    await user.click(screen.getByRole('button', { name: 'Save' }));
    expect(await screen.findByText('must not be more than 336')).toBeInTheDocument();
    expect(field('Text 48 h before: hours before')).toHaveAttribute('aria-invalid', 'true');
    expect(screen.getByText('texts may not go after 21:00')).toBeInTheDocument();
    expect(field('Texts until')).toHaveAttribute('aria-invalid', 'true');
    expect(screen.getByLabelText('Message')).toHaveAttribute('aria-invalid', 'true');
    expect(within(screen.getByRole('listitem', { name: 'Reminder text' })).getByLabelText('has a problem')).toBeInTheDocument();
    const banner = screen.getByRole('alert', { name: 'Not saved' });
    expect(banner).toHaveTextContent('retention: is not a setting');
    expect(banner).not.toHaveTextContent('336');
  });

  it('on 409 says someone else changed the settings and reloads their version', async () => {
    signInAs('admin');
    let version = 2;
    const calls = serve({
      version: () => version,
      put: () => {
        version = 3;
        return { status: 409, body: { statusCode: 409, message: 'The settings changed since version 2' } };
      },
    });
    const user = userEvent.setup();
    open();
    await user.click(await screen.findByLabelText('Text 24 h before: only if unconfirmed'));
    await user.click(screen.getByRole('button', { name: 'Save' }));
    const alert = await screen.findByRole('alert', { name: 'Changed by someone else' });
    expect(alert).toHaveTextContent('saved by someone else');
    expect(screen.getByRole('button', { name: 'Save' })).toBeDisabled();
    await user.click(within(alert).getByRole('button', { name: 'Reload' }));
    expect(await screen.findByText('Version 3')).toBeInTheDocument();
    expect(of(calls, 'GET /api/settings/reminders')).toHaveLength(2);
    expect(screen.queryByRole('alert', { name: 'Changed by someone else' })).toBeNull();
    expect(field('Text 24 h before: only if unconfirmed')).toBeChecked();
  });
});
