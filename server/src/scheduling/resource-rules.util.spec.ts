import { describe, expect, it } from 'vitest';
import { isIanaZone, rangeProblem, rruleProblem } from './resource-rules.util.js';

describe('resource rules', () => {
  it('accepts IANA zone names and nothing else (IANA tz database via luxon)', () => {
    expect(isIanaZone('America/New_York')).toBe(true);
    expect(isIanaZone('Europe/Lisbon')).toBe(true);
    expect(isIanaZone('Mars/Olympus')).toBe(false);
    expect(isIanaZone('+02:00')).toBe(false);
    expect(isIanaZone('UTC')).toBe(false);
  });

  it('reads RFC 5545 RRULE values with rrule and refuses broken ones', () => {
    expect(rruleProblem('FREQ=WEEKLY;BYDAY=MO,WE,TH')).toBeNull();
    expect(rruleProblem('DTSTART:20270104\nRRULE:FREQ=WEEKLY;INTERVAL=2;BYDAY=TU')).toBeNull();
    expect(rruleProblem('BYDAY=MO')).toMatch(/FREQ/);
    expect(rruleProblem('FREQ=WEEKLY;FOO=1')).toMatch(/not valid/);
    expect(rruleProblem('')).toMatch(/empty/);
  });

  it('wants a wall-clock range that ends after it starts', () => {
    expect(rangeProblem('08:00', '16:30')).toBeNull();
    expect(rangeProblem('12:00', '24:00')).toBeNull();
    expect(rangeProblem('16:30', '08:00')).toMatch(/after/);
    expect(rangeProblem('8:00', '09:00')).toMatch(/HH:mm/);
  });
});
