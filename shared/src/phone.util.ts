/**
 * Phone numbers: stored as E.164, read and displayed through libphonenumber-js.
 * The 'max' metadata is used because the default 'min' set checks only lengths and leading digits
 * and passes many numbers the full metadata rejects (about 6% of random digit strings in a probe).
 */
import {
  isSupportedCountry,
  parsePhoneNumberWithError,
  ParseError,
  validatePhoneNumberLength,
  type CountryCode,
  type PhoneNumber,
} from 'libphonenumber-js/max';

export type { CountryCode } from 'libphonenumber-js/max';

export type PhoneNumberProblem =
  | 'empty'
  | 'not-a-number'
  | 'unknown-country'
  | 'too-short'
  | 'too-long'
  | 'extension'
  | 'invalid';

/** Thrown for input that is not a valid, storable phone number. */
export class PhoneNumberError extends Error {
  constructor(
    message: string,
    readonly input: string,
    readonly problem: PhoneNumberProblem,
  ) {
    super(message);
    this.name = 'PhoneNumberError';
  }
}

export interface ParsedPhone {
  /** Storage form, e.g. '+12125550142'. */
  e164: string;
  /** National display form in the number's own country, e.g. '(212) 555-0142'. */
  national: string;
}

// Characters people type in phone fields; anything else (letters, trailing words) is refused rather
// than silently dropped by the library's lenient extraction. Extensions are caught separately below.
const PHONE_CHARS = /^\+?[\d\s().\-/\u2010-\u2015\u2212]+$/;
const EXTENSION = /(?:ext\.?|extension|x|#)\s*\d+\s*$/i;
const E164 = /^\+[1-9]\d{1,14}$/;

/**
 * NANP 555-0100..555-0199 is reserved for fictional use (design/references.md "NANP"). The library
 * already accepts it in US and Canadian area codes but rejects it in some other NANP areas
 * (e.g. 684, 242, 868), so it is accepted here wherever the area code maps to a NANP country.
 */
function isFictionalNanp(p: PhoneNumber): boolean {
  return p.countryCallingCode === '1' && p.country !== undefined && /^\d{3}55501\d\d$/.test(p.nationalNumber);
}

function shown(raw: string): string {
  return raw.length > 40 ? `${raw.slice(0, 40)}…` : raw;
}

function where(p: PhoneNumber | undefined, fallback: string): string {
  return p?.country ?? (p ? `+${p.countryCallingCode}` : fallback);
}

/**
 * Reads a phone number typed in national form for `defaultCountry`, or in international form
 * ('+…'), and returns its E.164 storage form and national display form.
 * Throws PhoneNumberError for anything that is not a valid number.
 */
export function parsePhone(input: string, defaultCountry: CountryCode = 'US'): ParsedPhone {
  if (typeof input !== 'string') {
    throw new PhoneNumberError(`a phone number must be text, got ${typeof input}`, String(input), 'not-a-number');
  }
  const raw = input.trim();
  if (raw === '') throw new PhoneNumberError('a phone number is required', input, 'empty');
  if (!isSupportedCountry(defaultCountry)) {
    throw new PhoneNumberError(`${String(defaultCountry)} is not a supported country code`, input, 'unknown-country');
  }
  if (EXTENSION.test(raw)) {
    // E.164 has no extension; dropping it silently would lose part of what the user typed.
    throw new PhoneNumberError(
      `"${shown(raw)}" has an extension; enter the number without it (extensions are not stored)`,
      input,
      'extension',
    );
  }
  if (!PHONE_CHARS.test(raw)) {
    throw new PhoneNumberError(
      `"${shown(raw)}" is not a phone number (use digits, spaces, ( ) - . and a leading +)`,
      input,
      'not-a-number',
    );
  }

  let p: PhoneNumber;
  try {
    p = parsePhoneNumberWithError(raw, defaultCountry);
  } catch (e) {
    if (!(e instanceof ParseError)) throw e;
    throw lengthOrParseError(raw, input, defaultCountry, e.message);
  }

  if (!p.isValid() && !isFictionalNanp(p)) {
    const length = validatePhoneNumberLength(raw, defaultCountry);
    if (length !== undefined) throw lengthOrParseError(raw, input, where(p, defaultCountry), length);
    throw new PhoneNumberError(`"${shown(raw)}" is not a valid phone number for ${where(p, defaultCountry)}`, input, 'invalid');
  }
  return { e164: p.number, national: p.formatNational() };
}

function lengthOrParseError(raw: string, input: string, place: string, code: string): PhoneNumberError {
  switch (code) {
    case 'TOO_SHORT':
      return new PhoneNumberError(`"${shown(raw)}" is too short for a ${place} phone number`, input, 'too-short');
    case 'TOO_LONG':
      return new PhoneNumberError(`"${shown(raw)}" is too long for a ${place} phone number`, input, 'too-long');
    case 'INVALID_COUNTRY':
      return new PhoneNumberError(`"${shown(raw)}" does not start with a known country calling code`, input, 'unknown-country');
    case 'INVALID_LENGTH':
      return new PhoneNumberError(`"${shown(raw)}" has the wrong number of digits for ${place}`, input, 'invalid');
    default:
      return new PhoneNumberError(`"${shown(raw)}" is not a phone number`, input, 'not-a-number');
  }
}

/**
 * Display form of a stored E.164 number: national form when the number belongs to `homeCountry`
 * (the practice's country), international form otherwise so a foreign number stays unambiguous.
 */
export function formatPhone(e164: string, homeCountry: CountryCode = 'US'): string {
  if (typeof e164 !== 'string' || !E164.test(e164)) {
    throw new PhoneNumberError(`"${shown(String(e164))}" is not a stored E.164 phone number (e.g. +12125550142)`, String(e164), 'not-a-number');
  }
  let p: PhoneNumber;
  try {
    p = parsePhoneNumberWithError(e164);
  } catch (e) {
    if (!(e instanceof ParseError)) throw e;
    throw lengthOrParseError(e164, e164, 'stored', e.message);
  }
  return p.country === homeCountry ? p.formatNational() : p.formatInternational();
}
