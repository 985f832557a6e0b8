import { formatPhone, toothInfo, type Procedure } from '@ostium/shared';
import { DateTime } from 'luxon';

// Wording shared by the letters to referring dentists (acknowledgement, booking notice, completion report).

export const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

/** A stored E.164 number as people write it; the stored form when it cannot be read. */
export function phoneShown(e164: string | null): string | null {
  if (!e164) return null;
  try {
    return formatPhone(e164);
  } catch {
    return e164;
  }
}

/** Plain paragraphs as a simple HTML e-mail part (escaped; line breaks kept). */
export function paragraphsHtml(paragraphs: string[]): string {
  return `<!doctype html><html><body style="font-family: sans-serif; line-height: 1.5">${paragraphs
    .map((p) => `<p>${escapeHtml(p).replace(/\n/g, '<br>')}</p>`)
    .join('')}</body></html>`;
}

/** The procedure in words, as a letter to a colleague says it (product.md vocabulary). */
export const PROCEDURE_WORDS: Record<Procedure, string> = {
  initial: 'root canal treatment',
  retreatment: 'root canal retreatment',
  surgery: 'apical surgery',
  consult: 'consultation',
  emergency: 'emergency care',
};

export const capitalised = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

/**
 * A stored (FDI) tooth for a US colleague: Universal number first, FDI beside it, then the tooth in words,
 * e.g. "#19 (FDI 36), mandibular left first molar".
 */
export function toothWords(fdi: string): string {
  const t = toothInfo(fdi);
  const which = t.dentition === 'primary' ? `primary ${t.tooth}` : t.tooth;
  return `#${t.universal} (FDI ${t.fdi}), ${t.jaw} ${t.side} ${which}`;
}

/** Letters are written in US English whatever the server's locale (month and zone names). */
export const LETTER_LOCALE = 'en-US';

/** "Monday 14 December 2026" for a local date (YYYY-MM-DD). */
export const longDate = (isoDate: string) => DateTime.fromISO(isoDate, { zone: 'utc', locale: LETTER_LOCALE }).toFormat('cccc d LLLL yyyy');

/** "14 December 2026" for a local date (YYYY-MM-DD). */
export const shortDate = (isoDate: string) => DateTime.fromISO(isoDate, { zone: 'utc', locale: LETTER_LOCALE }).toFormat('d LLLL yyyy');

/** The practice's contact as a phrase: "phone (202) 555-0101, e-mail desk@…"; empty when none is known. */
export function contactPhrase(practice: { phone: string | null; email: string | null }, location: { phone: string | null }): string {
  const phone = phoneShown(location.phone) ?? phoneShown(practice.phone);
  return [phone ? `phone ${phone}` : null, practice.email ? `e-mail ${practice.email}` : null].filter(Boolean).join(', ');
}

export const placeLine = (location: { name: string; address: string | null }) => [location.name, location.address].filter(Boolean).join(', ');
