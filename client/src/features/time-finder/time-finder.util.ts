import type { TimeFinderApiRequest, TimeProposal } from '@ostium/shared';
import { DateTime } from 'luxon';

/** ISO weekdays, 1 = Monday … 7 = Sunday, as the time finder's preferences take them. */
export const WEEKDAY_CHOICES = [
  { value: 1, short: 'Mon', long: 'Monday' },
  { value: 2, short: 'Tue', long: 'Tuesday' },
  { value: 3, short: 'Wed', long: 'Wednesday' },
  { value: 4, short: 'Thu', long: 'Thursday' },
  { value: 5, short: 'Fri', long: 'Friday' },
  { value: 6, short: 'Sat', long: 'Saturday' },
  { value: 7, short: 'Sun', long: 'Sunday' },
] as const;

export interface SearchForm {
  weekdays: number[];
  partOfDay: 'any' | 'morning' | 'afternoon';
  locationId: number | null;
  operatorId: number | null;
  /** YYYY-MM-DD, local to the location; empty means from now. */
  earliest: string;
  urgent: boolean;
}

/** The POST /api/time-finder body for a case and the patient's wishes; empty wishes are left out. */
export function searchRequest(caseId: number, f: SearchForm, zone: string): TimeFinderApiRequest {
  const req: TimeFinderApiRequest = { caseId, limit: 5 };
  if (f.locationId) req.locationId = f.locationId;
  if (f.operatorId) req.operatorId = f.operatorId;
  const prefs: NonNullable<TimeFinderApiRequest['preferences']> = {};
  if (f.weekdays.length > 0 && f.weekdays.length < 7) prefs.weekdays = [...f.weekdays].sort((a, b) => a - b);
  if (f.partOfDay !== 'any') prefs.partOfDay = f.partOfDay;
  if (Object.keys(prefs).length) req.preferences = prefs;
  if (f.earliest) {
    const from = DateTime.fromISO(f.earliest, { zone }).startOf('day');
    // A date in the past means "from now", which is what the server does without `from`.
    if (from.isValid && from > DateTime.now()) req.from = from.toUTC().toISO()!;
  }
  if (f.urgent) req.urgent = true;
  return req;
}

/** Identity of a proposal by its slots, so its booking key survives a refetch that returns the same slots. */
export const proposalIdentity = (p: TimeProposal) => p.visits.map((v) => `${v.start}|${v.chairId}|${v.operatorId}|${v.microscopeId ?? ''}`).join(';');

export function newIdempotencyKey(): string {
  const c = globalThis.crypto as Crypto & { randomUUID?: () => string };
  if (typeof c.randomUUID === 'function') return c.randomUUID();
  // Pages served over plain http lack randomUUID: 128 random bits are as good for a retry key.
  const bytes = new Uint8Array(16);
  c.getRandomValues(bytes);
  return [...bytes].map((b) => b.toString(16).padStart(2, '0')).join('');
}

/** Keeps one Idempotency-Key per proposal: the same proposal booked twice sends the same key. */
export class IdempotencyKeys {
  private readonly keys = new Map<string, string>();
  constructor(private readonly make: () => string = newIdempotencyKey) {}
  for(p: TimeProposal): string {
    const id = proposalIdentity(p);
    let k = this.keys.get(id);
    if (!k) {
      k = this.make();
      this.keys.set(id, k);
    }
    return k;
  }
}

/** "leaves no gap" / "leaves a 20-min gap" / "leaves 1 h 15 min" */
export function gapText(minutes: number): string {
  if (minutes <= 0) return 'Leaves no gap';
  if (minutes < 60) return `Leaves a ${minutes}-min gap`;
  const h = Math.floor(minutes / 60);
  const m = minutes % 60;
  return `Leaves ${h} h${m ? ` ${m} min` : ''} of gaps`;
}

/** Whole calendar days between two visits, counted on the location's calendar. */
export function daysApart(a: string, b: string, zone: string): number {
  const da = DateTime.fromISO(a, { zone }).startOf('day');
  const db = DateTime.fromISO(b, { zone }).startOf('day');
  return Math.round(db.diff(da, 'days').days);
}
