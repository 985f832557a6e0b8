import { createServer, type IncomingMessage, type Server } from 'node:http';
import { afterEach, describe, expect, it } from 'vitest';
import { loadConfig } from '../config/configuration.js';
import { classifySmsError, SmsSenderService } from './sms-sender.service.js';
import { createTwilioClient, rebaseProviderUrl, TEXTS_OFF_REASON } from './twilio-client.util.js';

interface Seen {
  method: string;
  url: string;
  auth: string | undefined;
  body: URLSearchParams;
}

/** A local HTTP server standing in for the provider: records each request, answers like a created message. */
async function provider(answer: 'created' | 'never'): Promise<{ server: Server; base: string; seen: Seen[] }> {
  const seen: Seen[] = [];
  const server = createServer((req: IncomingMessage, res) => {
    let text = '';
    req.on('data', (c) => (text += c));
    req.on('end', () => {
      seen.push({ method: req.method!, url: req.url!, auth: req.headers.authorization, body: new URLSearchParams(text) });
      if (answer === 'never') return;
      res.writeHead(201, { 'Content-Type': 'application/json' });
      res.end(JSON.stringify({ sid: 'SM0123456789abcdef0123456789abcdef', status: 'queued', to: '+12025550142', body: 'hi' }));
    });
  });
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
  const { port } = server.address() as { port: number };
  return { server, base: `http://127.0.0.1:${port}`, seen };
}

describe('twilio client', () => {
  let server: Server | null = null;
  afterEach(async () => {
    server?.closeAllConnections();
    await new Promise((r) => server?.close(r) ?? r(null));
    server = null;
  });

  it("rewrites only the provider's origin, keeps path and query, and refuses any other host", () => {
    expect(rebaseProviderUrl('https://api.twilio.com/2010-04-01/Accounts/AC1/Messages.json?To=%2B1', 'http://127.0.0.1:4011/')).toBe(
      'http://127.0.0.1:4011/2010-04-01/Accounts/AC1/Messages.json?To=%2B1',
    );
    expect(rebaseProviderUrl('https://api.sydney.au1.twilio.com/2010-04-01/x', 'http://127.0.0.1:4011')).toBe('http://127.0.0.1:4011/2010-04-01/x');
    expect(() => rebaseProviderUrl('https://api.twilio.com.example.com/2010-04-01/x', 'http://127.0.0.1:4011')).toThrow(/refusing to send/);
    expect(() => rebaseProviderUrl('https://tls-test.twilio.com:443', 'http://127.0.0.1:4011')).toThrow(/refusing to send/);
  });

  it('has no client at all outside production without TWILIO_API_BASE, and says why', async () => {
    for (const env of ['test', 'development']) {
      const handle = createTwilioClient(loadConfig({ NODE_ENV: env, TWILIO_API_BASE: '' }));
      expect(handle).toEqual({ client: null, disabledReason: TEXTS_OFF_REASON });
    }
    expect(TEXTS_OFF_REASON).toBe('TWILIO_API_BASE is not set; texts are off outside production');
    const sut = new SmsSenderService(loadConfig({ NODE_ENV: 'test' }), createTwilioClient(loadConfig({ NODE_ENV: 'test' })));
    expect(await sut.send({ to: '+12025550142', body: 'hi' })).toEqual({ ok: false, kind: 'permanent', reason: TEXTS_OFF_REASON });
    await expect(sut.findSent({ to: '+12025550142', body: 'hi', since: new Date() })).rejects.toThrow(TEXTS_OFF_REASON);
    // In production without a base the SDK talks to the real API (not called here).
    expect(createTwilioClient(loadConfig({ NODE_ENV: 'production', JWT_SECRET: 's', TWILIO_AUTH_TOKEN: 't' })).client).not.toBeNull();
  });

  it("sends through the unchanged SDK to TWILIO_API_BASE: the provider's path, Basic auth and form fields", async () => {
    const p = await provider('created');
    server = p.server;
    const config = loadConfig({ NODE_ENV: 'test', TWILIO_API_BASE: p.base, TWILIO_ACCOUNT_SID: 'AC00000000000000000000000000000042', TWILIO_AUTH_TOKEN: 'tok', PUBLIC_URL: 'https://desk.quillfern-endo.test' });
    const sut = new SmsSenderService(config, createTwilioClient(config));
    const r = await sut.send({ to: '+12025550142', body: 'hi' });
    expect(r).toEqual({ ok: true, providerId: 'SM0123456789abcdef0123456789abcdef', providerStatus: 'queued' });
    // references.md: POST /2010-04-01/Accounts/{AccountSid}/Messages.json with To, From, Body; HTTP Basic auth.
    expect(p.seen).toHaveLength(1);
    expect(p.seen[0]!.method).toBe('POST');
    expect(p.seen[0]!.url).toBe('/2010-04-01/Accounts/AC00000000000000000000000000000042/Messages.json');
    expect(p.seen[0]!.auth).toBe(`Basic ${Buffer.from('AC00000000000000000000000000000042:tok').toString('base64')}`);
    expect(Object.fromEntries(p.seen[0]!.body)).toEqual({ To: '+12025550142', From: config.sms.fromNumber, Body: 'hi', StatusCallback: 'https://desk.quillfern-endo.test/api/sms/status' });
  });

  it('gives up after MESSAGING_SEND_TIMEOUT_MS and reports the outcome as unknown', async () => {
    const p = await provider('never');
    server = p.server;
    const config = loadConfig({ NODE_ENV: 'test', TWILIO_API_BASE: p.base, MESSAGING_SEND_TIMEOUT_MS: '300' });
    const sut = new SmsSenderService(config, createTwilioClient(config));
    const r = await sut.send({ to: '+12025550142', body: 'hi' });
    expect(r).toEqual({ ok: false, kind: 'unknown', reason: 'the text provider did not answer within 0.3 s; checking whether it went before trying again' });
    expect(p.seen).toHaveLength(1);
  });
});

describe('classifySmsError', () => {
  const rest = (status: number, code?: number, message = 'x') => Object.assign(new Error(message), { status, code });

  it('retries 5xx, 429 and unreachable providers; gives up on 4xx with the code in words', () => {
    expect(classifySmsError(rest(500, 20500), 15_000)).toEqual({ kind: 'retryable', reason: 'the text provider had a problem (HTTP 500); will try again' });
    expect(classifySmsError(rest(503), 15_000).kind).toBe('retryable');
    expect(classifySmsError(rest(429, 20429), 15_000)).toEqual({ kind: 'retryable', reason: 'the text provider is rate-limiting us (error 20429); will try again' });
    // Provider error codes from memory (the provider's error dictionary).
    expect(classifySmsError(rest(400, 21211), 15_000)).toEqual({ kind: 'permanent', reason: 'the number is not a valid phone number (error 21211)' });
    expect(classifySmsError(rest(400, 21610), 15_000)).toEqual({ kind: 'permanent', reason: 'the patient has opted out of texts from our number (replied STOP) (error 21610)' });
    expect(classifySmsError(rest(401, 20003), 15_000)).toEqual({ kind: 'permanent', reason: 'the text provider did not accept our account credentials (error 20003)' });
    expect(classifySmsError(rest(400, 99999, 'Something odd'), 15_000)).toEqual({ kind: 'permanent', reason: 'the text provider refused the text: Something odd (error 99999)' });
    expect(classifySmsError(Object.assign(new Error('connect ECONNREFUSED 127.0.0.1:4011'), { code: 'ECONNREFUSED' }), 15_000)).toEqual({
      kind: 'retryable',
      reason: 'the text provider could not be reached (ECONNREFUSED); will try again',
    });
  });

  it('calls a timeout or a broken connection unknown: the text may have been accepted', () => {
    expect(classifySmsError(Object.assign(new Error('timeout of 15000ms exceeded'), { code: 'ECONNABORTED' }), 15_000)).toEqual({
      kind: 'unknown',
      reason: 'the text provider did not answer within 15 s; checking whether it went before trying again',
    });
    expect(classifySmsError(Object.assign(new Error('socket hang up'), { code: 'ECONNRESET' }), 15_000).reason).toBe(
      'the connection to the text provider broke; checking whether it went before trying again',
    );
  });
});
