import { describe, expect, it } from 'vitest';
import { closedPort } from '../../test/helpers/mail-inbox.js';
import { loadConfig } from '../config/configuration.js';
import { describeMailError, MailService } from './mail.service.js';

describe('MailService', () => {
  it('returns the failure instead of throwing when the mail server refuses the connection', async () => {
    const port = await closedPort();
    const config = loadConfig({ SMTP_HOST: '127.0.0.1', SMTP_PORT: String(port) });
    const mail = new MailService(config);
    const r = await mail.send({ to: 'someone@example.com', subject: 's', text: 't' });
    expect(r).toEqual({ ok: false, error: `the mail server at 127.0.0.1:${port} refused the connection` });
    mail.onModuleDestroy();
  });

  it('describes the usual failures in one line', () => {
    const at = { host: 'mail.example.com', port: 587 };
    const err = (code: string, message: string) => Object.assign(new Error(message), { code });
    expect(describeMailError(err('ESOCKET', 'connect ECONNREFUSED 10.0.0.1:587'), at)).toBe('the mail server at mail.example.com:587 refused the connection');
    expect(describeMailError(err('ETIMEDOUT', 'Connection timeout'), at)).toBe('the mail server at mail.example.com:587 did not answer in time');
    expect(describeMailError(err('EAUTH', 'Invalid login: 535'), at)).toBe('the mail server at mail.example.com:587 did not accept the sign-in');
    expect(describeMailError(err('EENVELOPE', 'No recipients defined'), at)).toBe('the address was refused: No recipients defined');
    expect(describeMailError(err('EMESSAGE', 'x'.repeat(900)), at).length).toBeLessThanOrEqual(500);
  });
});
