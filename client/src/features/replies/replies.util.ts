import type { DeskTaskKind, OutboxMessage, OutboxPurpose, ReplyKindName, ReplyThreadSummary } from '@ostium/shared';
import { DateTime } from 'luxon';
import { showPhone } from '../directory/phone-display.util';

/** Unread threads first (the desk answers those), then the most recent. */
export function sortThreads(list: ReplyThreadSummary[]): ReplyThreadSummary[] {
  return [...list].sort((a, b) => Number(b.unread > 0) - Number(a.unread > 0) || Date.parse(b.lastAt) - Date.parse(a.lastAt));
}

export const threadName = (t: Pick<ReplyThreadSummary, 'patientName' | 'address'>) => t.patientName ?? showPhone(t.address) ?? t.address ?? 'Unknown sender';

export function consentWords(consent: boolean | null): { label: string; color: string } {
  if (consent === true) return { label: 'Texts agreed', color: 'lagoon' };
  if (consent === false) return { label: 'No text consent', color: 'red' };
  return { label: 'Not a patient', color: 'stone' };
}

/** Time of a message in the practice's zone: the time alone today, with the day otherwise. */
export function messageTime(iso: string, zone: string, now: DateTime = DateTime.now()): string {
  const t = DateTime.fromISO(iso, { zone });
  const today = now.setZone(zone);
  if (t.hasSame(today, 'day')) return t.toFormat('HH:mm');
  if (t.hasSame(today, 'year')) return t.toFormat('ccc d LLL, HH:mm');
  return t.toFormat('d LLL yyyy, HH:mm');
}

export const visitTime = (iso: string, zone: string) => DateTime.fromISO(iso, { zone }).toFormat('ccc d LLL yyyy, HH:mm');

export type DeliveryTone = 'waiting' | 'done' | 'problem' | 'quiet';

export interface DeliveryState {
  /** The state in one or two words, always shown beside its icon. */
  word: string;
  tone: DeliveryTone;
  /** Why it is so: the provider's failure, the rule that moved or skipped it. */
  detail: string | null;
  retryable: boolean;
}

/** A message whose due time moved past its planned time was deferred (quiet hours, daily cap). */
const wasMoved = (m: OutboxMessage) => Date.parse(m.dueAt) > Date.parse(m.plannedAt) + 30_000;

/** The new time, read against the planned one: "08:00" the same day, "Fri 4 Dec 08:00" on another. */
function movedTo(m: OutboxMessage, zone: string): string {
  const due = DateTime.fromISO(m.dueAt, { zone });
  return due.hasSame(DateTime.fromISO(m.plannedAt, { zone }), 'day') ? due.toFormat('HH:mm') : due.toFormat('ccc d LLL HH:mm');
}

/** What the desk reads under a message we sent: what happened to it, and why when it is not plain. */
export function deliveryState(m: OutboxMessage, zone: string): DeliveryState {
  const moved = wasMoved(m) && m.deferReason ? `moved to ${movedTo(m, zone)}: ${m.deferReason}` : null;
  switch (m.status) {
    case 'pending':
      return moved
        ? { word: `Moved to ${movedTo(m, zone)}`, tone: 'waiting', detail: m.deferReason, retryable: false }
        : { word: 'Queued', tone: 'waiting', detail: m.attempts > 0 ? `attempt ${m.attempts + 1}${m.lastError ? ` after: ${m.lastError}` : ''}` : null, retryable: false };
    case 'sending':
      return { word: 'Sending', tone: 'waiting', detail: null, retryable: false };
    case 'sent':
      return { word: 'Sent', tone: 'done', detail: [m.sentAt ? messageTime(m.sentAt, zone) : null, moved].filter(Boolean).join(' · ') || null, retryable: false };
    case 'delivered':
      return { word: 'Delivered', tone: 'done', detail: [m.deliveredAt ? messageTime(m.deliveredAt, zone) : null, moved].filter(Boolean).join(' · ') || null, retryable: false };
    case 'failed':
      return { word: 'Failed', tone: 'problem', detail: m.lastError ?? 'no reason given by the provider', retryable: true };
    case 'skipped':
      return { word: 'Skipped', tone: 'quiet', detail: m.deferReason, retryable: false };
    case 'cancelled':
      return { word: 'Cancelled', tone: 'quiet', detail: m.deferReason, retryable: false };
  }
}

export const PURPOSE_LABELS: Record<OutboxPurpose, string> = {
  reminder: 'Reminder',
  booking_email: 'Booking e-mail',
  keyword_reply: 'Automatic answer',
  desk_reply: 'Front desk',
  waitlist_offer: 'Waitlist offer',
  letter: 'Letter',
};

/** The reply keyword as the desk would say it; "other" is plain conversation and gets no label. */
export const REPLY_KIND_LABELS: Record<ReplyKindName, string | null> = {
  confirm: 'Confirm',
  reschedule: 'Another time',
  opt_out: 'Opt-out',
  opt_in: 'Opt-in',
  help: 'Help',
  other: null,
  waitlist_accept: 'Took the offer',
};

export const TASK_KIND_LABELS: Record<DeskTaskKind, string> = {
  reschedule_request: 'Wants another time',
  delivery_failed: 'Message not delivered',
  unmatched_reply: 'Reply from an unknown number',
};

/** What the server adds to a desk text that does not say how to opt out (server/src/replies/reply-texts.util.ts). */
export const OPT_OUT_HINT = 'Reply STOP to opt out.';

// references.md "Messages": STOP, END, CANCEL, UNSUBSCRIBE, QUIT, REVOKE and OPT OUT; STOPALL is common practice, no source.
const OPT_OUT_WORDS = new Set(['STOP', 'STOPALL', 'END', 'CANCEL', 'UNSUBSCRIBE', 'QUIT', 'REVOKE']);

/** True when the text already tells how to opt out: an opt-out word in capitals, or "opt out". */
export function namesOptOut(text: string): boolean {
  return text.split(/[^\p{L}]+/u).some((w) => OPT_OUT_WORDS.has(w)) || /\bopt[\s-]+out\b/i.test(text);
}

/** The desk's text as the patient gets it, so the counter counts what is really sent. */
export function deskTextAsSent(body: string): { text: string; hintAdded: boolean } {
  const text = body.trim();
  if (text === '' || namesOptOut(text)) return { text, hintAdded: false };
  return { text: `${text} ${OPT_OUT_HINT}`, hintAdded: true };
}
