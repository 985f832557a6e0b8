// What the outbox job asks before it sends a row: the module that queued the row (reminders, replies,
// letters) registers a composer for its purpose, and the job re-reads the world through it at send time.
import type { MessageChannel, OutboxPurpose } from '@ostium/shared';
import type { Transaction } from 'sequelize';
import type { OutboxMessageRow } from './models/outbox-message.model.js';

export interface OutgoingAttachment {
  filename: string;
  contentType: string;
  content: Buffer | string;
}

export type ComposeDecision =
  /** Send now with this content (to/body may differ from the row's when the appointment moved). */
  | { action: 'send'; to: string; subject?: string | null; body: string; html?: string | null; attachments?: OutgoingAttachment[] }
  /** Not yet: move the row to `dueAt` and say why ("quiet hours in America/New_York until 08:00"). */
  | { action: 'defer'; dueAt: Date; reason: string }
  /** Never: an explicit skip with the reason shown to the front desk ("no text consent", "already confirmed"). */
  | { action: 'skip'; reason: string }
  /** The thing it was about went away ("the visit was cancelled"). */
  | { action: 'cancel'; reason: string };

export interface MessageComposer {
  compose(row: OutboxMessageRow, now: Date, transaction?: Transaction): Promise<ComposeDecision>;
}

/** Input of OutboxService.enqueue; a row with an existing dedupe key is not queued twice. */
export interface EnqueueInput {
  practiceId: number;
  channel: MessageChannel;
  purpose: OutboxPurpose;
  dedupeKey?: string | null;
  ruleId?: string | null;
  appointmentId?: number | null;
  patientId?: number | null;
  referralId?: number | null;
  letterId?: number | null;
  to?: string | null;
  subject?: string | null;
  body?: string | null;
  payload?: Record<string, unknown> | null;
  dueAt: Date;
  /** When the rule wanted it (defaults to dueAt). */
  plannedAt?: Date;
  deferReason?: string | null;
  createdBy?: number | null;
}
