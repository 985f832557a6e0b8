import type { LetterSummary, Procedure, ReferralStatus, Urgency } from '@ostium/shared';

/** Trade words for the requested procedure (product.md vocabulary). */
export const PROCEDURE_LABELS: Record<Procedure, string> = {
  initial: 'Initial treatment',
  retreatment: 'Retreatment',
  surgery: 'Apical surgery',
  consult: 'Consultation',
  emergency: 'Emergency',
};

export const URGENCY_LABELS: Record<Urgency, string> = { routine: 'Routine', soon: 'Soon', urgent: 'Urgent' };
export const URGENCY_COLORS: Record<Urgency, string> = { routine: 'stone', soon: 'amber', urgent: 'red' };

export const STATUS_LABELS: Record<ReferralStatus, string> = {
  received: 'Received',
  triaged: 'Triaged',
  planned: 'Planned',
  booked: 'Booked',
  in_treatment: 'In treatment',
  completed: 'Completed',
  report_sent: 'Report sent',
  declined: 'Declined',
  cancelled: 'Cancelled',
};

// Open work in teal, settled work in stone, refusals in red; the words carry the meaning, colour only groups.
export const STATUS_STYLE: Record<ReferralStatus, { color: string; variant: 'filled' | 'light' | 'outline' }> = {
  received: { color: 'lagoon', variant: 'filled' },
  triaged: { color: 'lagoon', variant: 'light' },
  planned: { color: 'lagoon', variant: 'outline' },
  booked: { color: 'stone', variant: 'filled' },
  in_treatment: { color: 'stone', variant: 'light' },
  completed: { color: 'stone', variant: 'outline' },
  report_sent: { color: 'stone', variant: 'outline' },
  declined: { color: 'red', variant: 'light' },
  cancelled: { color: 'red', variant: 'outline' },
};

/** The queue's default view: referrals not yet through treatment (the server's "open": still waiting, may be declined). */
export const OPEN_STATUSES: ReferralStatus[] = ['received', 'triaged', 'planned', 'booked', 'in_treatment'];
export const CLOSED_STATUSES: ReferralStatus[] = ['completed', 'report_sent', 'declined', 'cancelled'];

export const LETTER_KIND_LABELS: Record<LetterSummary['kind'], string> = {
  acknowledgement: 'Acknowledgement',
  booking_notice: 'Booking notice',
  completion_report: 'Completion report',
};
export const LETTER_STATUS_COLORS: Record<LetterSummary['status'], string> = { queued: 'amber', sent: 'lagoon', failed: 'red', skipped: 'stone' };
