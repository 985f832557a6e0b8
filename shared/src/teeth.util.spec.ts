import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import {
  ALL_TEETH,
  fdiToUniversal,
  formatTooth,
  isValidTooth,
  parseTooth,
  toothInfo,
  ToothNumberError,
  universalToFdi,
} from './teeth.util.js';

interface CrosswalkRow {
  universal: string;
  iso3950: string;
  dentition: string;
  jaw: string;
  side: string;
  tooth: string;
}

// Source: HL7 Dental Data Exchange FHIR IG, appendix D1 "Crosswalk of all teeth" (see fixtures/README.md).
function readCrosswalk(): CrosswalkRow[] {
  const text = readFileSync(new URL('./fixtures/tooth-crosswalk.csv', import.meta.url), 'utf8');
  const [header, ...lines] = text.trim().split(/\r?\n/);
  const cols = header!.split(',');
  return lines.map((line) => {
    const cells = line.split(',');
    return Object.fromEntries(cols.map((c, i) => [c, cells[i]])) as unknown as CrosswalkRow;
  });
}

const ROWS = readCrosswalk();

describe('HL7 crosswalk fixture', () => {
  it('has all 52 teeth (32 permanent, 20 primary)', () => {
    expect(ROWS).toHaveLength(52);
    expect(ROWS.filter((r) => r.dentition === 'permanent')).toHaveLength(32);
    expect(ROWS.filter((r) => r.dentition === 'primary')).toHaveLength(20);
  });
});

// Every row of the HL7 Dental Data Exchange IG crosswalk (appendix D1), both directions.
describe.each(ROWS)('crosswalk row Universal $universal ↔ FDI $iso3950', (row) => {
  it('Universal → FDI', () => {
    expect(universalToFdi(row.universal)).toBe(row.iso3950);
  });

  it('FDI → Universal', () => {
    expect(fdiToUniversal(row.iso3950)).toBe(row.universal);
  });

  it('dentition, jaw, side and tooth type', () => {
    const info = toothInfo(row.iso3950);
    expect(info).toMatchObject({
      fdi: row.iso3950,
      universal: row.universal,
      dentition: row.dentition,
      jaw: row.jaw,
      side: row.side,
      tooth: row.tooth,
    });
    expect(parseTooth(row.universal, 'universal')).toEqual(info);
  });

  it('group follows the tooth type (primary molars are molars; no primary premolars)', () => {
    // Group from the crosswalk's tooth type: incisors and canines are anterior (common practice, no source).
    const expected = /incisor|canine/.test(row.tooth) ? 'anterior' : row.tooth.endsWith('premolar') ? 'premolar' : 'molar';
    expect(toothInfo(row.iso3950).group).toBe(expected);
  });
});

describe('verified spot checks', () => {
  // Source: design/references.md "Tooth numbering", checks marked verified against the HL7 crosswalk.
  const checks: [string, string][] = [
    ['3', '16'],
    ['8', '11'],
    ['9', '21'],
    ['19', '36'],
    ['30', '46'],
    ['32', '48'],
    ['A', '55'],
    ['E', '51'],
    ['J', '65'],
    ['K', '75'],
    ['S', '84'],
    ['T', '85'],
  ];
  it.each(checks)('Universal %s is FDI %s', (u, f) => {
    expect(universalToFdi(u)).toBe(f);
    expect(fdiToUniversal(f)).toBe(u);
    expect(formatTooth(f, 'universal')).toBe(u);
    expect(formatTooth(f, 'fdi')).toBe(f);
  });
});

describe('ALL_TEETH', () => {
  it('lists the 52 teeth in chart order, the same order as the HL7 crosswalk table', () => {
    // The HL7 table runs Universal 1–32 then A–T: upper right → upper left, lower left → lower right.
    expect(ALL_TEETH.map((t) => t.fdi)).toEqual(ROWS.map((r) => r.iso3950));
    expect(ALL_TEETH.map((t) => t.universal)).toEqual(ROWS.map((r) => r.universal));
  });

  it('has no primary premolars and 8 permanent premolars', () => {
    expect(ALL_TEETH.filter((t) => t.dentition === 'primary' && t.group === 'premolar')).toEqual([]);
    expect(ALL_TEETH.filter((t) => t.group === 'premolar')).toHaveLength(8);
  });

  it('cannot be changed by a caller', () => {
    const copy = parseTooth('3', 'universal');
    copy.tooth = 'changed';
    expect(toothInfo('16').tooth).toBe('first molar');
    expect(Object.isFrozen(ALL_TEETH)).toBe(true);
    expect(Object.isFrozen(ALL_TEETH[0])).toBe(true);
  });
});

describe('parseTooth input handling', () => {
  it('trims and reads lower-case letters', () => {
    expect(parseTooth('  19 ', 'universal').fdi).toBe('36');
    expect(parseTooth('a', 'universal').fdi).toBe('55');
    expect(parseTooth(' t\t', 'universal').fdi).toBe('85');
    expect(parseTooth(' 36 ', 'fdi').universal).toBe('19');
  });

  it('accepts the "#19" form used on US charts for Universal numbers', () => {
    expect(parseTooth('#19', 'universal').fdi).toBe('36');
    expect(parseTooth('# 3', 'universal').fdi).toBe('16');
    expect(isValidTooth('#36', 'fdi')).toBe(false);
  });

  const badUniversal = ['0', '33', 'U', 'u', 'Z', '', '   ', 'abc', '03', '-1', '1.5', '3a', '99', 'AA', '#'];
  it.each(badUniversal)('rejects %j as Universal', (input) => {
    expect(() => parseTooth(input, 'universal')).toThrow(ToothNumberError);
    expect(() => universalToFdi(input)).toThrow(ToothNumberError);
    expect(isValidTooth(input, 'universal')).toBe(false);
  });

  const badFdi = ['19', '10', '59', '0', '00', '09', '90', '49', '56', '66', '86', '1', '016', '1 6', '1.6', 'A', '', 'abc', '#16'];
  it.each(badFdi)('rejects %j as FDI', (input) => {
    expect(() => parseTooth(input, 'fdi')).toThrow(ToothNumberError);
    expect(() => fdiToUniversal(input)).toThrow(ToothNumberError);
    expect(() => toothInfo(input)).toThrow(ToothNumberError);
    expect(() => formatTooth(input, 'universal')).toThrow(ToothNumberError);
    expect(isValidTooth(input, 'fdi')).toBe(false);
  });

  it('gives a clear message naming the input and the notation', () => {
    expect(() => parseTooth('33', 'universal')).toThrow('tooth 33 is not a Universal tooth number (1–32 or A–T)');
    expect(() => parseTooth('19', 'fdi')).toThrow(/tooth 19 is not an FDI tooth number/);
    expect(() => parseTooth('  ', 'fdi')).toThrow('a tooth number is required');
    try {
      parseTooth('U', 'universal');
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(Error);
      expect(e).toBeInstanceOf(ToothNumberError);
      expect((e as ToothNumberError).name).toBe('ToothNumberError');
      expect((e as ToothNumberError).input).toBe('U');
      expect((e as ToothNumberError).notation).toBe('universal');
    }
  });

  it('accepts exactly the crosswalk numbers among all one- and two-character candidates', () => {
    // Exhaustive against the HL7 crosswalk: every digit pair, every 1–2 digit number, every letter.
    const fdiSet = new Set(ROWS.map((r) => r.iso3950));
    const uniSet = new Set(ROWS.map((r) => r.universal));
    const candidates: string[] = [];
    for (let n = 0; n <= 99; n++) candidates.push(String(n), String(n).padStart(2, '0'));
    for (const c of 'ABCDEFGHIJKLMNOPQRSTUVWXYZ') candidates.push(c);
    for (const c of new Set(candidates)) {
      expect(isValidTooth(c, 'fdi'), `FDI ${c}`).toBe(fdiSet.has(c));
      expect(isValidTooth(c, 'universal'), `Universal ${c}`).toBe(uniSet.has(c));
    }
  });
});
