import { createHmac } from 'node:crypto';
import twilio from 'twilio';
import { describe, expect, it } from 'vitest';
import { checkTwilioRequest, signedUrl } from './twilio-signature.util.js';

/** The published scheme written out independently: Base64(HMAC-SHA1(token, URL + sorted name/value pairs)). */
function sign(token: string, url: string, params: Record<string, string>): string {
  const data = url + Object.keys(params).sort().map((k) => k + params[k]).join('');
  return createHmac('sha1', token).update(Buffer.from(data, 'utf8')).digest('base64');
}

describe('checkTwilioRequest', () => {
  const example = { CallSid: 'CA1234567890ABCDE', Caller: '+12349013030', Digits: '1234', From: '+12349013030', To: '+18005551212' };
  const exampleUrl = 'https://mycompany.com/myapp.php?foo=1&bar=2';

  it("the SDK's validateRequest accepts the published worked example", () => {
    // references.md: Twilio request validation worked example (token 12345 → 0/KCTR6DLpKmkAf8muzZqo1nDgQ=).
    expect(sign('12345', exampleUrl, example)).toBe('0/KCTR6DLpKmkAf8muzZqo1nDgQ=');
    expect(twilio.validateRequest('12345', '0/KCTR6DLpKmkAf8muzZqo1nDgQ=', exampleUrl, example)).toBe(true);
    expect(twilio.validateRequest('12345', '0/KCTR6DLpKmkAf8muzZqo1nDgQ=', exampleUrl, { ...example, Digits: '1235' })).toBe(false);
  });

  const sid = 'AC00000000000000000000000000000000';
  const url = 'https://desk.quillfern-endo.test/api/sms/status';
  const params = { MessageSid: 'SM0123', MessageStatus: 'delivered', AccountSid: sid };

  it('accepts a request signed over our public URL and form for our account', () => {
    expect(checkTwilioRequest('token-a', sid, { signature: sign('token-a', url, params), url, params })).toEqual({ ok: true });
  });

  it('refuses a missing or wrong signature, a changed field, another URL and another account', () => {
    expect(checkTwilioRequest('token-a', sid, { signature: undefined, url, params })).toEqual({ ok: false, reason: 'the X-Twilio-Signature header is missing' });
    expect(checkTwilioRequest('token-a', sid, { signature: sign('token-b', url, params), url, params })).toEqual({ ok: false, reason: 'the X-Twilio-Signature does not match this request' });
    expect(checkTwilioRequest('token-a', sid, { signature: sign('token-a', url, params), url, params: { ...params, MessageStatus: 'failed' } }).ok).toBe(false);
    expect(checkTwilioRequest('token-a', sid, { signature: sign('token-a', 'http://10.0.0.5:3000/api/sms/status', params), url, params }).ok).toBe(false);
    const other = { ...params, AccountSid: 'AC11111111111111111111111111111111' };
    expect(checkTwilioRequest('token-a', sid, { signature: sign('token-a', url, other), url, params: other })).toEqual({ ok: false, reason: 'the request is for another provider account' });
    expect(checkTwilioRequest('', sid, { signature: 'x', url, params }).ok).toBe(false);
  });

  it('builds the URL from the configured public origin and the path as received', () => {
    expect(signedUrl('https://desk.quillfern-endo.test/', '/api/sms/status?x=1')).toBe('https://desk.quillfern-endo.test/api/sms/status?x=1');
  });
});
