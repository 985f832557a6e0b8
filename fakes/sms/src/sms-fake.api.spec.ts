// The fake's REST API, driven by the official twilio SDK where it can be (the SDK is the outside
// reference for the wire shape: what it sends and what it can read back).
import { request } from 'node:http';
import twilio from 'twilio';
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { sdkClient } from './spec-support.js';
import { startSmsFake, type SmsFake } from './sms-fake.js';

const SID = 'AC00000000000000000000000000000000';
const TOKEN = 'local-fake-auth-token';
const OUR = '+12025550199';
const PATIENT = '+12025550142';
const OTHER = '+12025550143';

let fake: SmsFake;
let client: twilio.Twilio;
const base = () => `${fake.url}/2010-04-01/Accounts/${SID}`;
const basic = (user: string, pass: string) => 'Basic ' + Buffer.from(`${user}:${pass}`).toString('base64');

async function rawSend(form: Record<string, string>, auth = basic(SID, TOKEN), sid = SID) {
  const res = await fetch(`${fake.url}/2010-04-01/Accounts/${sid}/Messages.json`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/x-www-form-urlencoded', ...(auth ? { Authorization: auth } : {}) },
    body: new URLSearchParams(form).toString(),
  });
  return { status: res.status, json: (await res.json()) as Record<string, unknown> };
}

async function sdkError(p: Promise<unknown>): Promise<{ status: number; code: number; message: string; moreInfo: string }> {
  const e = (await p.then(() => null, (err: unknown) => err)) as { status: number; code: number; message: string; moreInfo: string } | null;
  if (!e) throw new Error('expected the SDK call to fail');
  return e;
}

beforeAll(async () => {
  fake = await startSmsFake({ accountSid: SID, authToken: TOKEN, statusDelayMs: 10 });
  client = sdkClient(fake.url, SID, TOKEN);
});
afterEach(async () => {
  await fake.settled();
  fake.reset();
});
afterAll(() => fake.close());

describe('sending through the SDK', () => {
  it('accepts a message and answers with the Message resource', async () => {
    const m = await client.messages.create({ to: PATIENT, from: OUR, body: 'Quillfern Endodontics: see you Tue 9:00. Reply C to confirm, STOP to opt out.' });
    expect(m.sid).toMatch(/^SM[0-9a-f]{32}$/);
    expect(m).toMatchObject({ accountSid: SID, to: PATIENT, from: OUR, status: 'queued', numSegments: '1', numMedia: '0', direction: 'outbound-api', apiVersion: '2010-04-01', price: null, errorCode: null, errorMessage: null });
    expect(m.uri).toBe(`/2010-04-01/Accounts/${SID}/Messages/${m.sid}.json`);
    expect(m.subresourceUris).toEqual({ media: `/2010-04-01/Accounts/${SID}/Messages/${m.sid}/Media.json`, feedback: `/2010-04-01/Accounts/${SID}/Messages/${m.sid}/Feedback.json` });
    // The SDK parses the RFC 2822 dates into Dates.
    expect(m.dateCreated).toBeInstanceOf(Date);
    expect(Math.abs(m.dateCreated.getTime() - Date.now())).toBeLessThan(60_000);
    expect(fake.messages()).toHaveLength(1);
    expect(fake.messages()[0]).toMatchObject({ sid: m.sid, to: PATIENT, from: OUR, direction: 'outbound-api' });
  });

  it('writes the dates in RFC 2822 with a +0000 zone and the counts as strings, like the real API', async () => {
    const { status, json } = await rawSend({ To: PATIENT, From: OUR, Body: 'x' });
    expect(status).toBe(201);
    expect(json.date_created).toMatch(/^(Mon|Tue|Wed|Thu|Fri|Sat|Sun), \d{2} [A-Z][a-z]{2} \d{4} \d{2}:\d{2}:\d{2} \+0000$/);
    expect(json.date_sent).toBeNull();
    expect(json.num_segments).toBe('1');
    expect(Object.keys(json).sort()).toEqual(
      ['account_sid', 'api_version', 'body', 'date_created', 'date_sent', 'date_updated', 'direction', 'error_code', 'error_message', 'from', 'messaging_service_sid', 'num_media', 'num_segments', 'price', 'price_unit', 'sid', 'status', 'subresource_uris', 'to', 'uri'],
    );
  });

  it('counts segments by encoding, not by string length', async () => {
    const long = await client.messages.create({ to: PATIENT, from: OUR, body: 'a'.repeat(161) });
    expect(long.numSegments).toBe('2');
    const accented = await client.messages.create({ to: PATIENT, from: OUR, body: 'é'.repeat(160) }); // é is GSM-7
    expect(accented.numSegments).toBe('1');
    const curly = await client.messages.create({ to: PATIENT, from: OUR, body: '’'.repeat(71) }); // UCS-2
    expect(curly.numSegments).toBe('2');
  });

  it('accepts a messaging service instead of From and sends from the practice number', async () => {
    const m = await client.messages.create({ to: PATIENT, messagingServiceSid: 'MG' + '0'.repeat(32), body: 'hello' });
    expect(m.messagingServiceSid).toBe('MG' + '0'.repeat(32));
    expect(m.from).toBe(OUR);
  });

  it('lists with To/From filters, newest first, following next_page_uri across pages', async () => {
    const a = await client.messages.create({ to: PATIENT, from: OUR, body: 'one' });
    const b = await client.messages.create({ to: OTHER, from: OUR, body: 'two' });
    const c = await client.messages.create({ to: PATIENT, from: OUR, body: 'three' });
    const d = await client.messages.create({ to: PATIENT, from: OUR, body: 'four' });
    expect((await client.messages.list({ to: PATIENT })).map((m) => m.sid)).toEqual([d.sid, c.sid, a.sid]);
    expect((await client.messages.list({ to: OTHER })).map((m) => m.body)).toEqual(['two']);
    expect((await client.messages.list({ from: OUR })).map((m) => m.sid)).toEqual([d.sid, c.sid, b.sid, a.sid]);
    // Page size 2: the SDK needs the second page through next_page_uri to reach three.
    expect((await client.messages.list({ to: PATIENT, pageSize: 2, limit: 3 })).map((m) => m.sid)).toEqual([d.sid, c.sid, a.sid]);
    expect(await client.messages.list({ to: '+12025550199' })).toEqual([]);
  });

  it('answers a list request with the real envelope', async () => {
    for (const body of ['1', '2', '3']) await client.messages.create({ to: PATIENT, from: OUR, body });
    const res = await fetch(`${base()}/Messages.json?To=${encodeURIComponent(PATIENT)}&PageSize=2`, { headers: { Authorization: basic(SID, TOKEN) } });
    const page = (await res.json()) as Record<string, unknown>;
    expect(Object.keys(page).sort()).toEqual(['end', 'first_page_uri', 'messages', 'next_page_uri', 'page', 'page_size', 'previous_page_uri', 'start', 'uri']);
    expect(page).toMatchObject({ page: 0, page_size: 2, start: 0, end: 1, previous_page_uri: null });
    expect(page.uri).toBe(`/2010-04-01/Accounts/${SID}/Messages.json?To=${encodeURIComponent(PATIENT)}&PageSize=2`);
    expect(page.next_page_uri).toBe(`/2010-04-01/Accounts/${SID}/Messages.json?To=%2B12025550142&PageSize=2&Page=1`);
    expect((page.messages as unknown[]).length).toBe(2);
    const second = (await (await fetch(fake.url + String(page.next_page_uri), { headers: { Authorization: basic(SID, TOKEN) } })).json()) as Record<string, unknown>;
    expect(second).toMatchObject({ page: 1, start: 2, end: 2, next_page_uri: null });
    expect(second.previous_page_uri).toBe(`/2010-04-01/Accounts/${SID}/Messages.json?To=%2B12025550142&PageSize=2&Page=0`);
  });

  it('fetches one message and follows its status; an unknown sid is 404 code 20404', async () => {
    const m = await client.messages.create({ to: PATIENT, from: OUR, body: 'fetch me' });
    await fake.settled();
    const got = await client.messages(m.sid).fetch();
    expect(got).toMatchObject({ sid: m.sid, body: 'fetch me', status: 'delivered' });
    expect(got.dateSent).toBeInstanceOf(Date);
    const e = await sdkError(client.messages('SM' + 'f'.repeat(32)).fetch());
    // Provider error codes from memory (see the fake's ERR table).
    expect(e).toMatchObject({ status: 404, code: 20404 });
  });
});

describe('refusals', () => {
  it('refuses missing or wrong Basic credentials with 401 code 20003 in the provider’s error shape', async () => {
    const none = await rawSend({ To: PATIENT, From: OUR, Body: 'x' }, '');
    expect(none.status).toBe(401);
    expect(none.json).toEqual({ code: 20003, message: 'Authenticate', more_info: 'https://www.twilio.com/docs/errors/20003', status: 401 });
    expect((await rawSend({ To: PATIENT, From: OUR, Body: 'x' }, basic(SID, 'wrong'))).status).toBe(401);
    expect((await rawSend({ To: PATIENT, From: OUR, Body: 'x' }, 'Bearer abc')).status).toBe(401);
    const wrong = sdkClient(fake.url, SID, 'not-the-token');
    expect(await sdkError(wrong.messages.create({ to: PATIENT, from: OUR, body: 'x' }))).toMatchObject({ status: 401, code: 20003 });
    expect(await sdkError(wrong.messages.list())).toMatchObject({ status: 401, code: 20003 });
    expect(fake.messages()).toEqual([]);
    expect(fake.stats()).toMatchObject({ accepted: 0, refused: 4, refusedBy: { auth: 4 } });
  });

  it('refuses an account sid in the path that is not the authenticated one', async () => {
    const other = 'AC' + '1'.repeat(32);
    const r = await rawSend({ To: PATIENT, From: OUR, Body: 'x' }, basic(SID, TOKEN), other);
    expect(r.status).toBe(401);
    expect(r.json.code).toBe(20003);
    const list = await fetch(`${fake.url}/2010-04-01/Accounts/${other}/Messages.json`, { headers: { Authorization: basic(SID, TOKEN) } });
    expect(list.status).toBe(401);
  });

  it('answers missing fields with the provider’s 400 codes (from memory) and records nothing', async () => {
    const cases: Array<[Record<string, string>, number]> = [
      [{ From: OUR, Body: 'x' }, 21604],
      [{ To: PATIENT, From: OUR }, 21602],
      [{ To: PATIENT, Body: 'x' }, 21603],
      [{ To: '2025550142', From: OUR, Body: 'x' }, 21211],
      [{ To: PATIENT, From: OUR, Body: 'x'.repeat(1601) }, 21617],
      [{ To: PATIENT, From: OUR, Body: 'x', StatusCallback: 'not a url' }, 21609],
    ];
    for (const [form, code] of cases) {
      const r = await rawSend(form);
      expect(r.status, JSON.stringify(form)).toBe(400);
      expect(r.json).toMatchObject({ code, status: 400, more_info: `https://www.twilio.com/docs/errors/${code}` });
      expect(typeof r.json.message).toBe('string');
    }
    expect(fake.messages()).toEqual([]);
    expect(fake.stats().refusedBy.invalid).toBe(cases.length);
  });

  it('answers other methods with 405 and unknown paths with 404, both in the error shape', async () => {
    const del = await fetch(`${base()}/Messages.json`, { method: 'DELETE', headers: { Authorization: basic(SID, TOKEN) } });
    expect(del.status).toBe(405);
    expect(((await del.json()) as { code: number }).code).toBe(20004);
    const nowhere = await fetch(`${base()}/Calls.json`, { headers: { Authorization: basic(SID, TOKEN) } });
    expect(nowhere.status).toBe(404);
    expect(((await nowhere.json()) as { code: number }).code).toBe(20404);
  });
});

describe('faults', () => {
  it('http500: answers 500 in the error shape, records nothing, and ends after `count` requests', async () => {
    fake.setFault({ mode: 'http500', count: 2 });
    for (let i = 0; i < 2; i++) expect(await sdkError(client.messages.create({ to: PATIENT, from: OUR, body: 'x' }))).toMatchObject({ status: 500, code: 20500 });
    expect(fake.messages()).toEqual([]);
    const ok = await client.messages.create({ to: PATIENT, from: OUR, body: 'third time' });
    expect(ok.status).toBe('queued');
    expect(fake.stats()).toMatchObject({ accepted: 1, refused: 2, refusedBy: { http500: 2 } });
    expect(fake.fault()).toBeNull();
  });

  it('a fault set through POST /fake/faults for forMs ends by itself', async () => {
    const res = await fetch(`${fake.url}/fake/faults`, { method: 'POST', headers: { 'Content-Type': 'application/json' }, body: JSON.stringify({ mode: 'http500', forMs: 150 }) });
    expect(res.status).toBe(200);
    expect(((await res.json()) as { fault: { mode: string; until: string } }).fault).toMatchObject({ mode: 'http500', remaining: null });
    expect((await rawSend({ To: PATIENT, From: OUR, Body: 'x' })).status).toBe(500);
    await vi.waitFor(() => expect(fake.fault()).toBeNull(), { timeout: 5000, interval: 25 });
    expect((await rawSend({ To: PATIENT, From: OUR, Body: 'x' })).status).toBe(201);
  });

  it('DELETE /fake/faults clears a fault; mode none clears too; a bad mode is 400 naming the field', async () => {
    fake.setFault({ mode: 'http500' });
    expect((await fetch(`${fake.url}/fake/faults`, { method: 'DELETE' })).status).toBe(204);
    expect((await rawSend({ To: PATIENT, From: OUR, Body: 'x' })).status).toBe(201);
    fake.setFault({ mode: 'http500' });
    expect(fake.setFault({ mode: 'none' })).toBeNull();
    expect((await rawSend({ To: PATIENT, From: OUR, Body: 'x' })).status).toBe(201);
    const bad = await fetch(`${fake.url}/fake/faults`, { method: 'POST', headers: { 'Content-Type': 'application/json' }, body: JSON.stringify({ mode: 'explode' }) });
    expect(bad.status).toBe(400);
    expect(((await bad.json()) as { errors: Array<{ field: string }> }).errors[0].field).toBe('mode');
    const badCount = await fetch(`${fake.url}/fake/faults`, { method: 'POST', body: JSON.stringify({ mode: 'slow', count: 0 }) });
    expect(((await badCount.json()) as { errors: Array<{ field: string }> }).errors[0].field).toBe('count');
  });

  it('slow: records the message first, then answers after delayMs', async () => {
    fake.setFault({ mode: 'slow', count: 1, delayMs: 1500 });
    let answered = false;
    const sending = client.messages.create({ to: PATIENT, from: OUR, body: 'slowly' }).then((m) => {
      answered = true;
      return m;
    });
    await vi.waitFor(() => expect(fake.messages()).toHaveLength(1), { timeout: 5000, interval: 20 });
    expect(answered).toBe(false);
    const m = await sending;
    expect(m.sid).toBe(fake.messages()[0].sid);
    expect(m.status).toBe('queued');
  });

  it('timeout: reads the request, never answers, records nothing; the SDK gives up on its own timeout', async () => {
    fake.setFault({ mode: 'timeout', count: 1 });
    const slowClient = sdkClient(fake.url, SID, TOKEN, 300);
    const e = await slowClient.messages.create({ to: PATIENT, from: OUR, body: 'lost' }).then(() => null, (err: Error & { code?: string }) => err);
    expect(e?.message).toMatch(/timeout/i);
    expect(fake.messages()).toEqual([]);
    expect(fake.stats()).toMatchObject({ accepted: 0, refused: 1, refusedBy: { timeout: 1 } });
    // The count is used up: the retry goes through.
    expect((await slowClient.messages.create({ to: PATIENT, from: OUR, body: 'retry' })).status).toBe('queued');
  });

  it('timeout: the held connection is closed when the fault ends (forMs), still without an answer', async () => {
    fake.setFault({ mode: 'timeout', forMs: 200 });
    const outcome = await new Promise<string>((resolve) => {
      const req = request(`${base()}/Messages.json`, { method: 'POST', headers: { Authorization: basic(SID, TOKEN), 'Content-Type': 'application/x-www-form-urlencoded' } }, (res) => resolve(`answered ${res.statusCode}`));
      req.on('error', (err: NodeJS.ErrnoException) => resolve(`closed ${err.code ?? err.message}`));
      req.end(new URLSearchParams({ To: PATIENT, From: OUR, Body: 'held' }).toString());
    });
    expect(outcome).toBe('closed ECONNRESET');
    expect(fake.messages()).toEqual([]);
  });

  it('timeout: close() releases held connections', async () => {
    const own = await startSmsFake({ statusDelayMs: 10 });
    own.setFault({ mode: 'timeout' });
    const outcome = new Promise<string>((resolve) => {
      const req = request(`${own.url}/2010-04-01/Accounts/${SID}/Messages.json`, { method: 'POST', headers: { Authorization: basic(SID, TOKEN) } }, () => resolve('answered'));
      req.on('error', () => resolve('closed'));
      req.end('To=%2B12025550142&From=%2B12025550199&Body=x');
    });
    await vi.waitFor(() => expect(own.fault()?.hits).toBe(1), { timeout: 5000, interval: 20 });
    await own.close();
    expect(await outcome).toBe('closed');
  });
});
