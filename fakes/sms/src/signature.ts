// The provider's published request-signing scheme (references.md: Twilio request validation):
// Base64(HMAC-SHA1(auth token, full URL + each POST parameter's name and value, sorted by name)).
// Written from the description, not copied from the SDK, so the tests can check one against the other.
import { createHmac, timingSafeEqual } from 'node:crypto';

/** Form parameters as they travel: a repeated name (MediaUrl) carries several values. */
export type SignedParams = Record<string, string | readonly string[] | undefined>;

/** The data string that gets signed: the URL exactly as configured, then name+value pairs by name. */
export function signaturePayload(url: string, params: SignedParams = {}): string {
  let data = url;
  // Plain code-unit order, the same order a default JavaScript sort gives.
  for (const name of Object.keys(params).sort()) {
    const value = params[name];
    if (value === undefined) continue;
    // A repeated parameter contributes each distinct value once, values sorted (common practice, no source).
    const values = typeof value === 'string' ? [value] : [...new Set(value)].sort();
    for (const v of values) data += name + v;
  }
  return data;
}

/** The X-Twilio-Signature header value for a request to `url` carrying `params`. */
export function signTwilioRequest(authToken: string, url: string, params: SignedParams = {}): string {
  return createHmac('sha1', authToken).update(Buffer.from(signaturePayload(url, params), 'utf8')).digest('base64');
}

/** Constant-time check of a received signature (for the fake's own use; the app uses the SDK). */
export function signatureMatches(authToken: string, signature: string, url: string, params: SignedParams = {}): boolean {
  const expected = Buffer.from(signTwilioRequest(authToken, url, params));
  const given = Buffer.from(signature);
  return expected.length === given.length && timingSafeEqual(expected, given);
}
