import { Inject, Injectable, Logger, OnModuleDestroy } from '@nestjs/common';
import nodemailer, { type Transporter } from 'nodemailer';
import { APP_CONFIG, type AppConfig } from '../config/configuration.js';
import { describeMailError } from '../mail/mail.service.js';
import type { OutgoingAttachment } from './composer.types.js';
import type { SendFailureKind, SendResult } from './send-result.types.js';

export interface OutboxEmail {
  outboxId: number;
  to: string;
  subject: string;
  text: string;
  /** An HTML alternative to the text, when the composer made one. */
  html?: string | null;
  attachments?: OutgoingAttachment[];
}

/** `<outbox-<id>@<the sender's domain>>`: the same for every attempt, so a resent copy can be recognised and dropped. */
export function outboxMessageId(outboxId: number, from: string): string {
  const domain = /@([A-Za-z0-9.-]+)>?\s*$/.exec(from)?.[1] ?? 'ostium.test';
  return `<outbox-${outboxId}@${domain}>`;
}

/**
 * SMTP reply codes and nodemailer error codes → retry or not. 5xx replies are final (RFC 5321 §4.2.1)
 * except 503 (bad sequence, our side); 4xx and broken connections are worth another try.
 */
export function classifyMailError(err: Error & { code?: string; responseCode?: number }): SendFailureKind {
  const rc = err.responseCode;
  if (typeof rc === 'number') return rc >= 500 && rc !== 503 ? 'permanent' : 'retryable';
  if (err.code === 'EENVELOPE' || err.code === 'EMESSAGE' || err.code === 'EAUTH' || err.code === 'ENOAUTH') return 'permanent';
  return 'retryable';
}

/**
 * E-mail for the outbox over the same SMTP settings as MailService (config.mail), with its own
 * transport because the outbox sets a fixed Message-ID and its own time limit per call.
 */
@Injectable()
export class EmailSenderService implements OnModuleDestroy {
  private readonly logger = new Logger('OutboxMail');
  private transporter: Transporter | null = null;

  constructor(@Inject(APP_CONFIG) private readonly config: AppConfig) {}

  private transport(): Transporter {
    if (!this.transporter) {
      const m = this.config.mail;
      const t = this.config.messaging.sendTimeoutMs;
      this.transporter = nodemailer.createTransport({
        host: m.host,
        port: m.port,
        secure: m.secure,
        auth: m.user ? { user: m.user, pass: m.password ?? '' } : undefined,
        connectionTimeout: t,
        greetingTimeout: t,
        socketTimeout: t,
      });
    }
    return this.transporter;
  }

  async send(mail: OutboxEmail): Promise<SendResult> {
    const messageId = outboxMessageId(mail.outboxId, this.config.mail.from);
    try {
      const info = await this.transport().sendMail({
        from: this.config.mail.from,
        to: mail.to,
        subject: mail.subject,
        text: mail.text,
        html: mail.html ?? undefined,
        messageId,
        attachments: mail.attachments?.map((a) => ({ filename: a.filename, contentType: a.contentType, content: a.content })),
      });
      const rejected = (info.rejected ?? []).map(String);
      if (rejected.length) return { ok: false, kind: 'permanent', reason: `the mail server refused ${rejected.join(', ')}` };
      return { ok: true, providerId: messageId, providerStatus: 'accepted' };
    } catch (e) {
      const err = e as Error & { code?: string; responseCode?: number };
      const reason = describeMailError(err, this.config.mail);
      const kind = classifyMailError(err);
      this.logger.warn(`mail to ${mail.to} failed (${kind}): ${reason}`);
      return { ok: false, kind, reason: kind === 'permanent' ? reason : `${reason}; will try again` };
    }
  }

  onModuleDestroy() {
    this.transporter?.close();
  }
}
