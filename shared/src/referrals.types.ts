import type { Level, Procedure } from './estimates.types.js';

export const URGENCIES = ['routine', 'soon', 'urgent'] as const;
export type Urgency = (typeof URGENCIES)[number];

export const REFERRAL_STATUSES = ['received', 'triaged', 'planned', 'booked', 'in_treatment', 'completed', 'report_sent', 'declined', 'cancelled'] as const;
export type ReferralStatus = (typeof REFERRAL_STATUSES)[number];

export const PREFERRED_CHANNELS = ['text', 'email', 'phone'] as const;
export type PreferredChannel = (typeof PREFERRED_CHANNELS)[number];

export const LETTER_CHANNELS = ['email', 'post', 'fax'] as const;
export type LetterChannel = (typeof LETTER_CHANNELS)[number];

// ---------- referring dentists ----------
export interface ReferringDentistInput {
  name: string;
  practiceName?: string | null;
  email?: string | null;
  phone?: string | null;
  address?: string | null;
  letterChannel?: LetterChannel;
  notes?: string | null;
}
export interface ReferringDentist extends Required<Omit<ReferringDentistInput, 'letterChannel'>> {
  id: number;
  letterChannel: LetterChannel;
  referralCount: number;
  createdAt: string;
}
/** POST /api/referring-dentists/:id/merge {otherId}: the other record's referrals move here, the other goes. */
export interface MergeReferringDentistsRequest {
  otherId: number;
}

// ---------- patients ----------
export interface PatientInput {
  firstName: string;
  lastName: string;
  dateOfBirth: string; // YYYY-MM-DD
  phone?: string | null; // any input; stored E.164
  email?: string | null;
  preferredChannel?: PreferredChannel;
  smsConsent?: boolean;
  smsConsentSource?: string | null; // how consent was given: "intake form", "verbal at desk", …
  timeZone?: string | null; // IANA; defaults to the referral location's
  notes?: string | null;
}
export interface Patient {
  id: number;
  firstName: string;
  lastName: string;
  dateOfBirth: string;
  phone: string | null; // E.164
  email: string | null;
  preferredChannel: PreferredChannel;
  smsConsent: boolean;
  smsConsentAt: string | null;
  smsConsentSource: string | null;
  timeZone: string | null;
  notes: string | null;
  createdAt: string;
}
/** 409 body when a patient with the same name and date of birth exists (repeat with `confirmNew: true`). */
export interface DuplicatePatientBody {
  statusCode: 409;
  message: string;
  existing: Patient[];
}

// ---------- referrals and cases ----------
export interface ReferralToothInput {
  tooth: string; // in `notation`
  procedure?: Procedure; // defaults to the referral's requested procedure
}
export interface CreateReferralRequest {
  patientId?: number;
  patient?: PatientInput & { confirmNew?: boolean };
  referringDentistId?: number;
  referringDentist?: ReferringDentistInput;
  receivedOn?: string; // YYYY-MM-DD, default today
  locationId: number;
  urgency: Urgency;
  procedure: Procedure;
  reason?: string | null;
  notes?: string | null;
  notation?: 'fdi' | 'universal'; // default: the practice's setting
  teeth: ReferralToothInput[];
  attachmentIds?: number[]; // uploaded first with POST /api/attachments
}
export interface CaseSummary {
  id: number;
  referralId: number;
  toothFdi: string;
  procedure: Procedure;
  status: ReferralStatus;
  level: Level | null;
  estimatedMinutes: number | null;
  visitCount: number | null;
}
export interface StatusEvent {
  status: ReferralStatus;
  reason: string | null;
  at: string;
  byUserId: number | null;
  byName: string | null;
}
export interface AttachmentSummary {
  id: number;
  referralId: number | null;
  fileName: string;
  mimeType: 'image/jpeg' | 'image/png' | 'application/pdf';
  sizeBytes: number;
  kind: 'radiograph' | 'letter';
  createdAt: string;
}
export const LETTER_KINDS = ['acknowledgement', 'booking_notice', 'completion_report'] as const;
/** queued: waiting in the outbox (detail says why when a send is being retried); the others are ends. */
export const LETTER_STATUSES = ['queued', 'sent', 'failed', 'skipped'] as const;
export interface LetterSummary {
  id: number;
  kind: (typeof LETTER_KINDS)[number];
  to: string;
  subject: string;
  status: (typeof LETTER_STATUSES)[number];
  detail: string | null;
  /** When the letter was queued (or logged, for a skip). */
  at: string;
  /** When the mail server took it; null until then. */
  sentAt?: string | null;
}
export interface ReferralListItem {
  id: number;
  receivedOn: string;
  status: ReferralStatus;
  urgency: Urgency;
  procedure: Procedure;
  patient: { id: number; name: string; dateOfBirth: string };
  referringDentist: { id: number; name: string; practiceName: string | null };
  location: { id: number; name: string };
  teeth: string[]; // FDI
  waitingDays: number;
}
export interface Referral extends ReferralListItem {
  reason: string | null;
  notes: string | null;
  statusReason: string | null;
  cases: CaseSummary[];
  attachments: AttachmentSummary[];
  history: StatusEvent[];
  letters: LetterSummary[];
  patientDetail: Patient;
  referringDentistDetail: ReferringDentist;
}
export interface ReferralQuery {
  status?: ReferralStatus | ReferralStatus[];
  urgency?: Urgency;
  referringDentistId?: number;
  locationId?: number;
  from?: string; // received on or after, YYYY-MM-DD
  to?: string;
  q?: string; // patient name
  sort?: 'waiting' | 'received' | 'urgency' | 'patient';
  order?: 'asc' | 'desc';
  page?: number;
  pageSize?: number;
}
export interface ReferralQueuePage {
  items: ReferralListItem[];
  total: number;
  page: number;
  pageSize: number;
  countsByStatus: Record<ReferralStatus, number>;
}
export interface ChangeReferralStatusRequest {
  status: ReferralStatus;
  reason?: string; // required for declined / cancelled
}
