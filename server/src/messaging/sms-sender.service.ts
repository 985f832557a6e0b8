import { Inject, Injectable, Logger } from '@nestjs/common';
import { APP_CONFIG, type AppConfig } from '../config/configuration.js';
import type { ProviderMessage, SendFailureKind, SendResult } from './send-result.types.js';
import type { TwilioClientHandle } from './twilio-client.util.js';

export const TWILIO_CLIENT = Symbol('TWILIO_CLIENT');

// Provider error codes in words for the front desk (from memory: the provider's error dictionary).
const PROVIDER_CODES: Record<number, string> = {
  20003: 'the text provider did not accept our account credentials',
  20429: 'the text provider is rate-limiting us',
  21211: 'the number is not a valid phone number',
  21212: 'our sending number is not valid',
  21408: 'texts to this country are not enabled on our account',
  21602: 'the text is empty',
  21604: 'the message has no number to send to',
  21606: 'our sending number cannot send texts',
  21610: 'the patient has opted out of texts from our number (replied STOP)',
  21612: 'texts cannot reach this number',
  21614: 'the number is not a mobile number',
  21617: 'the text is longer than the provider allows',
  30003: 'the phone was unreachable (off or out of coverage)',
  30004: 'the text was blocked (the patient or the carrier blocks our number)',
  30005: 'the number is unknown to the carrier or no longer in service',
  30006: 'the number is a landline or its carrier cannot take texts',
  30007: 'the carrier filtered the text',
  30008: 'the carrier reported an unknown delivery error',
};

/** The provider's error code in words, or null when we do not know it. */
export function providerCodeInWords(code: number | string | null | undefined): string | null {
  const n = typeof code === 'string' ? Number(code) : code;
  return n !== null && n !== undefined && Number.isFinite(n) ? (PROVIDER_CODES[n] ?? null) : null;
}

// Axios/Node codes that mean the request never reached the provider (safe to send again).
const NOT_SENT_CODES = new Set(['ECONNREFUSED', 'ENOTFOUND', 'EAI_AGAIN', 'EHOSTUNREACH', 'ENETUNREACH', 'ERR_INVALID_URL']);
// ... and those where it may have arrived (ask the provider before sending again).
const UNKNOWN_CODES = new Set(['ECONNABORTED', 'ETIMEDOUT', 'ECONNRESET', 'EPIPE', 'ERR_CANCELED', 'ERR_BAD_RESPONSE']);

/** One provider failure → whether to retry, and a one-line reason the front desk can read. */
export function classifySmsError(error: unknown, timeoutMs: number): { kind: SendFailureKind; reason: string } {
  const e = error as { status?: unknown; code?: unknown; message?: unknown; moreInfo?: unknown };
  const message = String(e?.message ?? error).replace(/\s+/g, ' ').slice(0, 200);
  if (typeof e?.status === 'number') {
    // A RestException: the provider answered.
    const status = e.status;
    const code = typeof e.code === 'number' ? e.code : null;
    const words = providerCodeInWords(code);
    const tail = code ? ` (error ${code})` : ` (HTTP ${status})`;
    if (status >= 500) return { kind: 'retryable', reason: `the text provider had a problem (HTTP ${status}); will try again` };
    if (status === 429 || status === 408) return { kind: 'retryable', reason: `${words ?? 'the text provider asked us to slow down'}${tail}; will try again` };
    return { kind: 'permanent', reason: `${words ?? `the text provider refused the text: ${message}`}${tail}` };
  }
  const code = typeof e?.code === 'string' ? e.code : '';
  if (code === 'TEXTS_OFF') return { kind: 'permanent', reason: message };
  if (NOT_SENT_CODES.has(code)) return { kind: 'retryable', reason: `the text provider could not be reached (${code}); will try again` };
  if (UNKNOWN_CODES.has(code) || /timeout/i.test(message)) {
    const what = code === 'ECONNRESET' || code === 'EPIPE' ? 'the connection to the text provider broke' : `the text provider did not answer within ${(timeoutMs / 1000).toFixed(timeoutMs % 1000 ? 1 : 0)} s`;
    return { kind: 'unknown', reason: `${what}; checking whether it went before trying again` };
  }
  return { kind: 'retryable', reason: `sending failed (${code || 'error'}): ${message}` };
}

/** Texts through the provider's SDK: one message per call, errors mapped for the outbox. */
@Injectable()
export class SmsSenderService {
  private readonly logger = new Logger('Sms');

  constructor(
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    @Inject(TWILIO_CLIENT) private readonly handle: TwilioClientHandle,
  ) {}

  /** Null when texts can go; otherwise why not (no TWILIO_API_BASE outside production). */
  get disabledReason(): string | null {
    return this.handle.disabledReason;
  }

  get statusCallbackUrl(): string {
    return `${this.config.publicUrl.replace(/\/+$/, '')}/api/sms/status`;
  }

  async send(message: { to: string; body: string }): Promise<SendResult> {
    if (!this.handle.client) return { ok: false, kind: 'permanent', reason: this.handle.disabledReason };
    try {
      const m = await this.handle.client.messages.create({
        to: message.to,
        from: this.config.sms.fromNumber,
        body: message.body,
        statusCallback: this.statusCallbackUrl,
      });
      return { ok: true, providerId: m.sid, providerStatus: m.status ?? null };
    } catch (error) {
      const out = classifySmsError(error, this.config.messaging.sendTimeoutMs);
      this.logger.warn(`text to ${message.to} failed: ${out.reason}`);
      return { ok: false, ...out };
    }
  }

  /**
   * After an interrupted send: the provider's messages to `to` with exactly this body from our number,
   * sent at or after `since`, oldest first (the caller drops ids other outbox rows already own). Throws
   * when the provider cannot be asked; the caller then asks again later instead of sending.
   */
  async findSent(query: { to: string; body: string; since: Date }): Promise<ProviderMessage[]> {
    if (!this.handle.client) throw Object.assign(new Error(this.handle.disabledReason), { code: 'TEXTS_OFF' });
    const list = await this.handle.client.messages.list({ to: query.to, dateSentAfter: query.since, limit: 200 });
    const since = query.since.getTime();
    return list
      .filter((m) => m.to === query.to && m.body === query.body && m.from === this.config.sms.fromNumber)
      .filter((m) => (m.dateSent ?? m.dateCreated ?? new Date(since)).getTime() >= since)
      .sort((a, b) => (a.dateCreated?.getTime() ?? 0) - (b.dateCreated?.getTime() ?? 0))
      .map((m) => ({ sid: m.sid, status: m.status ?? null }));
  }
}
