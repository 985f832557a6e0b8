// Which visit a reply is about, and which of several patients sharing a number sent it. Pure, so the
// rules are tested apart from the database.
import type { AppointmentState, ReplyKindName } from '@ostium/shared';
import type { ReplyKind } from '../reminders/rules/keywords.util.js';

/** A reply may still be about a visit that began this long ago (the patient answers from the waiting room). */
export const RECENT_PAST_MS = 2 * 3_600_000;
/** States a reply can be about: the visit still lies ahead of the patient. */
export const REPLYABLE_STATES: readonly AppointmentState[] = ['booked', 'confirmed'];

export interface VisitCandidate {
  id: number;
  patientId: number;
  start: number;
  state: AppointmentState;
}

/**
 * The patient's next visit (booked or confirmed, start in the future, soonest first); failing that, the
 * most recent one that started within the last two hours; else none.
 */
export function pickVisit<T extends VisitCandidate>(visits: readonly T[], now: number): T | null {
  const live = visits.filter((v) => REPLYABLE_STATES.includes(v.state));
  const next = live.filter((v) => v.start > now).sort((a, b) => a.start - b.start || a.id - b.id)[0];
  if (next) return next;
  const recent = live.filter((v) => v.start <= now && v.start >= now - RECENT_PAST_MS).sort((a, b) => b.start - a.start || b.id - a.id)[0];
  return recent ?? null;
}

export interface OfferCandidate {
  offerId: number;
  patientId: number;
  /** The offer can still be taken: slot open, not expired, offer not withdrawn. */
  open: boolean;
}

/**
 * Precedence (docs/messaging.md "Replies"): a confirm word from a patient holding a waitlist offer
 * answers the offer, because the offer is the message that asked for a YES most recently and lapses
 * within hours, while the visit's own reminder can be answered on the visit link or by the desk.
 */
export function replyKind(kind: ReplyKind, offer: OfferCandidate | null): ReplyKindName {
  return kind === 'confirm' && offer ? 'waitlist_accept' : kind;
}

/**
 * Of the patients with the sender's number: the one holding the offer when the reply answers one, then
 * the one whose visit the reply is about, then the one we texted last from this number, then the first.
 */
export function pickPatient(
  candidates: readonly number[],
  opts: { offer?: OfferCandidate | null; visit?: VisitCandidate | null; lastTexted?: number | null },
): number | null {
  if (!candidates.length) return null;
  if (opts.offer && candidates.includes(opts.offer.patientId)) return opts.offer.patientId;
  if (opts.visit && candidates.includes(opts.visit.patientId)) return opts.visit.patientId;
  if (opts.lastTexted && candidates.includes(opts.lastTexted)) return opts.lastTexted;
  return [...candidates].sort((a, b) => a - b)[0]!;
}
