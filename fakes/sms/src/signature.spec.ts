import twilio from 'twilio';
import { describe, expect, it } from 'vitest';
import { signTwilioRequest, signatureMatches, signaturePayload } from './signature.js';

// references.md: Twilio request validation worked example (recomputed).
const TOKEN = '12345';
const URL_AS_CONFIGURED = 'https://mycompany.com/myapp.php?foo=1&bar=2';
const PARAMS = { CallSid: 'CA1234567890ABCDE', Caller: '+12349013030', Digits: '1234', From: '+12349013030', To: '+18005551212' };
const EXPECTED = '0/KCTR6DLpKmkAf8muzZqo1nDgQ=';

describe('signTwilioRequest', () => {
  it('gives the worked example’s signature (references.md: Twilio request validation worked example)', () => {
    expect(signTwilioRequest(TOKEN, URL_AS_CONFIGURED, PARAMS)).toBe(EXPECTED);
  });

  it('is accepted by the official SDK’s validateRequest for the worked example', () => {
    expect(twilio.validateRequest(TOKEN, EXPECTED, URL_AS_CONFIGURED, PARAMS)).toBe(true);
    expect(twilio.validateRequest(TOKEN, signTwilioRequest(TOKEN, URL_AS_CONFIGURED, PARAMS), URL_AS_CONFIGURED, PARAMS)).toBe(true);
  });

  it('fails validation when one parameter, the URL or the token is tampered with', () => {
    const sig = signTwilioRequest(TOKEN, URL_AS_CONFIGURED, PARAMS);
    expect(twilio.validateRequest(TOKEN, sig, URL_AS_CONFIGURED, { ...PARAMS, Digits: '1235' })).toBe(false);
    expect(twilio.validateRequest(TOKEN, sig, URL_AS_CONFIGURED, { ...PARAMS, Extra: '' })).toBe(false);
    expect(twilio.validateRequest(TOKEN, sig, 'https://mycompany.com/myapp.php?foo=1&bar=3', PARAMS)).toBe(false);
    expect(twilio.validateRequest('54321', sig, URL_AS_CONFIGURED, PARAMS)).toBe(false);
    expect(signatureMatches(TOKEN, sig, URL_AS_CONFIGURED, { ...PARAMS, To: '+18005551213' })).toBe(false);
    expect(signatureMatches(TOKEN, sig, URL_AS_CONFIGURED, PARAMS)).toBe(true);
  });

  it('sorts by name and appends name+value after the URL (the published scheme)', () => {
    expect(signaturePayload('https://x.test/a', { b: '2', a: '1', B: '3' })).toBe('https://x.test/aB3a1b2');
  });

  it('agrees with the SDK on awkward inputs: non-ASCII, empty values, repeated names, odd URLs', () => {
    const cases: Array<[string, Record<string, string | string[]>]> = [
      ['http://127.0.0.1:3000/api/sms/inbound', { Body: 'Grüße — ok ✅', From: '+12025550142', Empty: '' }],
      ['https://example.com/hook?x=a%20b&y=1', { MediaUrl: ['https://example.com/2.jpg', 'https://example.com/1.jpg'], Body: '' }],
      ['https://example.com/', {}],
      ['http://127.0.0.1:3100/api/sms/status?row=42', { MessageStatus: 'delivered', MessageSid: 'SM' + 'a'.repeat(32), a: 'A', A: 'a', _: 'x' }],
    ];
    for (const [url, params] of cases) {
      const ours = signTwilioRequest('local-fake-auth-token', url, params);
      expect(ours).toBe(twilio.getExpectedTwilioSignature('local-fake-auth-token', url, params));
      expect(twilio.validateRequest('local-fake-auth-token', ours, url, params)).toBe(true);
    }
  });
});
