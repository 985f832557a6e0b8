import type { ReplyThread, ReplyThreadSummary } from '@ostium/shared';
import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it } from 'vitest';
import { sessionStore } from '../../../lib/session';
import { mockFetch, renderRoutes, type MockCall } from '../../../test/render';
import { signInAs } from '../../case-sheet/test/case-sheet.fixtures';
import { REPLIES_POLL_MS, replyKeys } from '../api/replies';
import { repliesRoutes } from '../routes';
import { inbound, location, outbox, summary, task, thread } from '../test/replies.fixtures';

const LIST: ReplyThreadSummary[] = [
  summary({ patientId: 3, patientName: 'Robin Example', unread: 0, lastAt: '2026-12-01T18:00:00.000Z', lastPreview: 'Thanks' }),
  summary({ patientId: 4, patientName: 'Sam Example', unread: 2, openTasks: 1, lastAt: '2026-12-01T12:00:00.000Z', lastPreview: 'R' }),
  summary({ patientId: null, patientName: null, address: '+12025550177', unread: 1, lastAt: '2026-12-01T13:00:00.000Z', lastPreview: 'Who is this?', smsConsent: null }),
  summary({ patientId: 5, patientName: 'Kim Example', unread: 0, failed: 1, smsConsent: false, lastAt: '2026-12-01T19:00:00.000Z', lastPreview: 'Reminder for Fri' }),
];

function serve(opts: { thread?: ReplyThread; list?: ReplyThreadSummary[] } = {}) {
  return mockFetch({
    'GET /api/replies/threads': () => ({ status: 200, body: opts.list ?? LIST }),
    'GET /api/replies/threads/3': () => ({ status: 200, body: opts.thread ?? thread() }),
    // The server's name for an unmatched sender's thread: unmatched:<E.164 number>, URL-encoded.
    'GET /api/replies/threads/unmatched%3A%2B12025550177': () => ({
      status: 200,
      body: thread({ patientId: null, patientName: null, phone: '+12025550177', email: null, smsConsent: null, nextAppointment: null, items: [inbound({ id: 201, from: '+12025550177', body: 'Who is this?', kind: 'other', effect: 'Left in the inbox for the front desk; nothing changed' })], tasks: [task({ id: 9, kind: 'unmatched_reply', patientId: null, patientName: null, appointmentId: null, detail: 'A text from a number no patient gave' })] }),
    }),
    'POST /api/replies/threads/unmatched%3A%2B12025550177/read': () => ({ status: 204 }),
    'GET /api/replies/tasks': () => ({ status: 200, body: [task()] }),
    'GET /api/locations': () => ({ status: 200, body: [location()] }),
    'POST /api/replies/threads/3/read': () => ({ status: 204 }),
    'POST /api/replies/threads/3/messages': (body) => ({ status: 201, body: outbox({ id: 300, purpose: 'desk_reply', status: 'pending', body: (body as { body: string }).body }) }),
    'POST /api/outbox/101/retry': () => ({ status: 200, body: outbox({ id: 101, status: 'pending' }) }),
    'PATCH /api/replies/tasks/7': () => ({ status: 200, body: task({ status: 'done' }) }),
  });
}

const open = (path = '/replies') => renderRoutes([{ path: '/', children: repliesRoutes }], path);
const count = (calls: MockCall[], key: string) => calls.filter((c) => c.key === key).length;
const rows = () => within(screen.getByRole('list', { name: 'Thread list' })).getAllByRole('listitem');

describe('RepliesPage', () => {
  afterEach(() => sessionStore.set(null));

  it('lists unread threads first, then the most recent, with badges for unread, tasks, failures and consent', async () => {
    signInAs('frontdesk');
    serve();
    open();
    await screen.findByRole('list', { name: 'Thread list' });
    // Unread: Sam (12:00) and the unmatched number (13:00), newest first; then Kim (19:00) and Robin (18:00).
    // An unmatched sender shows as their number, in the national form (the NANP 555-01xx fictional range).
    expect(rows().map((r) => r.getAttribute('aria-label'))).toEqual(['(202) 555-0177', 'Sam Example', 'Kim Example', 'Robin Example']);
    const sam = rows()[1]!;
    expect(within(sam).getByLabelText('2 unread')).toHaveTextContent('2');
    expect(within(sam).getByLabelText('1 open task')).toBeInTheDocument();
    expect(sam).toHaveAttribute('data-unread', 'true');
    const kim = rows()[2]!;
    expect(within(kim).getByLabelText('1 failed')).toBeInTheDocument();
    expect(within(kim).getByRole('img', { name: 'No text consent' })).toBeInTheDocument();
    expect(kim).not.toHaveAttribute('data-unread');
    expect(within(rows()[0]!).getByText('unmatched')).toBeInTheDocument();
    expect(within(rows()[0]!).getByText('Who is this?')).toBeInTheDocument();
    // The Tasks filter carries the count of open tasks.
    expect(await screen.findByText('Tasks · 1')).toBeInTheDocument();
  });

  it('asks the server for the chosen filter', async () => {
    signInAs('frontdesk');
    const user = userEvent.setup();
    const calls = serve();
    open();
    await screen.findByRole('list', { name: 'Thread list' });
    expect(calls.find((c) => c.key === 'GET /api/replies/threads')!.query.get('filter')).toBe('all');
    await user.click(screen.getByText('Failed'));
    await waitFor(() => expect(calls.filter((c) => c.key === 'GET /api/replies/threads').at(-1)!.query.get('filter')).toBe('failed'));
  });

  it('polls the list, the thread and the tasks every 10 seconds', async () => {
    signInAs('frontdesk');
    serve();
    const { queryClient } = open('/replies?thread=3');
    await screen.findByRole('log', { name: 'Messages' });
    expect(REPLIES_POLL_MS).toBe(10_000);
    for (const key of [replyKeys.list('all'), replyKeys.thread('3'), replyKeys.tasks()]) {
      const q = queryClient.getQueryCache().find({ queryKey: key, exact: true });
      expect((q?.options as { refetchInterval?: number }).refetchInterval, JSON.stringify(key)).toBe(10_000);
    }
  });

  it('opens a thread as a conversation, marks it read once and shows what the reply did and the next visit', async () => {
    signInAs('frontdesk');
    const user = userEvent.setup();
    let read = false;
    const calls = mockFetch({
      'GET /api/replies/threads': () => ({ status: 200, body: [summary({ unread: read ? 0 : 1 })] }),
      'GET /api/replies/threads/3': () => ({ status: 200, body: thread({ items: [outbox(), inbound({ readAt: read ? '2026-12-01T15:00:00.000Z' : null })] }) }),
      'GET /api/replies/tasks': () => ({ status: 200, body: [] }),
      'GET /api/locations': () => ({ status: 200, body: [location()] }),
      'POST /api/replies/threads/3/read': () => {
        read = true;
        return { status: 204 };
      },
    });
    open();
    await user.click(await screen.findByRole('listitem', { name: 'Robin Example' }));
    const log = await screen.findByRole('log', { name: 'Messages' });
    const [ours, theirs] = within(log).getAllByRole('article');
    // Ours on the right, theirs on the left, in time order.
    expect(ours).toHaveAttribute('aria-label', 'We sent, reminder');
    expect(ours).toHaveStyle({ alignSelf: 'flex-end' });
    expect(theirs).toHaveAttribute('aria-label', 'They sent');
    expect(theirs).toHaveStyle({ alignSelf: 'flex-start' });
    expect(within(theirs!).getByText('Confirm')).toBeInTheDocument();
    expect(within(theirs!).getByRole('note')).toHaveTextContent('Confirmed the visit on Thu 3 Dec');
    // 14:30 UTC on 3 Dec 2026 is 09:30 in America/New_York (EST, UTC−5; IANA tz database via luxon).
    expect(screen.getByRole('group', { name: 'Next visit' })).toHaveTextContent('Next visit Thu 3 Dec 2026, 09:30 · Riverside · Unconfirmed');
    await waitFor(() => expect(count(calls, 'POST /api/replies/threads/3/read')).toBe(1));
    // The unread badge goes without waiting for the next poll.
    await waitFor(() => expect(within(screen.getByRole('listitem', { name: 'Robin Example' })).queryByLabelText('1 unread')).toBeNull());
    expect(count(calls, 'POST /api/replies/threads/3/read')).toBe(1);
  });

  it('does not mark a thread read when nothing in it is unread', async () => {
    signInAs('frontdesk');
    const calls = serve({ thread: thread({ items: [outbox(), inbound({ readAt: '2026-12-01T15:00:00.000Z' })] }) });
    open('/replies?thread=3');
    await screen.findByRole('log', { name: 'Messages' });
    await screen.findByText('Confirmed the visit on Thu 3 Dec');
    expect(count(calls, 'POST /api/replies/threads/3/read')).toBe(0);
  });

  it('shows each message’s delivery state in words, with the reason, and retries a failed one', async () => {
    signInAs('frontdesk');
    const user = userEvent.setup();
    const calls = serve({
      thread: thread({
        items: [
          outbox({ id: 100, status: 'delivered' }),
          outbox({ id: 101, status: 'failed', lastError: 'Carrier rejected the number (30006)', sentAt: null, deliveredAt: null, failedAt: '2026-12-01T16:00:00.000Z', dueAt: '2026-12-01T15:55:00.000Z', plannedAt: '2026-12-01T15:55:00.000Z' }),
          // Planned 06:30 New York time, moved by quiet hours to 08:00 the same morning.
          outbox({ id: 102, status: 'pending', sentAt: null, deliveredAt: null, plannedAt: '2026-12-02T11:30:00.000Z', dueAt: '2026-12-02T13:00:00.000Z', deferReason: 'quiet hours in America/New_York until 08:00' }),
          outbox({ id: 103, status: 'skipped', sentAt: null, deliveredAt: null, dueAt: '2026-12-02T14:00:00.000Z', plannedAt: '2026-12-02T14:00:00.000Z', deferReason: 'already a text today (1 a day)' }),
          outbox({ id: 104, status: 'sent', deliveredAt: null, sentAt: '2026-12-02T15:00:00.000Z', dueAt: '2026-12-02T15:00:00.000Z', plannedAt: '2026-12-02T15:00:00.000Z' }),
          outbox({ id: 105, status: 'pending', attempts: 0, sentAt: null, deliveredAt: null, dueAt: '2026-12-02T16:00:00.000Z', plannedAt: '2026-12-02T16:00:00.000Z' }),
        ],
      }),
    });
    open('/replies?thread=3');
    const log = await screen.findByRole('log', { name: 'Messages' });
    const states = () => within(log).getAllByTestId('delivery');
    expect(states().map((s) => [s.getAttribute('data-status'), s.textContent])).toEqual([
      ['delivered', expect.stringMatching(/^Delivered: (.+, )?09:30$/)],
      ['failed', 'Failed: Carrier rejected the number (30006)Retry'],
      ['pending', 'Moved to 08:00: quiet hours in America/New_York until 08:00'],
      ['skipped', 'Skipped: already a text today (1 a day)'],
      ['sent', expect.stringMatching(/^Sent: (.+, )?10:00$/)],
      ['pending', 'Queued'],
    ]);
    // Only the failed message offers Retry.
    expect(within(log).getAllByRole('button', { name: 'Retry' })).toHaveLength(1);
    await user.click(within(states()[1]!).getByRole('button', { name: 'Retry' }));
    await waitFor(() => expect(count(calls, 'POST /api/outbox/101/retry')).toBe(1));
  });

  it('lists the thread’s open tasks and closes one with Mark done', async () => {
    signInAs('frontdesk');
    const user = userEvent.setup();
    const calls = serve({ thread: thread({ tasks: [task(), task({ id: 8, status: 'done', detail: 'old' })] }) });
    open('/replies?thread=3');
    const tasks = await screen.findByRole('list', { name: 'Open tasks' });
    expect(within(tasks).getAllByRole('listitem')).toHaveLength(1);
    expect(within(tasks).getByText('Wants another time')).toBeInTheDocument();
    await user.click(within(tasks).getByRole('button', { name: 'Mark done' }));
    await waitFor(() => expect(calls.find((c) => c.key === 'PATCH /api/replies/tasks/7')?.body).toEqual({ status: 'done' }));
  });

  it('opens an unknown sender’s thread by their number, marks it read and offers no reply box', async () => {
    signInAs('frontdesk');
    const user = userEvent.setup();
    const calls = serve();
    const { router } = open();
    await user.click(await screen.findByRole('listitem', { name: '(202) 555-0177' }));
    expect(router.state.location.search).toBe('?thread=unmatched%3A%2B12025550177');
    const log = await screen.findByRole('log', { name: 'Messages' });
    expect(within(log).getByText('Who is this?')).toBeInTheDocument();
    expect(screen.getByRole('heading', { name: '(202) 555-0177' })).toBeInTheDocument();
    expect(screen.getByText('Not a patient')).toBeInTheDocument();
    expect(within(screen.getByRole('list', { name: 'Open tasks' })).getByText('Reply from an unknown number')).toBeInTheDocument();
    expect(screen.queryByRole('form', { name: 'Reply' })).toBeNull();
    expect(screen.getByText(/This number matches no patient/)).toBeInTheDocument();
    await waitFor(() => expect(count(calls, 'POST /api/replies/threads/unmatched%3A%2B12025550177/read')).toBe(1));
  });

  it('sends a text and an e-mail from the reply box', async () => {
    signInAs('frontdesk');
    const user = userEvent.setup();
    const calls = serve();
    open('/replies?thread=3');
    const box = await screen.findByRole('form', { name: 'Reply' });
    await user.type(within(box).getByLabelText('Your text'), 'We have a 10:00 opening on Fri. Reply C to take it.');
    await user.click(within(box).getByRole('button', { name: 'Send text' }));
    await waitFor(() => expect(calls.find((c) => c.key === 'POST /api/replies/threads/3/messages')?.body).toEqual({ channel: 'sms', body: 'We have a 10:00 opening on Fri. Reply C to take it.' }));
    await waitFor(() => expect(within(box).getByLabelText('Your text')).toHaveValue(''));

    await user.click(within(box).getByText('E-mail'));
    await user.type(within(box).getByLabelText('Your e-mail'), 'Your visit is on Thursday.');
    await user.type(within(box).getByLabelText('Subject'), 'Your visit');
    await user.click(within(box).getByRole('button', { name: 'Send e-mail' }));
    await waitFor(() =>
      expect(calls.filter((c) => c.key === 'POST /api/replies/threads/3/messages').at(-1)?.body).toEqual({ channel: 'email', subject: 'Your visit', body: 'Your visit is on Thursday.' }),
    );
  });
});
