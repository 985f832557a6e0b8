import { DateTime } from 'luxon';
import { describe, expect, it } from 'vitest';
import { deliveryState, deskTextAsSent, messageTime, namesOptOut, sortThreads } from './replies.util';
import { outbox, summary } from './test/replies.fixtures';

const NY = 'America/New_York';

describe('sortThreads', () => {
  it('puts unread threads first, each group newest first', () => {
    const list = [
      summary({ patientId: 1, unread: 0, lastAt: '2026-12-01T20:00:00Z' }),
      summary({ patientId: 2, unread: 3, lastAt: '2026-12-01T10:00:00Z' }),
      summary({ patientId: 3, unread: 1, lastAt: '2026-12-01T11:00:00Z' }),
      summary({ patientId: 4, unread: 0, lastAt: '2026-12-01T21:00:00Z' }),
    ];
    expect(sortThreads(list).map((t) => t.patientId)).toEqual([3, 2, 4, 1]);
  });
});

describe('messageTime', () => {
  // IANA tz database via luxon: New York is UTC−5 in December.
  const now = DateTime.fromISO('2026-12-02T15:00:00Z');
  it('shows the time alone today, the day this year, the year otherwise, in the practice zone', () => {
    expect(messageTime('2026-12-02T13:05:00Z', NY, now)).toBe('08:05');
    expect(messageTime('2026-12-02T03:00:00Z', NY, now)).toBe('Tue 1 Dec, 22:00');
    expect(messageTime('2025-12-02T13:05:00Z', NY, now)).toBe('2 Dec 2025, 08:05');
  });
});

describe('deliveryState', () => {
  it('reads a quiet-hours move against the planned time', () => {
    // Planned 06:30 New York, moved to 08:00 the same day.
    const m = outbox({ status: 'pending', plannedAt: '2026-12-02T11:30:00Z', dueAt: '2026-12-02T13:00:00Z', deferReason: 'quiet hours in America/New_York until 08:00' });
    expect(deliveryState(m, NY)).toEqual({ word: 'Moved to 08:00', tone: 'waiting', detail: 'quiet hours in America/New_York until 08:00', retryable: false });
    // Moved past midnight: the day is named.
    const late = outbox({ status: 'pending', plannedAt: '2026-12-02T02:30:00Z', dueAt: '2026-12-02T13:00:00Z', deferReason: 'quiet hours' });
    expect(deliveryState(late, NY).word).toBe('Moved to Wed 2 Dec 08:00');
  });
  it('offers Retry only for a failure, with its reason', () => {
    expect(deliveryState(outbox({ status: 'failed', lastError: 'HTTP 500 from the provider' }), NY)).toMatchObject({ word: 'Failed', detail: 'HTTP 500 from the provider', retryable: true });
    for (const status of ['pending', 'sending', 'sent', 'delivered', 'skipped', 'cancelled'] as const) expect(deliveryState(outbox({ status }), NY).retryable, status).toBe(false);
  });
  it('says which attempt a retried message is on', () => {
    expect(deliveryState(outbox({ status: 'pending', attempts: 2, lastError: 'timeout' }), NY).detail).toBe('attempt 3 after: timeout');
  });
});

describe('deskTextAsSent', () => {
  // references.md "Messages": every text says how to opt out; the server adds the hint (threads.service deskReplyText).
  it('adds the opt-out hint to a text that names no opt-out word', () => {
    expect(deskTextAsSent(' See you Thursday ')).toEqual({ text: 'See you Thursday Reply STOP to opt out.', hintAdded: true });
  });
  it('leaves a text that already says how to opt out', () => {
    for (const t of ['Text STOP to end these', 'Reply QUIT to leave', 'You can opt out any time', 'Reply REVOKE']) expect(namesOptOut(t), t).toBe(true);
    // Lower-case "stop" or "cancel" in a sentence is not an opt-out instruction.
    for (const t of ['Please stop by the desk', 'call to cancel your visit']) expect(namesOptOut(t), t).toBe(false);
  });
  it('adds nothing to an empty text', () => {
    expect(deskTextAsSent('  ')).toEqual({ text: '', hintAdded: false });
  });
});
