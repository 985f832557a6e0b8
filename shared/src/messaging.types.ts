// Reminders, confirmations, replies and the outbox: the shapes the server's messaging and replies
// modules answer with and the client's Replies and Settings → Reminders screens read.

export const MESSAGE_CHANNELS = ['sms', 'email'] as const;
export type MessageChannel = (typeof MESSAGE_CHANNELS)[number];

export const OUTBOX_STATUSES = ['pending', 'sending', 'sent', 'delivered', 'failed', 'skipped', 'cancelled'] as const;
export type OutboxStatus = (typeof OUTBOX_STATUSES)[number];

export const OUTBOX_PURPOSES = ['reminder', 'booking_email', 'keyword_reply', 'desk_reply', 'waitlist_offer', 'letter'] as const;
export type OutboxPurpose = (typeof OUTBOX_PURPOSES)[number];

/** When a rule fires: once on booking, or a number of hours before the visit starts. */
export const REMINDER_TRIGGERS = ['on_booking', 'before_visit'] as const;
export type ReminderTrigger = (typeof REMINDER_TRIGGERS)[number];

export interface ReminderRule {
  /** Stable id, part of the outbox's unique key (appointment, channel, rule). Lower-case letters, digits, dashes. */
  id: string;
  label: string;
  enabled: boolean;
  channel: MessageChannel;
  trigger: ReminderTrigger;
  /** Hours before the visit for `before_visit` (1–336); null for `on_booking`. */
  hoursBefore: number | null;
  /** Only send when the visit is still unconfirmed at send time. */
  onlyIfUnconfirmed: boolean;
  /** E-mail only: attach the visit as an iCalendar (.ics) file. */
  attachCalendar: boolean;
  templateId: string;
}

export const TEMPLATE_PLACEHOLDER_NAMES = ['practice', 'date', 'time', 'location', 'confirmHint', 'optOut', 'confirmLink'] as const;
export type TemplatePlaceholderName = (typeof TEMPLATE_PLACEHOLDER_NAMES)[number];

export interface MessageTemplate {
  id: string;
  label: string;
  channel: MessageChannel;
  /** E-mail only. */
  subject: string | null;
  /** Text with {placeholders}; a text template must say how to opt out and fit 160 GSM-7 / 70 UCS-2 characters. */
  body: string;
}

export interface QuietHours {
  /** Local "HH:MM" in the patient's zone; texts only go at or after start and before end. */
  start: string;
  end: string;
}

export interface ReminderSettings {
  rules: ReminderRule[];
  templates: MessageTemplate[];
  quietHours: QuietHours;
  caps: { perDay: number; perWeek: number };
  /** How long a confirm link in a message stays valid after the visit's start, in hours (default: until the visit). */
  confirmLinkValidHours: number;
  /** How long a waitlist offer stays open, in minutes. */
  waitlistOfferMinutes: number;
  /** How many waitlisted patients who fit get the offer at once. */
  waitlistOfferCount: number;
}

export interface ReminderSettingsResponse {
  settings: ReminderSettings;
  version: number;
  updatedAt: string | null;
  updatedBy: string | null;
  /** The placeholders a template may use, with what each becomes. */
  placeholders: { name: TemplatePlaceholderName; meaning: string }[];
}

export interface TemplatePreviewRequest {
  channel: MessageChannel;
  subject?: string | null;
  body: string;
}

export interface TemplatePreviewResponse {
  subject: string | null;
  text: string;
  /** Counted by encoding (GSM-7 septets or UCS-2 code units), not by string length. */
  encoding: 'GSM-7' | 'UCS-2';
  characters: number;
  limit: number;
  segments: number;
  fitsOneSegment: boolean;
  /** Problems that would stop a save (unknown placeholder, no opt-out, too long); empty when fine. */
  problems: string[];
}

/** One message in the outbox as the front desk sees it. */
export interface OutboxMessage {
  id: number;
  channel: MessageChannel;
  purpose: OutboxPurpose;
  ruleId: string | null;
  appointmentId: number | null;
  patientId: number | null;
  referralId: number | null;
  to: string | null;
  subject: string | null;
  body: string | null;
  status: OutboxStatus;
  dueAt: string;
  plannedAt: string;
  /** Why the message moved or was skipped ("quiet hours in America/New_York until 08:00", "no text consent"). */
  deferReason: string | null;
  attempts: number;
  lastError: string | null;
  providerId: string | null;
  providerStatus: string | null;
  sentAt: string | null;
  deliveredAt: string | null;
  failedAt: string | null;
  createdAt: string;
}

export const REPLY_KINDS = ['confirm', 'reschedule', 'opt_out', 'opt_in', 'help', 'other', 'waitlist_accept'] as const;
export type ReplyKindName = (typeof REPLY_KINDS)[number];

/** An item of a patient's thread: something we sent (outbox) or something the patient sent. */
export type ThreadItem =
  | ({ direction: 'out' } & OutboxMessage)
  | {
      direction: 'in';
      id: number;
      channel: 'sms' | 'email' | 'link';
      from: string;
      body: string;
      kind: ReplyKindName;
      effect: string | null;
      appointmentId: number | null;
      receivedAt: string;
      readAt: string | null;
    };

export interface ReplyThreadSummary {
  /** Null for a number we could not match to a patient (the unmatched inbox). */
  patientId: number | null;
  patientName: string | null;
  /** The sender's address when unmatched. */
  address: string | null;
  unread: number;
  openTasks: number;
  failed: number;
  lastAt: string;
  lastPreview: string;
  smsConsent: boolean | null;
}

export interface ReplyThread {
  patientId: number | null;
  patientName: string | null;
  phone: string | null;
  email: string | null;
  smsConsent: boolean | null;
  nextAppointment: { id: number; start: string; state: string; locationName: string } | null;
  items: ThreadItem[];
  tasks: DeskTask[];
}

export const DESK_TASK_KINDS = ['reschedule_request', 'delivery_failed', 'unmatched_reply'] as const;
export type DeskTaskKind = (typeof DESK_TASK_KINDS)[number];

export interface DeskTask {
  id: number;
  kind: DeskTaskKind;
  patientId: number | null;
  patientName: string | null;
  appointmentId: number | null;
  detail: string;
  status: 'open' | 'done';
  createdAt: string;
  doneAt: string | null;
  doneBy: string | null;
}

export interface DeskReplyRequest {
  channel: MessageChannel;
  /** E-mail only. */
  subject?: string;
  body: string;
}

/** What the public confirm page shows: only what confirms the appointment (HHS FAQ 198). */
export interface PublicVisitView {
  practiceName: string;
  practicePhone: string | null;
  locationName: string;
  /** Local date and time in the location's zone, already formatted. */
  when: string;
  start: string;
  state: 'booked' | 'confirmed' | 'cancelled' | 'past' | 'reschedule_requested';
  canConfirm: boolean;
  canAskToReschedule: boolean;
}

export interface PublicVisitAction {
  action: 'confirm' | 'reschedule';
}
