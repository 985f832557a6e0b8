// Confirm-link tokens: HMAC-SHA256 (RFC 2104, checked against RFC 4231 test case 2 below), truncated to
// 64 bits, base64url without padding (RFC 4648 §5).
import fc from 'fast-check';
import { createHmac } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { makeVisitToken, readVisitToken, VISIT_TOKEN_LENGTH, visitLink } from './confirm-link.util.js';

const SECRET = 'test-secret:links-0123456789';
const EXPIRES = Date.parse('2026-12-03T14:00:00Z');
const BEFORE = Date.parse('2026-12-01T09:00:00Z');

/** Flips one character to another of the alphabet. */
function flip(token: string, i: number): string {
  const alphabet = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789-_';
  const next = alphabet[(alphabet.indexOf(token[i]!) + 1) % alphabet.length]!;
  return token.slice(0, i) + next + token.slice(i + 1);
}

describe('makeVisitToken / readVisitToken', () => {
  it('round-trips the appointment id and the expiry (whole seconds)', () => {
    const token = makeVisitToken(SECRET, 4217, EXPIRES + 999);
    expect(readVisitToken(SECRET, token, BEFORE)).toEqual({ appointmentId: 4217, expiresAt: new Date(EXPIRES) });
  });

  it('is short and URL-safe: 22 base64url characters for 16 bytes (RFC 4648 §5)', () => {
    const token = makeVisitToken(SECRET, 4_000_000_000, EXPIRES);
    expect(VISIT_TOKEN_LENGTH).toBe(22);
    expect(token).toMatch(/^[A-Za-z0-9_-]{22}$/);
    expect(encodeURIComponent(token)).toBe(token);
  });

  it('carries a 64-bit HMAC-SHA256 over the id and expiry, after a context label', () => {
    const token = makeVisitToken(SECRET, 7, EXPIRES);
    const bytes = Buffer.from(token, 'base64url');
    expect(bytes.readUInt32BE(0)).toBe(7);
    expect(bytes.readUInt32BE(4)).toBe(EXPIRES / 1000);
    // Recomputed independently with node:crypto.
    const expected = createHmac('sha256', SECRET).update('ostium:visit-link:v1\0').update(bytes.subarray(0, 8)).digest().subarray(0, 8);
    expect(bytes.subarray(8).equals(expected)).toBe(true);
  });

  it('node:crypto HMAC-SHA256 matches RFC 4231 test case 2 (key "Jefe")', () => {
    // RFC 4231 §4.3: HMAC-SHA-256("Jefe", "what do ya want for nothing?").
    expect(createHmac('sha256', 'Jefe').update('what do ya want for nothing?').digest('hex')).toBe(
      '5bdcc146bf60754e6a042426089575c75a003f089d2739839dec58b964ec3843',
    );
  });

  it('says expired from the expiry on, not before', () => {
    const token = makeVisitToken(SECRET, 12, EXPIRES);
    expect(readVisitToken(SECRET, token, EXPIRES - 1)).toMatchObject({ appointmentId: 12 });
    expect(readVisitToken(SECRET, token, EXPIRES)).toEqual({ error: 'expired' });
    expect(readVisitToken(SECRET, token, new Date(EXPIRES + 86_400_000))).toEqual({ error: 'expired' });
  });

  it('refuses every single-character change (tampering), including the last character’s spare bits', () => {
    const token = makeVisitToken(SECRET, 12, EXPIRES);
    for (let i = 0; i < token.length; i++) {
      expect(readVisitToken(SECRET, flip(token, i), BEFORE), `position ${i}`).toEqual({ error: 'invalid' });
    }
  });

  it('refuses a token whose payload was rewritten to another visit or a later expiry', () => {
    const token = makeVisitToken(SECRET, 12, EXPIRES);
    const bytes = Buffer.from(token, 'base64url');
    const otherVisit = Buffer.from(bytes);
    otherVisit.writeUInt32BE(13, 0);
    const later = Buffer.from(bytes);
    later.writeUInt32BE(EXPIRES / 1000 + 86_400 * 365, 4);
    expect(readVisitToken(SECRET, otherVisit.toString('base64url'), BEFORE)).toEqual({ error: 'invalid' });
    expect(readVisitToken(SECRET, later.toString('base64url'), BEFORE)).toEqual({ error: 'invalid' });
    // A forged, expired token is invalid, not expired: the signature is judged first.
    expect(readVisitToken(SECRET, otherVisit.toString('base64url'), EXPIRES + 1)).toEqual({ error: 'invalid' });
  });

  it('refuses another secret, wrong lengths, padding and foreign characters', () => {
    const token = makeVisitToken(SECRET, 12, EXPIRES);
    expect(readVisitToken('another-secret-of-enough-length', token, BEFORE)).toEqual({ error: 'invalid' });
    for (const bad of ['', token.slice(1), `${token}A`, `${token.slice(0, 20)}==`, `${token.slice(0, 21)}+`, `${token.slice(0, 21)}/`, ' '.repeat(22)]) {
      expect(readVisitToken(SECRET, bad, BEFORE), JSON.stringify(bad)).toEqual({ error: 'invalid' });
    }
    expect(readVisitToken(SECRET, undefined as unknown as string, BEFORE)).toEqual({ error: 'invalid' });
  });

  it('rejects ids and expiries it cannot carry, and a short secret', () => {
    expect(() => makeVisitToken(SECRET, 0, EXPIRES)).toThrow(/appointment id/);
    expect(() => makeVisitToken(SECRET, 1.5, EXPIRES)).toThrow(/appointment id/);
    expect(() => makeVisitToken(SECRET, 2 ** 32, EXPIRES)).toThrow(/appointment id/);
    expect(() => makeVisitToken(SECRET, 1, Number.NaN)).toThrow(/expiry/);
    expect(() => makeVisitToken(SECRET, 1, Date.parse('2107-01-01T00:00:00Z'))).toThrow(/expiry/);
    expect(() => makeVisitToken('short', 1, EXPIRES)).toThrow(/secret/);
  });

  it('property: any id and expiry round-trip; any other secret fails', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 0xffff_ffff }), fc.integer({ min: 1, max: 0xffff_fffe }), fc.string({ minLength: 16 }), (id, sec, other) => {
        const token = makeVisitToken(SECRET, id, sec * 1000);
        expect(token).toHaveLength(22);
        expect(readVisitToken(SECRET, token, sec * 1000 - 1)).toEqual({ appointmentId: id, expiresAt: new Date(sec * 1000) });
        if (other !== SECRET) expect(readVisitToken(other, token, 0)).toEqual({ error: 'invalid' });
      }),
      { numRuns: 300 },
    );
  });

  it('builds the link on the public URL, with or without a trailing slash', () => {
    expect(visitLink('https://visits.example.com/', 'abc')).toBe('https://visits.example.com/v/abc');
    expect(visitLink('http://127.0.0.1:3000', 'abc')).toBe('http://127.0.0.1:3000/v/abc');
  });
});
