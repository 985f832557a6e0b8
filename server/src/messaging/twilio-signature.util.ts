// Verifies the provider's X-Twilio-Signature with the SDK's own validateRequest (Base64 HMAC-SHA1 of the
// full URL and the sorted POST parameters, references.md "Twilio request validation").
import twilio from 'twilio';

export type SignatureCheck = { ok: true } | { ok: false; reason: string };

export interface SignedRequest {
  signature: string | undefined;
  /** The configured public URL + the request's path and query: behind a proxy the request's own host differs. */
  url: string;
  params: Record<string, unknown>;
}

export function checkTwilioRequest(authToken: string, accountSid: string, req: SignedRequest): SignatureCheck {
  if (!req.signature) return { ok: false, reason: 'the X-Twilio-Signature header is missing' };
  if (!authToken) return { ok: false, reason: 'TWILIO_AUTH_TOKEN is not set, so no request can be verified' };
  if (!twilio.validateRequest(authToken, req.signature, req.url, req.params)) return { ok: false, reason: 'the X-Twilio-Signature does not match this request' };
  // A valid signature from another account of the same token holder is still not ours.
  if (req.params.AccountSid !== accountSid) return { ok: false, reason: 'the request is for another provider account' };
  return { ok: true };
}

/** The URL the provider signed: our configured public origin + the path and query as received. */
export function signedUrl(publicUrl: string, originalUrl: string): string {
  return publicUrl.replace(/\/+$/, '') + originalUrl;
}
