import type { OpeningHours } from '@ostium/shared';
import { DateTime } from 'luxon';
import { ApiError } from '../../lib/api-client';

/** IANA zone names the browser knows, for the time-zone picker; a short list when the browser cannot say. */
export function timeZoneNames(): string[] {
  const intl = Intl as typeof Intl & { supportedValuesOf?: (k: string) => string[] };
  return intl.supportedValuesOf?.('timeZone') ?? ['UTC', 'America/New_York', 'America/Chicago', 'America/Denver', 'America/Los_Angeles', 'Europe/London', 'Europe/Berlin'];
}

/** One row per ISO weekday for the hours editor: closed days have no times. */
export interface DayHours {
  weekday: number;
  open: boolean;
  from: string;
  to: string;
}

export function hoursRows(hours: OpeningHours): DayHours[] {
  return [1, 2, 3, 4, 5, 6, 7].map((weekday) => {
    const h = hours.find((x) => x.weekday === weekday);
    return { weekday, open: !!h, from: h?.open ?? '08:00', to: h?.close ?? '17:00' };
  });
}

export const hoursFromRows = (rows: DayHours[]): OpeningHours => rows.filter((r) => r.open).map((r) => ({ weekday: r.weekday, open: r.from, close: r.to }));

export const WEEKDAY_LONG = ['', 'Monday', 'Tuesday', 'Wednesday', 'Thursday', 'Friday', 'Saturday', 'Sunday'];

/** A local date-time field (YYYY-MM-DDTHH:mm) in a zone, as a UTC instant; null when incomplete. */
export function instantFromLocal(local: string, zone: string): string | null {
  const d = DateTime.fromISO(local, { zone });
  return d.isValid ? d.toUTC().toISO() : null;
}

export const localFromInstant = (iso: string, zone: string) => DateTime.fromISO(iso, { zone }).toFormat('ccc d LLL yyyy, HH:mm');

/** The message to show for a failed save, and the per-field ones for inputs. */
export function errorOf(e: unknown): { message: string | null; field: (name: string) => string | undefined } {
  if (!e) return { message: null, field: () => undefined };
  if (e instanceof ApiError) return { message: e.message, field: (n) => e.field(n) };
  return { message: (e as Error).message ?? 'Could not save', field: () => undefined };
}
