// Completing a case: the endodontist's findings and recall plan, and the completion report that goes
// to the referring dentist through the outbox (server/src/referrals, docs/messaging.md "Letters").
import type { LetterSummary, ReferralStatus } from './referrals.types.js';

/** POST /api/cases/:id/completion (capability completionReport). */
export interface CompleteCaseRequest {
  /** The endodontist's findings for the referring dentist; free text, required, at most 4000 characters. */
  findings: string;
  /** Recall reviews in months after treatment ended (1–120, at most 6); default: the case estimate's recall months. */
  recallPlan?: number[];
  /** E-mail the completion report to the referring dentist; default true. */
  sendReport?: boolean;
}

/** A dismissed visit as the report lists it, in the location's zone. */
export interface CompletionVisit {
  appointmentId: number;
  visitIndex: number;
  /** Local date, YYYY-MM-DD. */
  date: string;
  /** Local times of the visit as booked (or as moved), "HH:mm". */
  startTime: string;
  endTime: string;
  start: string;
  end: string;
  endodontist: string;
  locationName: string;
}

/** A visit that keeps the case from being completed. */
export interface OpenVisit {
  appointmentId: number;
  visitIndex: number;
  state: string;
  start: string;
  /** "visit 2 on Mon 14 Dec 2026 at 09:00 is still booked" */
  description: string;
}

export interface RecallReview {
  months: number;
  /** Local date the review is due, YYYY-MM-DD (treatment end + months). */
  dueOn: string;
}

export interface CaseCompletion {
  findings: string;
  recallPlan: RecallReview[];
  sendReport: boolean;
  /** Local date of the last dismissed visit. */
  treatmentEndedOn: string;
  completedAt: string;
  completedBy: string | null;
  /** The completion report letter, when one was queued; its status follows the outbox. */
  report: LetterSummary | null;
}

/** GET /api/cases/:id/completion — and the answer of the POST. */
export interface CaseCompletionView {
  caseId: number;
  referralId: number;
  caseStatus: ReferralStatus;
  timeZone: string;
  /** Dismissed visits, in order: what the report lists. */
  visits: CompletionVisit[];
  /** Visits still booked in the future or in progress: each keeps the case open. */
  openVisits: OpenVisit[];
  canComplete: boolean;
  /** Why the case cannot be completed now, in words; null when it can. */
  blockedBy: string | null;
  /** Recall months the form starts with (the case estimate's). */
  defaultRecallPlan: number[];
  /** What was saved; null before completion. */
  completion: CaseCompletion | null;
}
