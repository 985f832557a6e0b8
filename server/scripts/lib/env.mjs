// The environment each mode runs with. Production reads the same variables from its own environment.
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

export const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..', '..');
export const dataRoot = join(root, '.data');

// Fictional local values: the SMS stand-in (fakes/sms) accepts exactly these, and nothing reaches the provider.
const LOCAL_SMS = { accountSid: 'AC00000000000000000000000000000000', authToken: 'local-fake-auth-token', from: '+12025550199' };

export function devEnv() {
  const env = process.env;
  const port = env.PORT ?? '3000';
  const smsFakePort = env.SMS_FAKE_PORT ?? '4010';
  const publicUrl = env.PUBLIC_URL ?? `http://127.0.0.1:${port}`;
  return {
    NODE_ENV: env.NODE_ENV ?? 'development',
    PORT: port,
    DB_HOST: '127.0.0.1',
    DB_PORT: env.DB_PORT ?? '3307',
    DB_NAME: env.DB_NAME ?? 'ostium',
    DB_USER: env.DB_USER ?? 'ostium',
    DB_PASSWORD: env.DB_PASSWORD ?? 'ostium-local',
    JWT_SECRET: env.JWT_SECRET ?? 'local-development-secret-change-me',
    SMTP_HOST: env.SMTP_HOST ?? '127.0.0.1',
    SMTP_PORT: env.SMTP_PORT ?? '1025',
    MAIL_WEB_PORT: env.MAIL_WEB_PORT ?? '1080',
    SMS_FAKE_PORT: smsFakePort,
    TWILIO_ACCOUNT_SID: env.TWILIO_ACCOUNT_SID ?? LOCAL_SMS.accountSid,
    TWILIO_AUTH_TOKEN: env.TWILIO_AUTH_TOKEN ?? LOCAL_SMS.authToken,
    TWILIO_FROM_NUMBER: env.TWILIO_FROM_NUMBER ?? LOCAL_SMS.from,
    TWILIO_API_BASE: env.TWILIO_API_BASE ?? `http://127.0.0.1:${smsFakePort}`,
    SMS_FAKE_INBOUND_URL: env.SMS_FAKE_INBOUND_URL ?? `${publicUrl}/api/sms/inbound`,
    MAIL_FROM: env.MAIL_FROM ?? 'Quillfern Endodontics <desk@quillfern-endo.test>',
    UPLOAD_DIR: env.UPLOAD_DIR ?? join(dataRoot, 'uploads'),
    PUBLIC_URL: publicUrl,
    CLIENT_DIST: join(root, 'client', 'dist'),
    SEEDS_DIR: join(root, 'seeds'),
  };
}

export function testEnv() {
  return {
    ...devEnv(),
    NODE_ENV: 'test',
    PORT: '3100',
    DB_PORT: process.env.TEST_DB_PORT ?? '3308',
    DB_NAME: 'ostium_test',
    DB_USER: 'ostium_test',
    DB_PASSWORD: 'ostium-test',
    JWT_SECRET: 'test-secret',
    SMTP_PORT: '1026',
    MAIL_WEB_PORT: '1081',
    SMS_FAKE_PORT: '4011',
    TWILIO_ACCOUNT_SID: LOCAL_SMS.accountSid,
    TWILIO_AUTH_TOKEN: LOCAL_SMS.authToken,
    TWILIO_FROM_NUMBER: LOCAL_SMS.from,
    TWILIO_API_BASE: 'http://127.0.0.1:4011',
    SMS_FAKE_INBOUND_URL: 'http://127.0.0.1:3100/api/sms/inbound',
    UPLOAD_DIR: join(dataRoot, 'test-uploads'),
    PUBLIC_URL: 'http://127.0.0.1:3100',
    LOG_LEVEL: 'warn',
  };
}
