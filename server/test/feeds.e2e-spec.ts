import ICAL from 'ical.js';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { at, OP_PASSWORD, plusDays, schedulingFixture, type SchedulingFixture } from './helpers/scheduling-fixture.js';
import { createTestApp, type TestApp } from './helpers/test-app.js';

describe('operator calendar feed', () => {
  let t: TestApp;
  let f: SchedulingFixture;

  beforeAll(async () => {
    t = await createTestApp();
    f = await schedulingFixture(t, 'Feedbay', 1);
    const desk = await t.as('frontdesk');
    for (const [i, time] of [['1', '08:00'], ['2', '10:00']] as const) {
      const { caseId } = await f.newCase({ tooth: i === '1' ? '36' : '11' });
      const end = time === '08:00' ? '09:30' : '11:00';
      const r = await desk.post('/api/appointments').send({ caseId, visits: [{ start: at(plusDays(f.monday, 1), time), end: at(plusDays(f.monday, 1), end), chairId: f.chair1, operatorId: f.operators[0] }] });
      expect(r.status).toBe(201);
    }
  });
  afterAll(async () => t?.close());

  const feedPath = (url: string) => new URL(url).pathname;

  it('serves an RFC 5545 calendar that ical.js reads, without names beyond initials', async () => {
    const admin = await t.as('admin');
    const issued = await admin.post(`/api/operators/${f.operators[0]}/feed-token`);
    expect(issued.status).toBe(201);
    expect(issued.body.url).toMatch(/\/api\/feeds\/[A-Za-z0-9_-]{32}\.ics$/);
    const res = await t.http().get(feedPath(issued.body.url));
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/^text\/calendar/);
    const text = res.text;
    // RFC 5545 §3.1: every content line ends in CRLF, no bare LF; lines are folded at 75 octets.
    expect(text.endsWith('\r\n') || text.endsWith('END:VCALENDAR')).toBe(true);
    expect(/[^\r]\n/.test(text)).toBe(false);
    const lines = text.split('\r\n').filter((l) => l.length > 0);
    for (const line of lines) expect(Buffer.byteLength(line, 'utf8')).toBeLessThanOrEqual(75);
    // The long location line had to be folded (a continuation line starts with one space).
    expect(lines.some((l) => l.startsWith(' '))).toBe(true);
    // RFC 5545 §3.7.3, §3.7.4: exactly one PRODID and one VERSION:2.0 in the calendar.
    expect(lines.filter((l) => l.startsWith('VERSION:'))).toEqual(['VERSION:2.0']);
    expect(lines.filter((l) => l.startsWith('PRODID:'))).toHaveLength(1);
    // Parsed by ical.js (the reference reader named in references.md).
    const cal = new ICAL.Component(ICAL.parse(text));
    const events = cal.getAllSubcomponents('vevent');
    expect(events).toHaveLength(2);
    const uids = new Set<string>();
    for (const e of events) {
      // RFC 5545 §3.6.1: each VEVENT has exactly one UID and one DTSTAMP (UTC).
      expect(e.getAllProperties('uid')).toHaveLength(1);
      expect(e.getAllProperties('dtstamp')).toHaveLength(1);
      expect((e.getFirstPropertyValue('dtstamp') as ICAL.Time).zone?.tzid).toBe('UTC');
      uids.add(String(e.getFirstPropertyValue('uid')));
      const summary = String(e.getFirstPropertyValue('summary'));
      expect(summary).toMatch(/^\d\d:\d\d Feedbay 1: tooth (36|11) initial treatment \(O\. F\.\)$/);
      expect(summary).not.toMatch(/Fenwright/);
    }
    expect(uids.size).toBe(2);
    const first = events.map((e) => new ICAL.Event(e)).sort((a, b) => a.startDate.compare(b.startDate))[0]!;
    expect(first.startDate.toJSDate().toISOString()).toBe(new Date(at(plusDays(f.monday, 1), '08:00')).toISOString());
    expect(first.summary.startsWith('08:00 ')).toBe(true);
  });

  it('is the operator’s or an administrator’s to issue, and stops working when revoked or renewed', async () => {
    const endo = await t.as('endodontist');
    expect((await endo.post(`/api/operators/${f.operators[0]}/feed-token`)).status).toBe(404);
    expect((await (await t.as('frontdesk')).post(`/api/operators/${f.operators[0]}/feed-token`)).status).toBe(403);
    const login = await t.http().post('/api/auth/login').send({ email: f.operatorEmails[0], password: OP_PASSWORD });
    const self = await t.http().post(`/api/operators/${f.operators[0]}/feed-token`).set('Authorization', `Bearer ${login.body.accessToken}`);
    expect(self.status).toBe(201);
    expect((await t.http().get(feedPath(self.body.url))).status).toBe(200);
    const renewed = await (await t.as('admin')).post(`/api/operators/${f.operators[0]}/feed-token`);
    expect((await t.http().get(feedPath(self.body.url))).status).toBe(404);
    expect((await t.http().get(feedPath(renewed.body.url))).status).toBe(200);
    const revoked = await request(t.app.getHttpServer()).delete(`/api/operators/${f.operators[0]}/feed-token`).set('Authorization', `Bearer ${login.body.accessToken}`);
    expect(revoked.status).toBe(204);
    expect((await t.http().get(feedPath(renewed.body.url))).status).toBe(404);
    expect((await t.http().get('/api/feeds/not-a-token.ics')).status).toBe(404);
  });
});
