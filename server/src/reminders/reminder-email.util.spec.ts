// The reminder e-mail: template filled, visit list, practice phone, and the caution of product.md
// "Cautions the product shows" (texts carry no clinical detail; consent; quiet hours; STOP).
import { describe, expect, it } from 'vitest';
import { DEFAULT_REMINDER_SETTINGS } from './default-reminder-settings.js';
import { reminderEmail } from './reminder-email.util.js';
import { placeholderValues } from './reminder-values.util.js';

const NY = 'America/New_York';
const template = DEFAULT_REMINDER_SETTINGS.templates[0]!;
const link = 'https://visits.example.com/v/AAAAKQBpaW1hYWFhYWFhYQ';
const values = placeholderValues({ channel: 'email', practice: 'Quillfern Endodontics', location: 'Riverside', start: new Date('2026-12-03T14:00:00Z'), zone: NY, confirmLink: link });
const visit = { start: new Date('2026-12-03T14:00:00Z'), zone: NY, locationName: 'Riverside', address: '14 Tannery Lane, Riverside Park, NY 10000' };
const base = { subject: template.subject!, body: template.body, values, visits: [visit], practiceName: 'Quillfern Endodontics', practicePhone: '+12025550100', quietHours: { start: '08:00', end: '21:00' } };

describe('reminderEmail', () => {
  it('fills the default booking template and adds place, phone and the caution', () => {
    const m = reminderEmail(base);
    expect(m.subject).toBe('Quillfern Endodontics: your visit on Thu 3 Dec at 9:00 AM');
    expect(m.text).toBe(
      [
        'Your visit at Quillfern Endodontics is booked for Thu 3 Dec at 9:00 AM, at our Riverside office.',
        `Use the link below to confirm or to ask for another time: ${link}`,
        'The attached calendar file adds the visit to your calendar.',
        'Where: Riverside, 14 Tannery Lane, Riverside Park, NY 10000',
        'To change or cancel a visit, call Quillfern Endodontics at (202) 555-0100.',
        'Our reminder texts carry only the date, time and place of your visit, no clinical details. We text only if you agreed to it, between 8:00 AM and 9:00 PM your time; reply STOP to any text to opt out.',
        'Quillfern Endodontics',
      ].join('\n\n') + '\n',
    );
  });

  it('lists every visit of a series with its date, time and place', () => {
    const second = { ...visit, start: new Date('2026-12-10T19:15:00Z'), locationName: 'Hilltop', address: null };
    const m = reminderEmail({ ...base, visits: [visit, second] });
    expect(m.text).toContain('Your visits:\n- Thu 3 Dec 2026, 9:00 AM at Riverside, 14 Tannery Lane, Riverside Park, NY 10000\n- Thu 10 Dec 2026, 2:15 PM at Hilltop');
    expect(m.text).not.toContain('Where:');
  });

  it('writes the same words as simple HTML, escaped, with the link as a link', () => {
    const m = reminderEmail({ ...base, body: 'Visit <b>{date}</b> & more: {confirmLink}', practiceName: 'Quillfern & Co' });
    expect(m.html).toContain('<p>Visit &lt;b&gt;Thu 3 Dec&lt;/b&gt; &amp; more: <a href="https://visits.example.com/v/AAAAKQBpaW1hYWFhYWFhYQ">https://visits.example.com/v/AAAAKQBpaW1hYWFhYWFhYQ</a></p>');
    expect(m.html).toContain('<p>Quillfern &amp; Co</p>');
    expect(m.html).not.toMatch(/<b>/);
  });

  it('follows the practice’s quiet hours in the caution and leaves out a missing phone', () => {
    const m = reminderEmail({ ...base, practicePhone: null, quietHours: { start: '09:30', end: '20:00' } });
    expect(m.text).toContain('between 9:30 AM and 8:00 PM your time');
    expect(m.text).not.toContain('To change or cancel');
  });
});
