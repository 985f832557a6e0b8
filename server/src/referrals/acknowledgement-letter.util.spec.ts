import { describe, expect, it } from 'vitest';
import { composeAcknowledgement, type AcknowledgementFacts } from './acknowledgement-letter.util.js';

const facts: AcknowledgementFacts = {
  practice: { name: 'Quillfern Endodontics', phone: '+12025550100', email: 'desk@quillfern-endo.test' },
  location: { name: 'Riverside', address: '14 Tannery Lane, Riverside Park, NY 10000', phone: '+12025550101' },
  dentist: { name: 'Dr. Ottilie Farrow' },
  patient: { firstName: 'Wren', lastName: 'Halloway' },
  receivedOn: '2026-11-30',
};

describe('acknowledgement letter', () => {
  it('says who was referred, when it arrived and how to reach the practice', () => {
    const l = composeAcknowledgement(facts);
    expect(l.subject).toBe('Referral received – Quillfern Endodontics');
    expect(l.text).toBe(
      [
        'Dear Dr. Ottilie Farrow,',
        'thank you for your referral of Wren Halloway, which we received on 30 November 2026.',
        'We will contact the patient to arrange an appointment and will keep you informed.',
        'If you have any questions, please contact us (phone (202) 555-0101, e-mail desk@quillfern-endo.test).',
        'Kind regards,\nQuillfern Endodontics\nRiverside, 14 Tannery Lane, Riverside Park, NY 10000',
      ].join('\n\n') + '\n',
    );
  });

  it('keeps the patient’s name out of the subject line', () => {
    expect(composeAcknowledgement(facts).subject).not.toMatch(/Wren|Halloway/);
  });

  it('escapes names in the HTML part', () => {
    const l = composeAcknowledgement({ ...facts, patient: { firstName: '<b>Ada', lastName: 'O’Hare & Co' } });
    expect(l.html).toContain('&lt;b&gt;Ada O’Hare &amp; Co');
    expect(l.html).not.toContain('<b>Ada');
  });

  it('falls back to the practice phone and leaves out missing contact parts', () => {
    const l = composeAcknowledgement({ ...facts, location: { name: 'Hilltop', address: null, phone: null }, practice: { ...facts.practice, email: null } });
    expect(l.text).toContain('please contact us (phone (202) 555-0100).');
    expect(l.text).toContain('Kind regards,\nQuillfern Endodontics\nHilltop\n');
    const bare = composeAcknowledgement({ ...facts, location: { name: 'Hilltop', address: null, phone: null }, practice: { ...facts.practice, email: null, phone: null } });
    expect(bare.text).toContain('If you have any questions, please contact us.');
  });
});
