import { fireEvent, screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it } from 'vitest';
import { sessionStore } from '../../../lib/session';
import { mockFetch, renderPage } from '../../../test/render';
import { signInAs } from '../../case-sheet/test/case-sheet.fixtures';
import { outbox } from '../test/replies.fixtures';
import { ReplyBox } from './reply-box';

const serve = () => mockFetch({ 'POST /api/replies/threads/3/messages': () => ({ status: 201, body: outbox({ purpose: 'desk_reply', status: 'pending' }) }) });
const counter = () => screen.getByTestId('text-counter');
const textBox = () => screen.getByLabelText('Your text');

describe('ReplyBox', () => {
  afterEach(() => sessionStore.set(null));

  it('counts GSM-7 against 160 and switches to UCS-2 against 70 at an accented letter outside the alphabet', async () => {
    signInAs('frontdesk');
    serve();
    const user = userEvent.setup();
    renderPage(<ReplyBox patientId={3} phone="+12025550142" email="robin@example.com" smsConsent />);
    expect(counter()).toHaveTextContent('0 / 160 · GSM-7 · 0 segments');
    await user.type(textBox(), 'See you Thursday, José');
    // é is in the GSM-7 default alphabet (3GPP TS 23.038 §6.2.1, 0x05): still 160. 22 typed + 23 for
    // " Reply STOP to opt out.", which the server adds to a text that names no opt-out word.
    expect(counter()).toHaveTextContent('45 / 160 · GSM-7 · 1 segment');
    expect(screen.getByTestId('hint-added')).toHaveTextContent('“Reply STOP to opt out.” is added at the end');
    await user.type(textBox(), ' and María');
    // í is not in 3GPP TS 23.038: the whole text goes UCS-2, one segment holds 70.
    expect(counter()).toHaveTextContent('55 / 70 · UCS-2 · 1 segment');
    expect(screen.getByText(/“í” is outside the GSM-7 alphabet/)).toBeInTheDocument();
  });

  it('switches to UCS-2 at an emoji, counting it as two units, and refuses a text over one segment', async () => {
    signInAs('frontdesk');
    serve();
    const user = userEvent.setup();
    renderPage(<ReplyBox patientId={3} phone="+12025550142" email={null} smsConsent />);
    await user.type(textBox(), 'Thanks 🙂');
    // 🙂 is U+1F642, a surrogate pair in UTF-16: 7 + 2 units, + 23 for the opt-out hint (3GPP TS 23.038 UCS-2).
    expect(counter()).toHaveTextContent('32 / 70 · UCS-2 · 1 segment');
    expect(screen.getByRole('button', { name: 'Send text' })).toBeEnabled();
    fireEvent.change(textBox(), { target: { value: `${'a'.repeat(39)} 🙂 later` } });
    // 39 + 1 + 2 + 6 + 23 = 71 UCS-2 units: two segments (3GPP TS 23.040: 70 in one, 67 each after).
    expect(counter()).toHaveTextContent('71 / 70 · UCS-2 · 2 segments');
    expect(screen.getByRole('alert')).toHaveTextContent('Too long for one text');
    expect(screen.getByRole('button', { name: 'Send text' })).toBeDisabled();
    // A text that already says STOP gets no hint: 155 + 5 = 160 septets, one GSM-7 segment.
    fireEvent.change(textBox(), { target: { value: `${'a'.repeat(155)} STOP` } });
    expect(counter()).toHaveTextContent('160 / 160 · GSM-7 · 1 segment');
    expect(screen.queryByTestId('hint-added')).toBeNull();
    expect(screen.getByRole('button', { name: 'Send text' })).toBeEnabled();
  });

  it('turns texting off without consent, says why, and writes an e-mail instead', async () => {
    signInAs('frontdesk');
    const calls = serve();
    const user = userEvent.setup();
    renderPage(<ReplyBox patientId={3} phone="+12025550142" email="robin@example.com" smsConsent={false} />);
    expect(screen.getByTestId('text-blocked')).toHaveTextContent('Texting is off: No text consent on file (never given, or withdrawn with STOP)');
    expect(screen.getByRole('radio', { name: 'Text' })).toBeDisabled();
    expect(screen.queryByLabelText('Your text')).toBeNull();
    await user.type(screen.getByLabelText('Subject'), 'Your visit');
    await user.type(screen.getByLabelText('Your e-mail'), 'Please call us to confirm.');
    await user.click(screen.getByRole('button', { name: 'Send e-mail' }));
    await waitFor(() => expect(calls.at(-1)?.body).toEqual({ channel: 'email', subject: 'Your visit', body: 'Please call us to confirm.' }));
  });

  it('says when neither channel is open', () => {
    signInAs('frontdesk');
    serve();
    renderPage(<ReplyBox patientId={3} phone={null} email={null} smsConsent={null} />);
    expect(screen.getByTestId('text-blocked')).toHaveTextContent('No mobile number on file.');
    expect(screen.getByTestId('email-blocked')).toHaveTextContent('No e-mail address on file.');
    expect(screen.queryByRole('button', { name: /Send/ })).toBeNull();
  });

  it('shows the server’s field error under the text', async () => {
    signInAs('frontdesk');
    mockFetch({
      'POST /api/replies/threads/3/messages': () => ({ status: 400, body: { statusCode: 400, message: 'body: a text must fit one segment', errors: [{ field: 'body', message: 'a text must fit one segment' }] } }),
    });
    const user = userEvent.setup();
    renderPage(<ReplyBox patientId={3} phone="+12025550142" email={null} smsConsent />);
    await user.type(textBox(), 'Hello');
    await user.click(screen.getByRole('button', { name: 'Send text' }));
    expect(await screen.findByText('a text must fit one segment')).toBeInTheDocument();
    expect(textBox()).toHaveAttribute('aria-invalid', 'true');
  });
});
