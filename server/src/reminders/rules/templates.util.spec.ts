// Templates: an opt-out in every message and ≤ 160 characters (47 CFR 64.1200(a)(9)(iv) conditions from
// memory, references.md); only what confirms the appointment (HHS FAQ 198; 45 CFR 164.502(b)).
import { describe, expect, it } from 'vitest';
import { renderTemplate, TemplateError, templatePlaceholders } from './templates.util.js';

const values = {
  practice: 'Demo Endodontics',
  date: 'Tue 16 Jun',
  time: '9:30',
  location: 'Suite 4',
  confirmHint: 'Reply C to confirm, R to reschedule.',
  optOut: 'Reply STOP to opt out.',
};
const TEMPLATE = '{practice}: visit {date} at {time}, {location}. {confirmHint} Call 555-0142. {optOut}';

describe('renderTemplate', () => {
  it('fills the placeholders and reports the length by encoding', () => {
    const r = renderTemplate(TEMPLATE, values);
    expect(r.text).toBe(
      'Demo Endodontics: visit Tue 16 Jun at 9:30, Suite 4. Reply C to confirm, R to reschedule. Call 555-0142. Reply STOP to opt out.',
    );
    expect(r.length).toEqual({ encoding: 'GSM-7', units: r.text.length, segments: 1, limit: 160 });
    expect(r.fitsOneSegment).toBe(true);
    expect(r.placeholders).toEqual(['practice', 'date', 'time', 'location', 'confirmHint', 'optOut']);
  });

  it('rejects unknown placeholders and names them, so clinical detail has no way in', () => {
    const bad = '{practice}: {procedure} on tooth {tooth} {date}. {optOut}';
    expect(() => renderTemplate(bad, values)).toThrow('unknown placeholders: {procedure}, {tooth}');
    try {
      renderTemplate(bad, values);
    } catch (e) {
      expect(e).toBeInstanceOf(TemplateError);
      expect((e as TemplateError).unknown).toEqual(['procedure', 'tooth']);
    }
    expect(templatePlaceholders('{ date } {Date}')).toEqual({ known: ['date'], unknown: ['Date'] });
  });

  it('refuses a text without a way to opt out', () => {
    expect(() => renderTemplate('{practice}: visit {date} at {time}.', values)).toThrow(/opt out/);
    expect(() => renderTemplate('{practice} {date} {optOut}', { ...values, optOut: 'See you soon.' })).toThrow(/opt-out word/);
    // A literal hint in the template itself is enough.
    expect(renderTemplate('{practice}: {date} {time}. Text STOP to end texts.', values).text).toContain('STOP');
    expect(renderTemplate('{practice} {date}. {optOut}', { ...values, optOut: 'Reply opt out for no more texts.' }).text).toContain('opt out');
    // A lower-case "cancel" is about the visit, not a keyword the patient would send.
    expect(() => renderTemplate('{practice} {date}. Call 555-0142 to cancel.', values)).toThrow(/opt out/);
  });

  it('knows {confirmLink} and counts the link into the length', () => {
    const link = 'https://visits.example.com/v/AAAAAQAAAAAxxxxxxxxxxx';
    const r = renderTemplate('{practice}: {date} {time}. Confirm: {confirmLink} {optOut}', { ...values, confirmLink: link });
    expect(r.placeholders).toEqual(['practice', 'date', 'time', 'confirmLink', 'optOut']);
    expect(r.text).toBe(`Demo Endodontics: Tue 16 Jun 9:30. Confirm: ${link} Reply STOP to opt out.`);
    expect(r.length.units).toBe(r.text.length);
    expect(templatePlaceholders('{confirmLink} {confirmlink}')).toEqual({ known: ['confirmLink'], unknown: ['confirmlink'] });
    expect(() => renderTemplate('{confirmLink} {optOut}', values)).toThrow('no value for {confirmLink}');
  });

  it('refuses placeholders without a value', () => {
    expect(() => renderTemplate(TEMPLATE, { ...values, location: '  ' })).toThrow('no value for {location}');
  });

  it('does not expand braces that arrive inside a value', () => {
    expect(renderTemplate('{location} {optOut}', { ...values, location: 'Room {tooth}' }).text).toBe('Room {tooth} Reply STOP to opt out.');
  });

  it('flags a text that leaves one segment, e.g. a curly apostrophe forcing UCS-2 (3GPP TS 23.038)', () => {
    const r = renderTemplate(TEMPLATE, { ...values, location: 'Dr. Example’s suite' });
    expect(r.length.encoding).toBe('UCS-2');
    expect(r.length.limit).toBe(70);
    expect(r.fitsOneSegment).toBe(false);
  });
});
