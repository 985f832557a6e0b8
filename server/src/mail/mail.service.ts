import { Inject, Injectable, Logger, OnModuleDestroy } from '@nestjs/common';
import nodemailer, { type Transporter } from 'nodemailer';
import { APP_CONFIG, type AppConfig } from '../config/configuration.js';

export interface MailAttachment {
  filename: string;
  content: Buffer | string;
  contentType?: string;
}

export interface MailMessage {
  to: string;
  subject: string;
  text: string;
  html?: string;
  attachments?: MailAttachment[];
}

export interface MailResult {
  ok: boolean;
  messageId?: string;
  error?: string;
}

/**
 * Sends e-mail over SMTP (config.mail). Never throws on a delivery problem: the caller records the
 * result beside whatever the message was about, so a down mail server cannot undo the work.
 */
@Injectable()
export class MailService implements OnModuleDestroy {
  private readonly logger = new Logger('Mail');
  private transporter: Transporter | null = null;

  constructor(@Inject(APP_CONFIG) private readonly config: AppConfig) {}

  private transport(): Transporter {
    if (!this.transporter) {
      const m = this.config.mail;
      this.transporter = nodemailer.createTransport({
        host: m.host,
        port: m.port,
        secure: m.secure,
        auth: m.user ? { user: m.user, pass: m.password ?? '' } : undefined,
        // Short limits: the request that triggers a letter waits for the answer.
        connectionTimeout: 5_000,
        greetingTimeout: 5_000,
        socketTimeout: 10_000,
      });
    }
    return this.transporter;
  }

  get from(): string {
    return this.config.mail.from;
  }

  async send(message: MailMessage): Promise<MailResult> {
    try {
      const info = await this.transport().sendMail({
        from: this.config.mail.from,
        to: message.to,
        subject: message.subject,
        text: message.text,
        html: message.html,
        attachments: message.attachments,
      });
      const rejected = (info.rejected ?? []).map(String);
      if (rejected.length) return { ok: false, messageId: info.messageId, error: `the mail server refused ${rejected.join(', ')}` };
      return { ok: true, messageId: info.messageId };
    } catch (e) {
      const err = e as Error & { code?: string };
      this.logger.warn(`sending to ${message.to} failed: ${err.code ?? ''} ${err.message}`);
      return { ok: false, error: describeMailError(err, this.config.mail) };
    }
  }

  onModuleDestroy() {
    this.transporter?.close();
  }
}

/** A one-line reason the front desk can act on, without a stack trace. */
export function describeMailError(err: Error & { code?: string }, mail: { host: string; port: number }): string {
  const where = `${mail.host}:${mail.port}`;
  // nodemailer reports socket failures as ESOCKET / ECONNECTION with the system code in the message.
  const code = /ECONNREFUSED/.test(err.message) ? 'ECONNREFUSED' : /ETIMEDOUT|timeout/i.test(err.message) && err.code !== 'EAUTH' ? 'ETIMEDOUT' : err.code;
  switch (code) {
    case 'ECONNREFUSED':
      return `the mail server at ${where} refused the connection`;
    case 'ETIMEDOUT':
    case 'ETIMEOUT':
      return `the mail server at ${where} did not answer in time`;
    case 'EAUTH':
      return `the mail server at ${where} did not accept the sign-in`;
    case 'EENVELOPE':
      return `the address was refused: ${err.message}`;
    default:
      return `sending failed (${err.code ?? 'error'}): ${err.message}`.slice(0, 500);
  }
}
