import { describe, expect, it } from 'vitest';
import { diameterAt, isIsoSize, isoColour, ISO_SIZES } from './instruments.util.js';

describe('ISO 3630-1 instrument sizes', () => {
  it('colours every standard size', () => {
    // ISO 3630-1 colour code, verified in Qualtrough et al., Principles of Operative Dentistry, 2005
    // (references.md): 06 pink, 08 grey, 10 purple, 15/45/90 white, 20/50/100 yellow,
    // 25/55/110 red, 30/60/120 blue, 35/70/130 green, 40/80/140 black.
    const expected: Record<number, string> = {
      6: 'pink', 8: 'grey', 10: 'purple',
      15: 'white', 45: 'white', 90: 'white',
      20: 'yellow', 50: 'yellow', 100: 'yellow',
      25: 'red', 55: 'red', 110: 'red',
      30: 'blue', 60: 'blue', 120: 'blue',
      35: 'green', 70: 'green', 130: 'green',
      40: 'black', 80: 'black', 140: 'black',
    };
    expect(Object.keys(expected).map(Number).sort((a, b) => a - b)).toEqual([...ISO_SIZES]);
    for (const [size, colour] of Object.entries(expected)) {
      expect(isoColour(Number(size))).toBe(colour);
    }
  });

  it('has no colour for sizes outside the series', () => {
    for (const s of [0, 5, 12, 65, 75, 150, 30.5]) {
      expect(isIsoSize(s)).toBe(false);
      expect(isoColour(s)).toBeUndefined();
    }
  });

  it('diameter 16 mm from the tip = tip + 16 × taper', () => {
    // references.md worked examples (ISO 3630-1): 30/.04 → 0.94 mm, 30/.02 → 0.62 mm.
    expect(diameterAt(30, 0.04)).toBe(0.94);
    expect(diameterAt(30, 0.02)).toBe(0.62);
    expect(diameterAt(30, 0.02, 0)).toBe(0.3);
    expect(() => diameterAt(-1, 0.02)).toThrow(RangeError);
  });
});
