import { describe, expect, it } from 'vitest';
import { describeRule, weekdaysOf, withWeekdays } from './rrule.util';

// RFC 5545 §3.3.10 (RECUR): FREQ first by convention, BYDAY a comma list of MO TU WE TH FR SA SU.
describe('weekly rules', () => {
  it('writes BYDAY in week order whatever order the days were picked', () => {
    expect(withWeekdays(['WE', 'MO'])).toBe('FREQ=WEEKLY;BYDAY=MO,WE');
    expect(withWeekdays([])).toBe('FREQ=WEEKLY');
  });

  it('keeps the other parts of an edited rule', () => {
    expect(withWeekdays(['TH'], 'FREQ=WEEKLY;INTERVAL=2;BYDAY=MO;UNTIL=20261231T000000Z')).toBe('FREQ=WEEKLY;BYDAY=TH;INTERVAL=2;UNTIL=20261231T000000Z');
  });

  it('reads the days back, and refuses what the picker cannot show', () => {
    expect(weekdaysOf('RRULE:FREQ=WEEKLY;BYDAY=WE,MO')).toEqual(['MO', 'WE']);
    expect(weekdaysOf('FREQ=MONTHLY;BYDAY=1MO')).toBeNull();
    expect(weekdaysOf('FREQ=WEEKLY;BYDAY=1MO')).toBeNull();
  });

  it('describes rules in words', () => {
    expect(describeRule('FREQ=WEEKLY;BYDAY=MO,WE')).toBe('Mon, Wed');
    expect(describeRule('FREQ=WEEKLY;INTERVAL=2;BYDAY=FR')).toBe('Fri, every 2 weeks');
    expect(describeRule('FREQ=DAILY')).toBe('FREQ=DAILY');
  });
});
