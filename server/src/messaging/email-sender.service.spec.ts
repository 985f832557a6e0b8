import { describe, expect, it } from 'vitest';
import { closedPort } from '../../test/helpers/mail-inbox.js';
import { loadConfig } from '../config/configuration.js';
import { classifyMailError, EmailSenderService, outboxMessageId } from './email-sender.service.js';

const err = (code: string | undefined, responseCode?: number) => Object.assign(new Error('x'), { code, responseCode });

describe(EmailSenderService.name, () => {
  it('gives every attempt of one row the same Message-ID under the sender domain', () => {
    expect(outboxMessageId(7, 'Quillfern Endodontics <desk@quillfern-endo.test>')).toBe('<outbox-7@quillfern-endo.test>');
    expect(outboxMessageId(7, 'desk@example.com')).toBe('<outbox-7@example.com>');
    expect(outboxMessageId(8, 'no address')).toBe('<outbox-8@ostium.test>');
  });

  it('treats 5xx replies as final and 4xx replies and broken connections as worth another try', () => {
    // RFC 5321 §4.2.1: 5yz permanent negative completion, 4yz transient (503 is our own bad sequence).
    expect(classifyMailError(err('EENVELOPE', 550))).toBe('permanent');
    expect(classifyMailError(err('EMESSAGE', 552))).toBe('permanent');
    expect(classifyMailError(err('EENVELOPE', 451))).toBe('retryable');
    expect(classifyMailError(err('EPROTOCOL', 503))).toBe('retryable');
    expect(classifyMailError(err('ECONNECTION'))).toBe('retryable');
    expect(classifyMailError(err('ETIMEDOUT'))).toBe('retryable');
    expect(classifyMailError(err('EENVELOPE'))).toBe('permanent');
    expect(classifyMailError(err('EAUTH', 535))).toBe('permanent');
  });

  it('returns a retryable failure with the reason when the mail server refuses the connection', async () => {
    const port = await closedPort();
    const sut = new EmailSenderService(loadConfig({ SMTP_HOST: '127.0.0.1', SMTP_PORT: String(port), MESSAGING_SEND_TIMEOUT_MS: '2000' }));
    const r = await sut.send({ outboxId: 1, to: 'someone@example.com', subject: 's', text: 't' });
    expect(r).toEqual({ ok: false, kind: 'retryable', reason: `the mail server at 127.0.0.1:${port} refused the connection; will try again` });
    sut.onModuleDestroy();
  });
});
