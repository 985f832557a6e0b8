// Confirm links: `${publicUrl}/v/<token>`, where the token carries the appointment id and an expiry,
// signed with HMAC-SHA256 (RFC 2104) truncated to 64 bits (NIST SP 800-107 Rev. 1 on truncated MACs,
// from memory: no shorter than 32 bits, 64 or more advised) and encoded base64url without padding (RFC 4648 §5),
// so the whole token is 22 characters and fits in a text.
import { createHmac, timingSafeEqual } from 'node:crypto';

const ID_BYTES = 4;
const EXPIRY_BYTES = 4;
const MAC_BYTES = 8;
const PAYLOAD_BYTES = ID_BYTES + EXPIRY_BYTES;
const TOKEN_BYTES = PAYLOAD_BYTES + MAC_BYTES;
/** base64url of 16 bytes without padding. */
export const VISIT_TOKEN_LENGTH = Math.ceil((TOKEN_BYTES * 8) / 6);
const TOKEN = new RegExp(`^[A-Za-z0-9_-]{${VISIT_TOKEN_LENGTH}}$`);
const UINT32_MAX = 0xffff_ffff;
// Domain separation: the same secret may sign other things without a signature ever carrying over.
const CONTEXT = Buffer.from('ostium:visit-link:v1\0', 'utf8');

export type VisitTokenResult = { appointmentId: number; expiresAt: Date } | { error: 'invalid' | 'expired' };

function mac(secret: string, payload: Buffer): Buffer {
  return createHmac('sha256', secret).update(CONTEXT).update(payload).digest().subarray(0, MAC_BYTES);
}

function assertSecret(secret: string): void {
  if (typeof secret !== 'string' || secret.length < 16) throw new RangeError('the link secret must be a string of at least 16 characters');
}

/** A short, URL-safe token for the visit's public page, valid until `expiresAt` (whole seconds, rounded down). */
export function makeVisitToken(secret: string, appointmentId: number, expiresAt: Date | number): string {
  assertSecret(secret);
  if (!Number.isInteger(appointmentId) || appointmentId < 1 || appointmentId > UINT32_MAX) {
    throw new RangeError(`appointment id must be a whole number 1–${UINT32_MAX}, got ${appointmentId}`);
  }
  const ms = typeof expiresAt === 'number' ? expiresAt : expiresAt.getTime();
  const seconds = Math.floor(ms / 1000);
  if (!Number.isFinite(ms) || seconds < 0 || seconds > UINT32_MAX) throw new RangeError('expiry must be a valid time between 1970 and 2106');
  const payload = Buffer.alloc(PAYLOAD_BYTES);
  payload.writeUInt32BE(appointmentId, 0);
  payload.writeUInt32BE(seconds, ID_BYTES);
  return Buffer.concat([payload, mac(secret, payload)]).toString('base64url');
}

/**
 * The appointment a token names, or why it does not count. The signature is checked (in constant time)
 * before the expiry, so a forged token is `invalid` even when its claimed expiry has passed.
 */
export function readVisitToken(secret: string, token: string, now: Date | number): VisitTokenResult {
  assertSecret(secret);
  if (typeof token !== 'string' || !TOKEN.test(token)) return { error: 'invalid' };
  const bytes = Buffer.from(token, 'base64url');
  // Node ignores the unused low bits of the last character; only the canonical spelling counts.
  if (bytes.length !== TOKEN_BYTES || bytes.toString('base64url') !== token) return { error: 'invalid' };
  const payload = bytes.subarray(0, PAYLOAD_BYTES);
  if (!timingSafeEqual(bytes.subarray(PAYLOAD_BYTES), mac(secret, payload))) return { error: 'invalid' };
  const appointmentId = payload.readUInt32BE(0);
  const expiresAt = new Date(payload.readUInt32BE(ID_BYTES) * 1000);
  if (appointmentId < 1) return { error: 'invalid' };
  const nowMs = typeof now === 'number' ? now : now.getTime();
  if (nowMs >= expiresAt.getTime()) return { error: 'expired' };
  return { appointmentId, expiresAt };
}

/** The link a message carries (the client route `/v/:token`). */
export function visitLink(publicUrl: string, token: string): string {
  return `${publicUrl.replace(/\/+$/, '')}/v/${token}`;
}
