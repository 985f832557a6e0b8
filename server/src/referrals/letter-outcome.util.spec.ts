import { describe, expect, it } from 'vitest';
import { letterOutcome, queuedDetail, type OutboxState } from './letter-outcome.util.js';
import { mapLetter } from './letters.service.js';
import type { LetterRow } from './models/letter.model.js';

const row = (o: Partial<OutboxState>): OutboxState => ({ id: 7, status: 'pending', lastError: null, deferReason: null, sentAt: null, providerId: null, ...o });
const sentAt = new Date('2026-12-02T15:00:00Z');

describe('letterOutcome', () => {
  it('keeps the letter queued while the row is pending or sending', () => {
    expect(letterOutcome(row({ status: 'pending' }))).toBeNull();
    expect(letterOutcome(row({ status: 'sending' }))).toBeNull();
  });

  it('maps the ends of the row onto the letter', () => {
    expect(letterOutcome(row({ status: 'sent', sentAt, providerId: '<outbox-7@ostium.test>' }))).toEqual({ status: 'sent', detail: null, sentAt, messageId: '<outbox-7@ostium.test>' });
    expect(letterOutcome(row({ status: 'delivered', sentAt }))?.status).toBe('sent');
    expect(letterOutcome(row({ status: 'failed', lastError: 'the mail server at 127.0.0.1:9 refused the connection (gave up after 1 attempts)' }))).toEqual({
      status: 'failed',
      detail: 'the mail server at 127.0.0.1:9 refused the connection (gave up after 1 attempts)',
      sentAt: null,
      messageId: null,
    });
    expect(letterOutcome(row({ status: 'skipped', deferReason: 'no e-mail address on file for the referring dentist' }))?.detail).toBe('no e-mail address on file for the referring dentist');
    expect(letterOutcome(row({ status: 'cancelled', deferReason: 'the visits were cancelled before the notice went out' }))).toMatchObject({ status: 'skipped', detail: 'the visits were cancelled before the notice went out' });
  });

  it('shows why a queued letter waits', () => {
    expect(queuedDetail(row({ lastError: 'the mail server did not answer in time; will try again' }))).toBe('the mail server did not answer in time; will try again');
    expect(queuedDetail(undefined)).toBeNull();
  });
});

describe('mapLetter', () => {
  const letter = (status: LetterRow['status']) =>
    ({ id: 3, kind: 'completion_report', toAddress: 'office@example.com', subject: 'Completion report – Quillfern Endodontics', status, detail: null, at: new Date('2026-12-02T14:00:00Z'), sentAt: null }) as LetterRow;

  it('shows a queued letter’s outbox end before the settle job has recorded it', () => {
    expect(mapLetter(letter('queued'), row({ status: 'sent', sentAt }))).toMatchObject({ status: 'sent', sentAt: '2026-12-02T15:00:00.000Z' });
    expect(mapLetter(letter('queued'), row({ status: 'pending', lastError: 'busy; will try again' }))).toMatchObject({ status: 'queued', detail: 'busy; will try again' });
    // A settled letter is what it says, whatever the row does later (the front desk may send it again).
    expect(mapLetter(letter('failed'), row({ status: 'pending' }))).toMatchObject({ status: 'failed' });
  });
});
