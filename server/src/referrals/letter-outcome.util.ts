import type { LetterSummary, OutboxStatus } from '@ostium/shared';

/** The parts of a letter's outbox row that decide what became of the letter. */
export interface OutboxState {
  id: number;
  status: OutboxStatus;
  lastError: string | null;
  deferReason: string | null;
  sentAt: Date | null;
  providerId: string | null;
}

export interface LetterOutcome {
  status: Exclude<LetterSummary['status'], 'queued'>;
  detail: string | null;
  sentAt: Date | null;
  messageId: string | null;
}

/**
 * What a letter's outbox row came to, for the letter; null while the row is still on its way (pending or
 * sending — a retry in progress keeps the letter queued). Sent and delivered are both "sent": the mail
 * server took it. A skip or a cancel is a skip with the composer's reason.
 */
export function letterOutcome(o: OutboxState): LetterOutcome | null {
  switch (o.status) {
    case 'sent':
    case 'delivered':
      return { status: 'sent', detail: null, sentAt: o.sentAt, messageId: o.providerId };
    case 'failed':
      return { status: 'failed', detail: o.lastError ?? 'sending failed', sentAt: null, messageId: null };
    case 'skipped':
      return { status: 'skipped', detail: o.deferReason ?? 'not sent', sentAt: null, messageId: null };
    case 'cancelled':
      return { status: 'skipped', detail: o.deferReason ?? 'the message was cancelled', sentAt: null, messageId: null };
    default:
      return null;
  }
}

/** What a still-queued letter shows meanwhile: why the last attempt did not go, or why it waits. */
export const queuedDetail = (o: OutboxState | undefined): string | null => (o ? (o.lastError ?? o.deferReason ?? null) : null);
