// The composer's decisions at send time, with its readers mocked. Quiet hours 08:00–21:00 (47 CFR
// 64.1200(c)(1), verified per references.md); one text a day (47 CFR 64.1200(a)(9)(iv), from memory).
import ICAL from 'ical.js';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import type { AppConfig } from '../config/configuration.js';
import type { OutboxMessageRow } from '../messaging/models/outbox-message.model.js';
import { readVisitToken } from './confirm-link.util.js';
import { DEFAULT_REMINDER_SETTINGS } from './default-reminder-settings.js';
import { ReminderComposerService } from './reminder-composer.service.js';
import type { ReminderSettingsService } from './reminder-settings.service.js';
import type { CountedText, ReminderVisit, ReminderVisitsService } from './reminder-visits.service.js';

const SECRET = 'unit-test-link-secret-0123456789';
const config = { publicUrl: 'https://ostium.example.com', messaging: { linkSecret: SECRET } } as AppConfig;
const START = new Date('2026-12-03T14:00:00Z'); // Thu 3 Dec 09:00 EST

function visit(over: Partial<ReminderVisit> = {}): ReminderVisit {
  return {
    id: 41,
    practiceId: 1,
    seriesId: 'series-1',
    visitIndex: 0,
    referralId: 9,
    start: START,
    end: new Date('2026-12-03T15:00:00Z'),
    state: 'booked',
    version: 1,
    createdAt: new Date('2026-11-20T12:00:00Z'),
    patient: { id: 5, phone: '+12025550142', email: 'wren@example.com', smsConsent: true, timeZone: null },
    location: { id: 2, name: 'Riverside', address: '14 Tannery Lane, Riverside Park, NY 10000', timeZone: 'America/New_York' },
    practice: { name: 'Quillfern Endodontics', phone: '+12025550100' },
    ...over,
  };
}

/** A row as the planner leaves it: planned 48 h before the visit's start, which it notes. */
const row = (over: Partial<OutboxMessageRow> = {}) =>
  ({ id: 100, practiceId: 1, channel: 'sms', purpose: 'reminder', ruleId: 'text-48h', appointmentId: 41, patientId: 5, payload: { visitStart: START.toISOString() }, plannedAt: new Date(START.getTime() - 48 * 3_600_000), ...over }) as OutboxMessageRow;

describe(ReminderComposerService.name, () => {
  let sut: ReminderComposerService;
  let visits: { visit: ReturnType<typeof vi.fn>; series: ReturnType<typeof vi.fn>; countedTexts: ReturnType<typeof vi.fn> };
  let settings: { current: ReturnType<typeof vi.fn> };

  beforeEach(() => {
    visits = { visit: vi.fn(async () => visit()), series: vi.fn(async () => [visit()]), countedTexts: vi.fn(async (): Promise<CountedText[]> => []) };
    settings = { current: vi.fn(async () => structuredClone(DEFAULT_REMINDER_SETTINGS)) };
    sut = new ReminderComposerService(visits as unknown as ReminderVisitsService, settings as unknown as ReminderSettingsService, config);
  });

  it('renders the 48 h text with the visit’s local date, time and place', async () => {
    // 48 h before Thu 3 Dec 09:00 EST: Tue 1 Dec 14:00Z = 09:00 EST.
    const d = await sut.compose(row(), new Date('2026-12-01T14:00:00Z'));
    expect(d).toEqual({
      action: 'send',
      to: '+12025550142',
      body: 'Quillfern Endodontics: your visit is Thu 3 Dec at 9:00 AM, Riverside. Reply C to confirm, R to reschedule. Reply STOP to opt out',
    });
  });

  it('puts a link in the 24 h text that is valid until the visit (plus the practice’s link hours)', async () => {
    const s = structuredClone(DEFAULT_REMINDER_SETTINGS);
    s.confirmLinkValidHours = 2;
    settings.current.mockResolvedValue(s);
    const d = await sut.compose(row({ ruleId: 'text-24h' }), new Date('2026-12-02T14:00:00Z'));
    expect(d.action).toBe('send');
    const body = (d as { body: string }).body;
    const token = /https:\/\/ostium\.example\.com\/v\/([A-Za-z0-9_-]{22}) Reply STOP to opt out$/.exec(body)![1]!;
    expect(readVisitToken(SECRET, token, START)).toEqual({ appointmentId: 41, expiresAt: new Date(START.getTime() + 2 * 3_600_000) });
  });

  it('cancels when the visit was cancelled or is over, skips when it has started', async () => {
    visits.visit.mockResolvedValueOnce(visit({ state: 'cancelled' }));
    expect(await sut.compose(row(), new Date('2026-12-01T14:00:00Z'))).toEqual({ action: 'cancel', reason: 'the visit was cancelled' });
    visits.visit.mockResolvedValueOnce(visit({ state: 'no_show' }));
    expect(await sut.compose(row(), new Date('2026-12-01T14:00:00Z'))).toEqual({ action: 'cancel', reason: 'the patient did not come to the visit (no-show)' });
    visits.visit.mockResolvedValueOnce(null);
    expect(await sut.compose(row(), new Date('2026-12-01T14:00:00Z'))).toEqual({ action: 'cancel', reason: 'the visit no longer exists' });
    expect(await sut.compose(row(), START)).toEqual({ action: 'skip', reason: 'the visit has already started' });
  });

  it('waits for the rule’s new time when the visit moved later, or the rule changed', async () => {
    visits.visit.mockResolvedValue(visit({ start: new Date('2026-12-04T19:00:00Z') }));
    // Fri 4 Dec 14:00 EST: the 48 h rule now wants Wed 2 Dec 19:00Z.
    expect(await sut.compose(row(), new Date('2026-12-01T14:00:00Z'))).toEqual({
      action: 'defer',
      dueAt: new Date('2026-12-02T19:00:00Z'),
      reason: 'the visit moved to Fri 4 Dec 2026, 2:00 PM',
    });
    // Same visit, but the practice turned the 48 h rule into a 24 h one since the row was planned.
    visits.visit.mockResolvedValue(visit());
    const s = structuredClone(DEFAULT_REMINDER_SETTINGS);
    s.rules[1]!.hoursBefore = 24;
    settings.current.mockResolvedValue(s);
    expect(await sut.compose(row(), new Date('2026-12-01T14:00:00Z'))).toEqual({
      action: 'defer',
      dueAt: new Date('2026-12-02T14:00:00Z'),
      reason: 'the rule now asks for Wed 2 Dec 2026, 9:00 AM',
    });
  });

  it('skips the 24 h text of a confirmed visit, and any text without consent or number', async () => {
    visits.visit.mockResolvedValueOnce(visit({ state: 'confirmed' }));
    expect(await sut.compose(row({ ruleId: 'text-24h' }), new Date('2026-12-02T14:00:00Z'))).toEqual({ action: 'skip', reason: 'already confirmed' });
    visits.visit.mockResolvedValueOnce(visit({ patient: { ...visit().patient, smsConsent: false } }));
    expect(await sut.compose(row(), new Date('2026-12-01T14:00:00Z'))).toEqual({ action: 'skip', reason: 'no text consent' });
    visits.visit.mockResolvedValueOnce(visit({ patient: { ...visit().patient, phone: null } }));
    expect(await sut.compose(row(), new Date('2026-12-01T14:00:00Z'))).toEqual({ action: 'skip', reason: 'no mobile number on file' });
  });

  it('defers at send time for quiet hours and the daily cap, in the patient’s zone', async () => {
    // A 07:30 EST visit (12:30Z): the 48 h rule wants Tue 1 Dec 07:30 EST, quiet until 08:00 EST (13:00Z).
    const early = visit({ start: new Date('2026-12-03T12:30:00Z') });
    visits.visit.mockResolvedValueOnce(early);
    expect(await sut.compose(row({ plannedAt: new Date('2026-12-01T12:30:00Z'), payload: { visitStart: early.start.toISOString() } }), new Date('2026-12-01T12:30:00Z'))).toEqual({
      action: 'defer',
      dueAt: new Date('2026-12-01T13:00:00Z'),
      reason: 'quiet hours in America/New_York until 08:00',
    });
    // A text already went at 08:05 EST today → Wed 2 Dec 08:00 EST.
    visits.countedTexts.mockResolvedValueOnce([{ id: 7, dedupeKey: null, status: 'sent', at: new Date('2026-12-01T13:05:00Z') }]);
    expect(await sut.compose(row(), new Date('2026-12-01T14:00:00Z'))).toEqual({ action: 'defer', dueAt: new Date('2026-12-02T13:00:00Z'), reason: 'already texted today' });
    // A text to the same patient going out right now with a higher id does not hold this one back.
    visits.countedTexts.mockResolvedValueOnce([{ id: 101, dedupeKey: null, status: 'sending', at: new Date('2026-12-01T14:00:00Z') }]);
    expect((await sut.compose(row(), new Date('2026-12-01T14:00:00Z'))).action).toBe('send');
    // The caps would push it past the visit: skipped with the reason.
    visits.countedTexts.mockResolvedValueOnce([{ id: 8, dedupeKey: null, status: 'sent', at: new Date('2026-12-03T13:01:00Z') }]);
    expect(await sut.compose(row({ ruleId: 'text-24h' }), new Date('2026-12-03T13:30:00Z'))).toEqual({
      action: 'skip',
      reason: 'no allowed time for this reminder before the visit (already texted today)',
    });
  });

  it('skips a rule that was removed or turned off, and a text its template can no longer fit', async () => {
    const s = structuredClone(DEFAULT_REMINDER_SETTINGS);
    s.rules[1]!.enabled = false;
    settings.current.mockResolvedValueOnce(s);
    expect(await sut.compose(row(), new Date('2026-12-01T14:00:00Z'))).toEqual({ action: 'skip', reason: 'the reminder rule “Text 48 hours before, asking for a reply” is turned off' });
    expect(await sut.compose(row({ ruleId: 'gone' }), new Date('2026-12-01T14:00:00Z'))).toEqual({ action: 'skip', reason: 'the reminder rule “gone” no longer exists' });
    // A location renamed after the template was saved can push the text past one segment: 21 + 16 + 9
    // ("Thu 3 Dec") + 4 + 7 ("9:00 AM") + 2 + 53 (the name) + 2 + 35 + 2 + 21 = 172.
    visits.visit.mockResolvedValueOnce(visit({ location: { ...visit().location, name: 'Riverside Professional Centre, Second Floor East Wing' } }));
    expect(await sut.compose(row(), new Date('2026-12-01T14:00:00Z'))).toEqual({
      action: 'skip',
      reason: 'the text would be 172 of 160 characters (GSM-7), more than one text; shorten the template',
    });
  });

  it('writes the booking e-mail for every visit ahead, with the .ics and the practice’s phone', async () => {
    const second = visit({ id: 42, visitIndex: 1, start: new Date('2026-12-10T19:15:00Z'), end: new Date('2026-12-10T20:00:00Z') });
    visits.series.mockResolvedValue([visit(), second]);
    const d = await sut.compose(row({ channel: 'email', purpose: 'booking_email', ruleId: 'booking-email', appointmentId: null, payload: { seriesId: 'series-1' } }), new Date('2026-11-30T15:00:00Z'));
    expect(d).toMatchObject({ action: 'send', to: 'wren@example.com', subject: 'Quillfern Endodontics: your visit on Thu 3 Dec at 9:00 AM' });
    const send = d as unknown as { body: string; html: string; attachments: { filename: string; content: string }[] };
    expect(send.body).toContain('- Thu 10 Dec 2026, 2:15 PM at Riverside');
    expect(send.body).toContain('(202) 555-0100');
    expect(send.html).toContain('<a href="https://ostium.example.com/v/');
    const cal = new ICAL.Component(ICAL.parse(send.attachments[0]!.content));
    expect(cal.getAllSubcomponents('vevent').map((e) => new ICAL.Event(e).startDate.toJSDate().toISOString())).toEqual(['2026-12-03T14:00:00.000Z', '2026-12-10T19:15:00.000Z']);
    expect(cal.getAllSubcomponents('vevent').map((e) => String(e.getFirstPropertyValue('description')))).toEqual(['To change or cancel, call (202) 555-0100.', 'To change or cancel, call (202) 555-0100.']);

    visits.series.mockResolvedValue([visit({ state: 'cancelled' }), { ...second, state: 'cancelled' }]);
    expect(await sut.compose(row({ channel: 'email', purpose: 'booking_email', ruleId: 'booking-email', payload: { seriesId: 'series-1' } }), new Date('2026-11-30T15:00:00Z'))).toEqual({
      action: 'cancel',
      reason: 'the visits were cancelled',
    });
  });
});
