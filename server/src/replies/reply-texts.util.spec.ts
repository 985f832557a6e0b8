import { describe, expect, it } from 'vitest';
import { classifyReply } from '../reminders/rules/keywords.util.js';
import { smsLength } from '../reminders/rules/sms-encoding.util.js';
import { namesOptOutWord } from '../reminders/rules/templates.util.js';
import { deskReplyText, firstThatFits, helpText, optInAck, optOutAck, rescheduleAck, visitWhen, waitlistBookedText, waitlistGoneText, waitlistOfferText } from './reply-texts.util.js';

const ZONE = 'America/New_York';
const oneSegment = (text: string) => {
  const l = smsLength(text);
  return l.units <= l.limit;
};

describe('reply texts', () => {
  it('reads the visit in the location’s zone, across the daylight-saving change', () => {
    // references.md "Calendars": America/New_York moves 2026-11-01 02:00 → 01:00.
    expect(visitWhen(new Date('2026-12-03T14:00:00Z'), ZONE)).toBe('Thu 3 Dec 9:00 AM');
    expect(visitWhen(new Date('2026-10-29T13:00:00Z'), ZONE)).toBe('Thu 29 Oct 9:00 AM');
    expect(visitWhen(new Date('2026-12-03T14:00:00Z'), 'America/Los_Angeles')).toBe('Thu 3 Dec 6:00 AM');
  });

  it('the opt-out acknowledgement is the agreed sentence and names no opt-out word to reply with', () => {
    expect(optOutAck('Quillfern Endodontics')).toBe('You will get no more texts from Quillfern Endodontics. Reply START to resume.');
    expect(classifyReply('START')).toBe('opt_in');
  });

  const long = 'The Extraordinarily Long-Named Riverside and Hilltop Endodontic Specialists Collaborative of Upper Meadowbrook';
  it.each([
    ['opt-out', (p: string) => optOutAck(p), false],
    ['opt-in', (p: string) => optInAck(p), true],
    ['help', (p: string) => helpText(p, '(202) 555-0100'), true],
    ['reschedule', (p: string) => rescheduleAck(p), true],
    ['offer', (p: string) => waitlistOfferText(p, 'Wed 30 Sep 12:30 PM', 'Riverside Annex North'), true],
    ['booked', (p: string) => waitlistBookedText(p, 'Wed 30 Sep 12:30 PM', 'Riverside Annex North'), true],
    ['gone', (p: string) => waitlistGoneText(p), true],
  ] as const)('%s: one segment even for a very long practice name; says how to opt out where it must', (_, make, needsOptOut) => {
    // references.md "Messages": ≤ 160 characters, an opt-out in every message.
    for (const p of ['Quillfern Endodontics', long, 'Clínica Endodôntica Ñandú']) {
      const text = make(p);
      expect(oneSegment(text), text).toBe(true);
      if (needsOptOut) expect(namesOptOutWord(text), text).toBe(true);
    }
  });

  it('keeps a text GSM-7 by dropping accents GSM-7 lacks from the name when the name would not fit otherwise', () => {
    // 3GPP TS 23.038 default alphabet: Ñ is in it; í, ô and ú are not.
    const text = waitlistOfferText('Clínica Endodôntica Ñandú', 'Wed 30 Sep 12:30 PM', 'Riverside');
    expect(text).toBe('Clinica Endodontica Ñandu: an earlier time is free, Wed 30 Sep 12:30 PM at Riverside. Reply YES to take it. Reply STOP to opt out.');
    expect(smsLength(text).encoding).toBe('GSM-7');
  });

  it('help names the practice, its phone and how to opt out', () => {
    expect(helpText('Quillfern Endodontics', '(202) 555-0100')).toBe('Quillfern Endodontics: questions about your visit? Call (202) 555-0100. Reply STOP to opt out.');
    expect(helpText('Quillfern Endodontics', null)).toBe('Quillfern Endodontics: questions about your visit? Call the practice. Reply STOP to opt out.');
  });

  it('adds the opt-out hint to a desk reply unless it already names one', () => {
    expect(deskReplyText(' See you Tuesday. ')).toBe('See you Tuesday. Reply STOP to opt out.');
    expect(deskReplyText('See you Tuesday. Text STOP to end texts')).toBe('See you Tuesday. Text STOP to end texts');
    // "cancel" in lower case is not an opt-out hint (templates.util.ts namesOptOutWord).
    expect(deskReplyText('Call us to cancel')).toBe('Call us to cancel Reply STOP to opt out.');
  });

  it('firstThatFits takes the first candidate of one segment and cuts the last one otherwise', () => {
    expect(firstThatFits(['x'.repeat(161), 'short'])).toBe('short');
    const cut = firstThatFits(['x'.repeat(200), '🙂'.repeat(50)]);
    expect(oneSegment(cut)).toBe(true);
    expect(cut).toBe('🙂'.repeat(35));
  });
});
