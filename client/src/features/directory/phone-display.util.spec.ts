import { describe, expect, it } from 'vitest';
import { showPhone } from './phone-display.util';

describe('showPhone', () => {
  it('spaces out a stored E.164 number the way libphonenumber-js formats it', () => {
    // libphonenumber-js (reference library) gives the fictional 555 area code no country, so the
    // international form is shown: "+1 555 555 0142" (NANP 555-01xx is reserved for fiction).
    expect(showPhone('+15555550142')).toBe('+1 555 555 0142');
  });

  it('leaves missing and unparsable values readable', () => {
    expect(showPhone(null)).toBeNull();
    expect(showPhone('call the office')).toBe('call the office');
  });
});
