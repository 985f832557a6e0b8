// Quiet hours: texts only while the patient's local clock reads inside the window (default 08:00–21:00,
// 47 CFR 64.1200(c)(1)); a text that falls outside moves to the next allowed instant, never dropped.
import { DateTime } from 'luxon';

export interface QuietWindow {
  /** Local "HH:mm" from which texts may go. */
  start: string;
  /** Local "HH:mm" from which texts may no longer go (half-open, so 21:00:00 itself is quiet). */
  end: string;
}

export const DEFAULT_QUIET_WINDOW: QuietWindow = { start: '08:00', end: '21:00' };

const MINUTE_MS = 60_000;
const HHMM = /^([01]\d|2[0-3]):([0-5]\d)$/;

export function parseHhMm(value: string): number {
  const m = HHMM.exec(value);
  if (!m) throw new RangeError(`time must be HH:mm (00:00–23:59), got "${value}"`);
  return Number(m[1]) * 60 + Number(m[2]);
}

interface ParsedWindow {
  startMin: number;
  endMin: number;
}

export function parseWindow(window: QuietWindow): ParsedWindow {
  const startMin = parseHhMm(window.start);
  const endMin = parseHhMm(window.end);
  // Overnight windows would let texts go at night, the very thing the rule forbids.
  if (startMin >= endMin) throw new RangeError(`quiet-hours window must start before it ends (${window.start}–${window.end})`);
  return { startMin, endMin };
}

export function assertZone(timeZone: string): void {
  if (!DateTime.fromMillis(0, { zone: timeZone }).isValid) throw new RangeError(`unknown time zone "${timeZone}"`);
}

function toMs(at: Date | number): number {
  const ms = typeof at === 'number' ? at : at.getTime();
  if (!Number.isFinite(ms)) throw new RangeError('instant is not a valid time');
  return ms;
}

/** Local clock reading in minutes since midnight, with the fraction, so 20:59:59.999 is still inside. */
function readingMinutes(dt: DateTime): number {
  return dt.hour * 60 + dt.minute + dt.second / 60 + dt.millisecond / MINUTE_MS;
}

function insideParsed(ms: number, timeZone: string, w: ParsedWindow): boolean {
  const m = readingMinutes(DateTime.fromMillis(ms, { zone: timeZone }));
  return m >= w.startMin && m < w.endMin;
}

export function isInsideWindow(at: Date | number, timeZone: string, window: QuietWindow = DEFAULT_QUIET_WINDOW): boolean {
  assertZone(timeZone);
  return insideParsed(toMs(at), timeZone, parseWindow(window));
}

/**
 * Instants where the local reading can enter the window on one local date: a reading of exactly the
 * start (none in a spring-forward gap, two in a repeated hour) and the day's offset change, if any.
 */
function entryCandidates(day: DateTime, timeZone: string, startMin: number): number[] {
  const wallUtc = Date.UTC(day.year, day.month - 1, day.day) + startMin * MINUTE_MS;
  const first = DateTime.fromObject({ year: day.year, month: day.month, day: day.day }, { zone: timeZone });
  const next = first.plus({ days: 1 });
  const lo0 = first.toMillis();
  const hi0 = next.toMillis() - 1;
  const offA = first.offset;
  const offB = DateTime.fromMillis(hi0, { zone: timeZone }).offset;
  const out: number[] = [];
  for (const off of new Set([offA, offB])) {
    const ms = wallUtc - off * MINUTE_MS;
    const dt = DateTime.fromMillis(ms, { zone: timeZone });
    if (dt.offset === off && dt.hasSame(first, 'day')) out.push(ms);
  }
  if (offA !== offB) {
    // Binary search for the first instant on the new offset (one change a day is assumed; tzdb has no zone with two).
    let lo = lo0;
    let hi = hi0;
    while (lo < hi) {
      const mid = Math.floor((lo + hi) / 2);
      if (DateTime.fromMillis(mid, { zone: timeZone }).offset === offB) hi = mid;
      else lo = mid + 1;
    }
    out.push(lo);
  }
  return out;
}

/**
 * The earliest instant at or after `at` whose local reading in `timeZone` lies in [start, end):
 * `at` itself inside the window, else the same local day's start, else the next local day's start
 * (exact across daylight-saving changes, including starts inside a skipped or repeated hour).
 */
export function nextAllowedInstant(at: Date | number, timeZone: string, window: QuietWindow = DEFAULT_QUIET_WINDOW): Date {
  assertZone(timeZone);
  const w = parseWindow(window);
  const ms = toMs(at);
  if (insideParsed(ms, timeZone, w)) return new Date(ms);
  const today = DateTime.fromMillis(ms, { zone: timeZone }).startOf('day');
  // A window wholly inside a skipped hour has no instant that day, hence a few days of look-ahead.
  for (let i = 0; i < 4; i++) {
    const day = today.plus({ days: i });
    const found = entryCandidates(day, timeZone, w.startMin)
      .filter((c) => c > ms && insideParsed(c, timeZone, w))
      .sort((a, b) => a - b);
    if (found.length > 0) return new Date(found[0]);
  }
  throw new RangeError(`no allowed instant within four days in ${timeZone} for ${window.start}–${window.end}`);
}
