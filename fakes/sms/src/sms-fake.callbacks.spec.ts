// Status callbacks and played replies: each request the fake makes must validate with the official
// SDK's validateRequest (references.md: Twilio request validation, the published scheme).
import twilio from 'twilio';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { sdkClient, startReceiver, type Receiver } from './spec-support.js';
import { startSmsFake, type SmsFake } from './sms-fake.js';

const SID = 'AC00000000000000000000000000000000';
const TOKEN = 'local-fake-auth-token';
const OUR = '+12025550199';
const PATIENT = '+12025550142';

let fake: SmsFake;
let app: Receiver;
let client: twilio.Twilio;
let inboundUrl: string;

async function control(method: string, path: string, body?: unknown) {
  const res = await fetch(fake.url + path, { method, headers: { 'Content-Type': 'application/json' }, body: body === undefined ? undefined : JSON.stringify(body) });
  const text = await res.text();
  return { status: res.status, json: text ? JSON.parse(text) : null };
}

beforeAll(async () => {
  app = await startReceiver();
  inboundUrl = `${app.url}/api/sms/inbound`;
  fake = await startSmsFake({ accountSid: SID, authToken: TOKEN, statusDelayMs: 10, inboundUrl });
  client = sdkClient(fake.url, SID, TOKEN);
});
afterEach(async () => {
  await fake.settled();
  fake.reset();
  app.received.length = 0;
  app.answer(204);
});
afterAll(async () => {
  await fake.close();
  await app.close();
});

describe('status callbacks', () => {
  it('walks queued → sent → delivered and posts each step, signed over the callback URL exactly as given', async () => {
    const callbackUrl = `${app.url}/api/sms/status?row=42&note=a%20b`;
    const m = await client.messages.create({ to: PATIENT, from: OUR, body: 'See you Tuesday', statusCallback: callbackUrl });
    await fake.settled();
    expect(app.received.map((r) => r.params.MessageStatus)).toEqual(['sent', 'delivered']);
    for (const r of app.received) {
      expect(r.path).toBe('/api/sms/status?row=42&note=a%20b');
      expect(r.contentType).toMatch(/^application\/x-www-form-urlencoded/);
      expect(r.params).toEqual({
        MessageSid: m.sid,
        MessageStatus: r.params.MessageStatus,
        SmsSid: m.sid,
        SmsStatus: r.params.MessageStatus,
        AccountSid: SID,
        From: OUR,
        To: PATIENT,
        ApiVersion: '2010-04-01',
      });
      // references.md: Twilio request validation — the SDK is the judge of the signature.
      expect(twilio.validateRequest(TOKEN, r.signature, callbackUrl, r.params)).toBe(true);
      expect(twilio.validateRequest('another-token', r.signature, callbackUrl, r.params)).toBe(false);
      expect(twilio.validateRequest(TOKEN, r.signature, callbackUrl, { ...r.params, MessageStatus: 'failed' })).toBe(false);
    }
    const [rec] = fake.messages();
    expect(rec.history.map((h) => h.status)).toEqual(['queued', 'sent', 'delivered']);
    expect(rec.callbacks.map((c) => [c.status, c.httpStatus])).toEqual([['sent', 204], ['delivered', 204]]);
    expect(rec.dateSent).not.toBeNull();
    expect(fake.stats()).toMatchObject({ accepted: 1, byStatus: { delivered: 1 }, callbacks: { sent: 2, answered2xx: 2, failed: 0 } });
  });

  it('ends a failing number undelivered with ErrorCode 30003 (set through POST /fake/numbers/failing)', async () => {
    expect((await control('POST', '/fake/numbers/failing', { numbers: [PATIENT] })).status).toBe(200);
    const callbackUrl = `${app.url}/api/sms/status`;
    const m = await client.messages.create({ to: PATIENT, from: OUR, body: 'x', statusCallback: callbackUrl });
    await fake.settled();
    expect(app.received.map((r) => [r.params.MessageStatus, r.params.ErrorCode])).toEqual([['sent', undefined], ['undelivered', '30003']]);
    for (const r of app.received) expect(twilio.validateRequest(TOKEN, r.signature, callbackUrl, r.params)).toBe(true);
    const got = await client.messages(m.sid).fetch();
    expect(got).toMatchObject({ status: 'undelivered', errorCode: 30003, errorMessage: 'Unreachable destination handset' });
    // Other numbers still get through.
    await client.messages.create({ to: '+12025550143', from: OUR, body: 'x' });
    await fake.settled();
    expect(fake.messages({ to: '+12025550143' })[0].status).toBe('delivered');
  });

  it('can end a failing number failed straight from queued', async () => {
    fake.setFailingNumbers([PATIENT], 'failed');
    await client.messages.create({ to: PATIENT, from: OUR, body: 'x', statusCallback: `${app.url}/s` });
    await fake.settled();
    expect(fake.messages()[0].history.map((h) => [h.status, h.errorCode])).toEqual([['queued', null], ['failed', 30003]]);
    expect(app.received.map((r) => r.params.ErrorCode)).toEqual(['30003']);
    expect((await control('POST', '/fake/numbers/failing', { numbers: ['555-0142'] })).json.errors[0].field).toBe('numbers');
  });

  it('records the HTTP status a callback got, and a callback that could not be delivered', async () => {
    app.answer(500, 'nope');
    await client.messages.create({ to: PATIENT, from: OUR, body: 'x', statusCallback: `${app.url}/api/sms/status` });
    await client.messages.create({ to: PATIENT, from: OUR, body: 'y', statusCallback: 'http://127.0.0.1:1/closed' });
    await fake.settled();
    const [a, b] = fake.messages();
    expect(a.callbacks.map((c) => c.httpStatus)).toEqual([500, 500]);
    expect(b.callbacks.map((c) => c.httpStatus)).toEqual([null, null]);
    expect(b.callbacks[0].error).toMatch(/ECONNREFUSED/);
    expect(fake.stats().callbacks).toEqual({ sent: 4, answered2xx: 0, failed: 4 });
  });
});

describe('played replies (POST /fake/reply)', () => {
  it('posts the inbound webhook form, signed over the inbound URL, that the SDK validates', async () => {
    await client.messages.create({ to: PATIENT, from: '+12025550198', body: 'Reply C to confirm' });
    app.answer(200, '<?xml version="1.0" encoding="UTF-8"?><Response></Response>', 'text/xml');
    const { status, json } = await control('POST', '/fake/reply', { from: PATIENT, body: 'C' });
    expect(status).toBe(200);
    expect(json).toMatchObject({ status: 200, body: '<?xml version="1.0" encoding="UTF-8"?><Response></Response>' });
    expect(app.received).toHaveLength(1);
    const hook = app.received[0];
    expect(hook.path).toBe('/api/sms/inbound');
    expect(twilio.validateRequest(TOKEN, hook.signature, inboundUrl, hook.params)).toBe(true);
    expect(hook.params).toMatchObject({
      From: PATIENT,
      To: '+12025550198', // the last number we sent from
      Body: 'C',
      AccountSid: SID,
      NumMedia: '0',
      NumSegments: '1',
      SmsStatus: 'received',
      ApiVersion: '2010-04-01',
      FromCountry: 'US',
      ToCountry: 'US',
    });
    expect(hook.params.MessageSid).toMatch(/^SM[0-9a-f]{32}$/);
    expect(hook.params.SmsSid).toBe(hook.params.MessageSid);
    expect(hook.params.SmsMessageSid).toBe(hook.params.MessageSid);
    expect(hook.params).not.toHaveProperty('MessagingServiceSid');
    expect(json.sid).toBe(hook.params.MessageSid);
    // Recorded as part of the conversation.
    const inbound = fake.messages({ direction: 'inbound' });
    expect(inbound).toHaveLength(1);
    expect(inbound[0]).toMatchObject({ sid: hook.params.MessageSid, from: PATIENT, to: '+12025550198', body: 'C', status: 'received', webhook: { httpStatus: 200, signedWith: 'account' } });
    expect(fake.stats().inbound).toBe(1);
  });

  it('sends a wrongly signed webhook when asked (signWith), which the SDK refuses', async () => {
    app.answer(403, 'forbidden');
    const r = await fake.reply({ from: PATIENT, body: 'STOP', signWith: 'some-other-token' });
    expect(r.status).toBe(403);
    const hook = app.received[0];
    expect(twilio.validateRequest(TOKEN, hook.signature, inboundUrl, hook.params)).toBe(false);
    expect(twilio.validateRequest('some-other-token', hook.signature, inboundUrl, hook.params)).toBe(true);
    expect(fake.messages()[0].webhook).toMatchObject({ httpStatus: 403, signedWith: 'other' });
  });

  it('uses the request’s url and to when given, and defaultTo before anything was sent', async () => {
    const url = `${app.url}/elsewhere?x=1`;
    await fake.reply({ from: PATIENT, body: 'hello', url, to: '+12025550197' });
    await fake.reply({ from: PATIENT, body: 'again' });
    const [first, second] = app.received;
    expect(first.path).toBe('/elsewhere?x=1');
    expect(first.params.To).toBe('+12025550197');
    expect(twilio.validateRequest(TOKEN, first.signature, url, first.params)).toBe(true);
    expect(second.params.To).toBe(OUR);
  });

  it('sends the <Message> replies of a markup answer back to the patient, like the real service', async () => {
    app.answer(200, '<Response><Message>Thanks &amp; see you — Quillfern</Message></Response>', 'text/xml');
    await fake.reply({ from: PATIENT, body: 'C' });
    await fake.settled();
    const out = fake.messages({ direction: 'outbound-reply' });
    expect(out).toHaveLength(1);
    expect(out[0]).toMatchObject({ from: OUR, to: PATIENT, body: 'Thanks & see you — Quillfern', status: 'delivered' });
  });

  it('refuses bad replies with 400 naming the field, and reports an unreachable webhook as 502', async () => {
    expect((await control('POST', '/fake/reply', { body: 'C' })).json.errors[0].field).toBe('from');
    expect((await control('POST', '/fake/reply', { from: PATIENT })).json.errors[0].field).toBe('body');
    expect((await control('POST', '/fake/reply', { from: PATIENT, body: 'C', colour: 'teal' })).json.errors[0].field).toBe('colour');
    expect((await control('POST', '/fake/reply', { from: PATIENT, body: 'C', url: 'ftp://x' })).json.errors[0].field).toBe('url');
    const broken = await fetch(`${fake.url}/fake/reply`, { method: 'POST', body: '{nope' });
    expect(broken.status).toBe(400);
    const unreachable = await control('POST', '/fake/reply', { from: PATIENT, body: 'C', url: 'http://127.0.0.1:1/api/sms/inbound' });
    expect(unreachable.status).toBe(502);
    expect(unreachable.json.message).toMatch(/ECONNREFUSED/);
    const noUrl = await startSmsFake();
    try {
      const r = await fetch(`${noUrl.url}/fake/reply`, { method: 'POST', body: JSON.stringify({ from: PATIENT, body: 'C' }) });
      expect(r.status).toBe(400);
      expect(((await r.json()) as { errors: Array<{ field: string }> }).errors[0].field).toBe('url');
    } finally {
      await noUrl.close();
    }
  });
});

describe('control API and page', () => {
  it('GET /fake/messages lists every message with history and callbacks, filtered by ?to=; DELETE forgets them', async () => {
    await client.messages.create({ to: PATIENT, from: OUR, body: 'a', statusCallback: `${app.url}/s` });
    await client.messages.create({ to: '+12025550143', from: OUR, body: 'b' });
    await fake.settled();
    const all = await control('GET', '/fake/messages');
    expect(all.json.map((m: { body: string }) => m.body)).toEqual(['a', 'b']);
    const mine = await control('GET', `/fake/messages?to=${encodeURIComponent(PATIENT)}`);
    expect(mine.json).toHaveLength(1);
    expect(mine.json[0].history.map((h: { status: string }) => h.status)).toEqual(['queued', 'sent', 'delivered']);
    expect(mine.json[0].callbacks).toHaveLength(2);
    expect((await control('GET', '/fake/stats')).json).toMatchObject({ accepted: 2, refused: 0, byStatus: { delivered: 2 } });
    expect((await control('DELETE', '/fake/messages')).status).toBe(204);
    expect((await control('GET', '/fake/messages')).json).toEqual([]);
    expect((await control('GET', '/fake/stats')).json).toMatchObject({ accepted: 0, byStatus: {} });
  });

  it('forgetting messages cancels their pending status steps', async () => {
    const slowFake = await startSmsFake({ statusDelayMs: 60_000 });
    try {
      const c = sdkClient(slowFake.url, SID, TOKEN);
      await c.messages.create({ to: PATIENT, from: OUR, body: 'x', statusCallback: `${app.url}/s` });
      slowFake.reset();
      await slowFake.settled(); // would wait a minute if the step were still pending
      expect(slowFake.messages()).toEqual([]);
      expect(app.received).toEqual([]);
    } finally {
      await slowFake.close();
    }
  });

  it('serves its page saying it is a development stand-in and nothing leaves the machine', async () => {
    const res = await fetch(fake.url + '/');
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/text\/html/);
    const html = await res.text();
    expect(html).toContain('Ostium SMS stand-in');
    expect(html).toContain('Development stand-in.');
    expect(html).toContain('Nothing leaves this machine');
    expect((await control('GET', '/fake/info')).json).toMatchObject({ accountSid: SID, inboundUrl, statusDelayMs: 10 });
  });
});
