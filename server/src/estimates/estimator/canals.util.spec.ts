import { describe, expect, it } from 'vitest';
import { ALL_TEETH } from '@ostium/shared';
import { archPositionLevel, isMaxillaryMolar, toothGroup, usualCanals } from './canals.util.js';
import { ALL_FDI_CODES, parseFdi } from './tooth-fdi.util.js';

const canals = (fdi: string) => usualCanals(parseFdi(fdi));

describe('usual canal counts', () => {
  it('maxillary teeth follow Vertucci 1984', () => {
    // Vertucci FJ, Oral Surg 1984;58:589–599: maxillary central, lateral, canine one canal in 100 %.
    for (const q of ['1', '2']) {
      expect(canals(`${q}1`)).toBe(1);
      expect(canals(`${q}2`)).toBe(1);
      expect(canals(`${q}3`)).toBe(1);
      // Vertucci 1984: maxillary first premolar two canals in about 69–87 %.
      expect(canals(`${q}4`)).toBe(2);
      // Vertucci 1984: maxillary second premolar one canal in about 75 %.
      expect(canals(`${q}5`)).toBe(1);
      // Vertucci 1984 (MB2 in 55 %) and Martins et al., J Endod 2018 (73.8 % by CBCT): usual count 4.
      expect(canals(`${q}6`)).toBe(4);
      // Maxillary second molar 3 (task brief's reading of Vertucci; MB2 there is the minority).
      expect(canals(`${q}7`)).toBe(3);
    }
  });

  it('mandibular teeth follow Vertucci 1984', () => {
    for (const q of ['3', '4']) {
      // Vertucci 1984: mandibular incisors a second canal in 25–30 %, so one is usual.
      expect(canals(`${q}1`)).toBe(1);
      expect(canals(`${q}2`)).toBe(1);
      expect(canals(`${q}3`)).toBe(1);
      // Vertucci 1984: mandibular first premolar ~26 % two or more, so one is usual.
      expect(canals(`${q}4`)).toBe(1);
      expect(canals(`${q}5`)).toBe(1);
      // Vertucci 1984 (references.md): mandibular first molar usually 3 (two mesial, one distal).
      expect(canals(`${q}6`)).toBe(3);
      expect(canals(`${q}7`)).toBe(3);
    }
  });

  it('third molars take the second molar count (from memory)', () => {
    expect(canals('18')).toBe(3);
    expect(canals('38')).toBe(3);
  });

  it('primary teeth: anteriors 1, molars 3 (from memory, no source)', () => {
    for (const q of [5, 6, 7, 8]) {
      expect([1, 2, 3, 4, 5].map((p) => canals(`${q}${p}`))).toEqual([1, 1, 1, 3, 3]);
    }
  });

  it('gives a count of 1–4 for every one of the 52 teeth', () => {
    for (const fdi of ALL_FDI_CODES) {
      const n = canals(fdi);
      expect(n).toBeGreaterThanOrEqual(1);
      expect(n).toBeLessThanOrEqual(4);
    }
  });
});

describe('tooth group and arch position', () => {
  it('agrees with the shared tooth table for all 52 teeth', () => {
    // The shared ISO 3950 table (shared/src/teeth.util.ts) is an independent implementation.
    expect(ALL_TEETH).toHaveLength(52);
    for (const t of ALL_TEETH) {
      const mine = parseFdi(t.fdi);
      expect(toothGroup(mine)).toBe(t.group);
      expect(mine.jaw).toBe(t.jaw);
      expect(mine.side).toBe(t.side);
      expect(mine.dentition).toBe(t.dentition);
    }
  });

  it('rates position: anterior/premolar low, first molar moderate, second/third molar high', () => {
    // AAE grid (from memory per references.md).
    expect(archPositionLevel(parseFdi('13'))).toBe('low');
    expect(archPositionLevel(parseFdi('45'))).toBe('low');
    expect(archPositionLevel(parseFdi('26'))).toBe('moderate');
    expect(archPositionLevel(parseFdi('37'))).toBe('high');
    expect(archPositionLevel(parseFdi('48'))).toBe('high');
    // Primary molars stand in the premolar positions (our rule).
    expect(archPositionLevel(parseFdi('75'))).toBe('low');
  });

  it('knows the maxillary molars', () => {
    expect(['16', '17', '18', '26', '27', '28', '54', '65'].every((c) => isMaxillaryMolar(parseFdi(c)))).toBe(true);
    expect(['36', '15', '11', '85'].some((c) => isMaxillaryMolar(parseFdi(c)))).toBe(false);
  });
});
