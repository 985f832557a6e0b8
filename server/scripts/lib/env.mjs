// The environment each mode runs with. Production reads the same variables from its own environment.
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

export const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..', '..');
export const dataRoot = join(root, '.data');

export function devEnv() {
  const env = process.env;
  return {
    NODE_ENV: env.NODE_ENV ?? 'development',
    PORT: env.PORT ?? '3000',
    DB_HOST: '127.0.0.1',
    DB_PORT: env.DB_PORT ?? '3307',
    DB_NAME: env.DB_NAME ?? 'ostium',
    DB_USER: env.DB_USER ?? 'ostium',
    DB_PASSWORD: env.DB_PASSWORD ?? 'ostium-local',
    JWT_SECRET: env.JWT_SECRET ?? 'local-development-secret-change-me',
    SMTP_HOST: env.SMTP_HOST ?? '127.0.0.1',
    SMTP_PORT: env.SMTP_PORT ?? '1025',
    MAIL_WEB_PORT: env.MAIL_WEB_PORT ?? '1080',
    SMS_FAKE_PORT: env.SMS_FAKE_PORT ?? '4010',
    MAIL_FROM: env.MAIL_FROM ?? 'Quillfern Endodontics <desk@quillfern-endo.test>',
    UPLOAD_DIR: env.UPLOAD_DIR ?? join(dataRoot, 'uploads'),
    PUBLIC_URL: env.PUBLIC_URL ?? `http://127.0.0.1:${env.PORT ?? '3000'}`,
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
    UPLOAD_DIR: join(dataRoot, 'test-uploads'),
    PUBLIC_URL: 'http://127.0.0.1:3100',
    LOG_LEVEL: 'warn',
  };
}
