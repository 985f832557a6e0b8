import { describe, expect, it } from 'vitest';
import { composeBookingNotice, type BookingNoticeFacts } from './booking-notice-letter.util.js';

const facts: BookingNoticeFacts = {
  practice: { name: 'Quillfern Endodontics', phone: '+12025550100', email: 'desk@quillfern-endo.test' },
  location: { name: 'Riverside', address: '14 Tannery Lane, Riverside Park, NY 10000', phone: '+12025550101', timeZone: 'America/New_York' },
  dentist: { name: 'Dr. Ottilie Farrow' },
  patient: { firstName: 'Wren', lastName: 'Halloway' },
  toothFdi: '36',
  procedure: 'retreatment',
  // 14:00 UTC on 14 Dec 2026 is 09:00 EST.
  firstVisit: { start: '2026-12-14T14:00:00.000Z', end: '2026-12-14T15:30:00.000Z', endodontist: 'Dr. Imre Castellan' },
  visitCount: 2,
};

describe('booking notice', () => {
  it('tells the referring dentist the patient, tooth, procedure, first visit in local time and who treats', () => {
    const l = composeBookingNotice(facts);
    expect(l.subject).toBe('Treatment booked for your referral – Quillfern Endodontics');
    expect(l.text).toBe(
      [
        'Dear Dr. Ottilie Farrow,',
        'the treatment of your patient Wren Halloway has been booked.',
        [
          'Patient: Wren Halloway',
          'Tooth: #19 (FDI 36), mandibular left first molar',
          'Procedure: Root canal retreatment',
          'First visit: Monday 14 December 2026, 09:00–10:30 (EST)',
          'Endodontist: Dr. Imre Castellan',
          'Location: Riverside, 14 Tannery Lane, Riverside Park, NY 10000',
        ].join('\n'),
        'We will send you a report when treatment ends. The treatment is planned in 2 visits.',
        'If you have any questions, please contact us (phone (202) 555-0101, e-mail desk@quillfern-endo.test).',
        'Kind regards,\nQuillfern Endodontics',
      ].join('\n\n') + '\n',
    );
  });

  it('has a simple HTML part with the same content, escaped', () => {
    const l = composeBookingNotice({ ...facts, patient: { firstName: '<i>Wren', lastName: 'Hall & Co' }, visitCount: 1 });
    expect(l.html).toMatch(/^<!doctype html><html><body/);
    expect(l.html).toContain('&lt;i&gt;Wren Hall &amp; Co');
    expect(l.html).toContain('First visit: Monday 14 December 2026, 09:00–10:30 (EST)<br>Endodontist: Dr. Imre Castellan');
    expect(l.html).not.toContain('<i>');
    expect(l.text).not.toContain('planned in');
  });

  it('keeps the patient out of the subject and carries no date of birth or clinical note', () => {
    const l = composeBookingNotice(facts);
    expect(l.subject).not.toMatch(/Wren|Halloway/);
    // Only the given facts can appear: the type has no birth date, reason or notes.
    expect(Object.keys(facts).sort()).toEqual(['dentist', 'firstVisit', 'location', 'patient', 'practice', 'procedure', 'toothFdi', 'visitCount']);
  });

  it('uses the zone’s summer abbreviation in summer', () => {
    expect(composeBookingNotice({ ...facts, firstVisit: { ...facts.firstVisit, start: '2026-07-06T13:00:00.000Z', end: '2026-07-06T14:00:00.000Z' } }).text).toContain(
      'First visit: Monday 6 July 2026, 09:00–10:00 (EDT)',
    );
  });
});
