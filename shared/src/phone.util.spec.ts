import fc from 'fast-check';
import * as minLib from 'libphonenumber-js';
import { getCountries, getExampleNumber, isValidPhoneNumber, type CountryCode } from 'libphonenumber-js/max';
import examples from 'libphonenumber-js/mobile/examples';
import { describe, expect, it } from 'vitest';
import { formatPhone, parsePhone, PhoneNumberError } from './phone.util.js';

// Reference library: libphonenumber-js 1.13.16 and the example numbers it ships (mobile examples).
function example(country: CountryCode) {
  const e = getExampleNumber(country, examples);
  if (!e) throw new Error(`libphonenumber-js ships no example for ${country}`);
  return e;
}

function problemOf(fn: () => unknown): string {
  try {
    fn();
  } catch (e) {
    if (e instanceof PhoneNumberError) return e.problem;
    throw e;
  }
  return 'accepted';
}

describe('reference example numbers (libphonenumber-js getExampleNumber, mobile examples)', () => {
  it.each<CountryCode>(['US', 'GB'])('%s: national and international input give the same E.164', (country) => {
    const e = example(country);
    const want = { e164: e.number, national: e.formatNational() };
    expect(parsePhone(e.formatNational(), country)).toEqual(want);
    expect(parsePhone(e.formatInternational(), 'US')).toEqual(want);
    expect(parsePhone(e.formatInternational(), 'GB')).toEqual(want);
    expect(parsePhone(e.number)).toEqual(want);
  });

  it('GB national input is read as British only when GB is the default country', () => {
    const e = example('GB');
    expect(e.formatNational().startsWith('0')).toBe(true); // GB trunk prefix, per the library's example
    expect(() => parsePhone(e.formatNational(), 'US')).toThrow(PhoneNumberError);
  });

  it('reads every country example the library ships in that country\'s national form', () => {
    for (const country of getCountries()) {
      const e = example(country);
      expect(parsePhone(e.formatNational(), country).e164, country).toBe(e.number);
    }
  });
});

describe('NANP fictional range 555-0100..555-0199 (design/references.md "NANP")', () => {
  const demo = ['(212) 555-0142', '+1 212 555 0142', '212-555-0142', '212.555.0142', '1-212-555-0142', '2125550142', ' +1 (212) 555‑0142 '];
  it.each(demo)('accepts demo form %j', (input) => {
    expect(parsePhone(input)).toEqual({ e164: '+12125550142', national: '(212) 555-0142' });
  });

  it('libphonenumber-js (max) already accepts the range in US and Canadian area codes', () => {
    // Finding, checked against libphonenumber-js 1.13.16: no special case is needed for these.
    for (const npa of ['212', '201', '312', '415', '416', '604']) {
      expect(isValidPhoneNumber(`+1${npa}5550100`), npa).toBe(true);
      expect(isValidPhoneNumber(`+1${npa}5550199`), npa).toBe(true);
    }
  });

  it('libphonenumber-js (max) rejects the range in some other NANP areas, e.g. 684 and 242', () => {
    expect(isValidPhoneNumber('+16845550142')).toBe(false);
    expect(isValidPhoneNumber('+12425550142')).toBe(false);
  });

  it.each(['212', '201', '416', '684', '242', '868'])('accepts all of 555-0100..0199 in area code %s', (npa) => {
    for (let n = 100; n <= 199; n++) {
      const line = `0${n}`;
      expect(parsePhone(`(${npa}) 555-${line}`)).toEqual({ e164: `+1${npa}555${line}`, national: `(${npa}) 555-${line}` });
    }
  });

  it('does not extend the fictional range to numbers that are not in a NANP area code', () => {
    expect(problemOf(() => parsePhone('+1 999 555 0142'))).toBe('invalid');
    expect(problemOf(() => parsePhone('+1 555 555 0142'))).toBe('invalid');
    expect(problemOf(() => parsePhone('+1 211 555 0142'))).toBe('invalid');
  });

  it.each(['212', '684'])('leaves 555-0200 and 555-0099 in area code %s to the library', (npa) => {
    for (const line of ['0200', '0099']) {
      const e164 = `+1${npa}555${line}`;
      expect(problemOf(() => parsePhone(e164)) === 'accepted', e164).toBe(isValidPhoneNumber(e164));
    }
  });

  it('555-0200 as libphonenumber-js 1.13.16 decides it: valid in 212, not in 684', () => {
    expect(parsePhone('(212) 555-0200')).toEqual({ e164: '+12125550200', national: '(212) 555-0200' });
    expect(problemOf(() => parsePhone('(684) 555-0200'))).toBe('invalid');
  });

  it('uses the max metadata: the default min set would wrongly accept (684) 555-0200', () => {
    expect(minLib.isValidPhoneNumber('+16845550200')).toBe(true);
    expect(isValidPhoneNumber('+16845550200')).toBe(false);
    expect(() => parsePhone('+1 684 555 0200')).toThrow(PhoneNumberError);
  });
});

describe('rejects what is not a phone number', () => {
  const cases: [string, string][] = [
    ['', 'empty'],
    ['   ', 'empty'],
    ['abc', 'not-a-number'],
    ['555-CALL-NOW', 'not-a-number'],
    ['+1 212 555 0142 abc', 'not-a-number'],
    ['++1 212 555 0142', 'not-a-number'],
    ['212+555+0142', 'not-a-number'],
    ['12', 'too-short'],
    ['555-0142', 'too-short'],
    ['212-555-014', 'too-short'],
    ['212-555-01423', 'too-long'],
    ['+1 212 555 0142 0142 0142', 'too-long'],
    ['+999 555 0142', 'unknown-country'],
    ['(212) 555-0142 ext. 12', 'extension'],
    ['212 555 0142 x7', 'extension'],
    ['+1 212 155 0142', 'invalid'],
  ];
  it.each(cases)('%j → %s', (input, problem) => {
    expect(problemOf(() => parsePhone(input))).toBe(problem);
  });

  it('gives messages that name the input', () => {
    expect(() => parsePhone('212-555-014')).toThrow('"212-555-014" is too short for a US phone number');
    expect(() => parsePhone('abc')).toThrow(/"abc" is not a phone number/);
    expect(() => parsePhone('')).toThrow('a phone number is required');
    const err = (() => {
      try {
        parsePhone('nope');
      } catch (e) {
        return e;
      }
    })();
    expect(err).toBeInstanceOf(Error);
    expect(err).toBeInstanceOf(PhoneNumberError);
    expect((err as PhoneNumberError).name).toBe('PhoneNumberError');
    expect((err as PhoneNumberError).input).toBe('nope');
  });

  it('rejects an unsupported default country', () => {
    expect(problemOf(() => parsePhone('212 555 0142', 'XX' as CountryCode))).toBe('unknown-country');
  });

  it('either throws PhoneNumberError or returns a valid E.164 that reads back to itself (property)', () => {
    fc.assert(
      fc.property(fc.oneof(fc.string(), fc.stringMatching(/^\+?[\d ()-]{0,20}$/)), (s) => {
        let out: { e164: string; national: string };
        try {
          out = parsePhone(s);
        } catch (e) {
          return e instanceof PhoneNumberError;
        }
        return /^\+[1-9]\d{1,14}$/.test(out.e164) && parsePhone(out.e164).e164 === out.e164;
      }),
      { numRuns: 2000 },
    );
  });
});

describe('formatPhone', () => {
  it('shows a home-country number nationally and a foreign one internationally', () => {
    expect(formatPhone('+12125550142')).toBe('(212) 555-0142');
    expect(formatPhone('+14165550142', 'CA')).toBe('(416) 555-0142');
    expect(formatPhone('+12125550142', 'CA')).toBe('+1 212 555 0142');
    expect(formatPhone('+16845550142')).toBe('+1 684 555 0142');
    const gb = example('GB');
    expect(formatPhone(gb.number)).toBe(gb.formatInternational());
    expect(formatPhone(gb.number, 'GB')).toBe(gb.formatNational());
  });

  it('round-trips with parsePhone', () => {
    for (const input of ['(212) 555-0100', '+1 312 555 0199']) {
      const { e164, national } = parsePhone(input);
      expect(formatPhone(e164)).toBe(national);
    }
  });

  it.each(['', '2125550142', '+0125550142', '+1 212 555 0142', '+1212555014212345', 'abc'])('rejects %j as a stored value', (v) => {
    expect(() => formatPhone(v)).toThrow(PhoneNumberError);
  });
});
