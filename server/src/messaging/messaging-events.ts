// Events the outbox emits after a row reached an end state; listeners (front-desk tasks) are idempotent.
import type { MessageChannel, OutboxPurpose } from '@ostium/shared';

export const OUTBOX_FAILED = 'outbox.failed';

export interface OutboxFailedEvent {
  practiceId: number;
  outboxId: number;
  channel: MessageChannel;
  purpose: OutboxPurpose;
  patientId: number | null;
  appointmentId: number | null;
  reason: string;
  at: Date;
}
