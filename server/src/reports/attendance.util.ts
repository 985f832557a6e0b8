// Attendance (REPORT_DEFINITIONS.noShow, lateCancellation, sameDayFill, confirmationRate): what became of
// the visits that started in the range, and how the ones that took place or were missed were confirmed.
// Pure.
import type { AppointmentState, AttendanceReport } from '@ostium/shared';
import { REMINDER_BUCKETS } from './report-constants.js';
import { clockFor, daySpan, MINUTE_MS, ratio, type LocalDay, type ZoneClock } from './report-time.util.js';

export interface AttendanceVisit {
  id: number;
  locationId: number;
  chairId: number;
  start: number;
  end: number;
  turnoverMinutes: number;
  state: AppointmentState;
  /** When the appointment was booked. */
  createdAt: number;
  cancelledAt: number | null;
  /** Hours of notice the cancellation gave (stored at cancellation); null → computed from cancelledAt. */
  cancelNoticeHours: number | null;
  confirmedAt: number | null;
  confirmedVia: string | null;
  /** Reminders sent (status sent or delivered) at or before the confirmation. */
  remindersBeforeConfirmation: number;
}

export interface AttendanceInput {
  from: string;
  to: string;
  lateCancelNoticeHours: number;
  /** Zone of each location, for local days. */
  zones: ReadonlyMap<number, string>;
  visits: readonly AttendanceVisit[];
}

export type AttendanceFigures = Omit<AttendanceReport, 'range'>;

export const ATTENDED: readonly AppointmentState[] = ['arrived', 'seated', 'dismissed'];
export const CHANNELS = ['sms', 'email', 'link', 'desk', 'unconfirmed'] as const;
type Channel = (typeof CHANNELS)[number];

/** How a confirmation came in: a text reply, an e-mail, the signed link, or the desk (also when not recorded). */
export function channelOf(confirmedVia: string | null): Exclude<Channel, 'unconfirmed'> {
  const v = (confirmedVia ?? '').toLowerCase();
  if (v === 'sms' || v === 'text') return 'sms';
  if (v === 'email') return 'email';
  if (v === 'link') return 'link';
  return 'desk';
}

export function noticeOf(v: Pick<AttendanceVisit, 'cancelNoticeHours' | 'cancelledAt' | 'start'>): number {
  if (v.cancelNoticeHours !== null) return v.cancelNoticeHours;
  return v.cancelledAt === null ? 0 : (v.start - v.cancelledAt) / 3_600_000;
}

export function attendance(input: AttendanceInput): AttendanceFigures {
  const span = daySpan(input.from, input.to);
  const clocks = new Map<number, ZoneClock>();
  const clockOf = (locationId: number) => {
    let c = clocks.get(locationId);
    if (!c) clocks.set(locationId, (c = clockFor(input.zones.get(locationId) ?? 'UTC', span)));
    return c;
  };
  const dayOf = (v: AttendanceVisit, t: number): LocalDay => clockOf(v.locationId).day(t);
  const inRange = input.visits.filter((v) => {
    const d = dayOf(v, v.start);
    return d >= span.first && d <= span.last;
  });

  let attended = 0;
  let noShows = 0;
  let late = 0;
  let early = 0;
  let open = 0;
  const base: AttendanceVisit[] = [];
  for (const v of inRange) {
    if (ATTENDED.includes(v.state)) {
      attended++;
      base.push(v);
    } else if (v.state === 'no_show') {
      noShows++;
      base.push(v);
    } else if (v.state === 'cancelled') {
      if (noticeOf(v) < input.lateCancelNoticeHours) late++;
      else early++;
    } else open++;
  }
  const visits = attended + noShows + late;

  // Same-day fills: booked on the local day it takes place, overlapping chair time that a cancellation
  // made earlier that same day had freed.
  const cancelledSameDay = new Map<string, AttendanceVisit[]>();
  for (const v of inRange) {
    if (v.state !== 'cancelled' || v.cancelledAt === null) continue;
    const day = dayOf(v, v.cancelledAt);
    if (day !== dayOf(v, v.start)) continue;
    const k = `${v.chairId}|${day}`;
    (cancelledSameDay.get(k) ?? cancelledSameDay.set(k, []).get(k)!).push(v);
  }
  let sameDayFills = 0;
  for (const v of inRange) {
    if (v.state === 'cancelled') continue;
    const day = dayOf(v, v.start);
    if (dayOf(v, v.createdAt) !== day) continue;
    const freed = cancelledSameDay.get(`${v.chairId}|${day}`) ?? [];
    const end = v.end + v.turnoverMinutes * MINUTE_MS;
    if (freed.some((c) => c.cancelledAt! <= v.createdAt && c.start < end && v.start < c.end + c.turnoverMinutes * MINUTE_MS)) sameDayFills++;
  }

  const channelCounts = new Map<Channel, number>(CHANNELS.map((c) => [c, 0]));
  const reminderCounts = new Map<(typeof REMINDER_BUCKETS)[number], number>(REMINDER_BUCKETS.map((b) => [b, 0]));
  let confirmed = 0;
  for (const v of base) {
    if (v.confirmedAt === null) {
      channelCounts.set('unconfirmed', channelCounts.get('unconfirmed')! + 1);
      continue;
    }
    confirmed++;
    const ch = channelOf(v.confirmedVia);
    channelCounts.set(ch, channelCounts.get(ch)! + 1);
    const n = v.remindersBeforeConfirmation;
    const bucket = n >= 3 ? '3+' : (String(n) as '0' | '1' | '2');
    reminderCounts.set(bucket, reminderCounts.get(bucket)! + 1);
  }
  return {
    lateCancelNoticeHours: input.lateCancelNoticeHours,
    totals: {
      visits,
      attended,
      noShows,
      lateCancellations: late,
      earlyCancellations: early,
      sameDayFills,
      open,
      attendedShare: ratio(attended, visits),
      noShowShare: ratio(noShows, visits),
      lateCancellationShare: ratio(late, visits),
    },
    confirmationByChannel: CHANNELS.map((channel) => ({ channel, visits: channelCounts.get(channel)!, share: ratio(channelCounts.get(channel)!, base.length) })),
    confirmationByReminders: REMINDER_BUCKETS.map((reminders) => ({ reminders, visits: reminderCounts.get(reminders)!, share: ratio(reminderCounts.get(reminders)!, confirmed) })),
    confirmationRate: ratio(confirmed, base.length),
  };
}
