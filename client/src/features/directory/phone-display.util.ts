import { formatPhone } from '@ostium/shared';

/** A stored E.164 number as the desk reads it: national form for the practice's country, else international. */
export function showPhone(e164: string | null | undefined): string | null {
  if (!e164) return null;
  try {
    return formatPhone(e164, 'US');
  } catch {
    // An older record not in E.164 is still worth showing as it was stored.
    return e164;
  }
}
