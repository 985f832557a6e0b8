import { describe, expect, it } from 'vitest';
import { EstimateInputError } from './input-error.util.js';
import { ALL_FDI_CODES, isFdi, parseFdi } from './tooth-fdi.util.js';

describe('parseFdi', () => {
  it('reads quadrant and position (ISO 3950)', () => {
    // ISO 3950 per references.md: quadrant 1 upper right, 2 upper left, 3 lower left, 4 lower right.
    expect(parseFdi('11')).toMatchObject({ quadrant: 1, position: 1, jaw: 'maxillary', side: 'right', dentition: 'permanent' });
    expect(parseFdi('28')).toMatchObject({ jaw: 'maxillary', side: 'left' });
    expect(parseFdi('36')).toMatchObject({ jaw: 'mandibular', side: 'left' });
    expect(parseFdi('47')).toMatchObject({ jaw: 'mandibular', side: 'right', position: 7 });
    // 5–8 primary, positions 1–5.
    expect(parseFdi('55')).toMatchObject({ dentition: 'primary', jaw: 'maxillary', side: 'right' });
    expect(parseFdi('85')).toMatchObject({ dentition: 'primary', jaw: 'mandibular', side: 'right' });
    expect(parseFdi(' 21 ').fdi).toBe('21');
  });

  it('lists 52 teeth: 32 permanent and 20 primary', () => {
    expect(ALL_FDI_CODES).toHaveLength(52);
    expect(new Set(ALL_FDI_CODES).size).toBe(52);
    expect(ALL_FDI_CODES.filter((c) => Number(c[0]) >= 5)).toHaveLength(20);
  });

  it('accepts exactly the 52 codes among all two-digit strings', () => {
    const valid = [];
    for (let i = 0; i < 100; i++) {
      const code = String(i).padStart(2, '0');
      if (isFdi(code)) valid.push(code);
    }
    expect(valid).toEqual([...ALL_FDI_CODES].sort());
  });

  it('rejects other forms with an error on the field', () => {
    for (const bad of ['19', '56', '86', '09', '1', '111', '#11', 'A', '', '1.6']) {
      expect(() => parseFdi(bad)).toThrow(EstimateInputError);
    }
    try {
      parseFdi('99', 'toothFdi');
      expect.unreachable();
    } catch (e) {
      expect((e as EstimateInputError).field).toBe('toothFdi');
    }
  });
});
