// Every setting comes from the environment so production needs nothing but variables.
export interface AppConfig {
  env: string;
  port: number;
  db: { host: string; port: number; name: string; user: string; password: string; poolMax: number };
  jwt: { secret: string; accessTtlSeconds: number; refreshTtlSeconds: number };
  loginRateLimit: { limit: number; ttlMs: number };
  clientDist: string | null;
  seedsDir: string | null;
  uploadDir: string;
  publicUrl: string;
  logLevel: string;
  mail: { host: string; port: number; user?: string; password?: string; from: string; secure: boolean };
  /** The text-messaging provider (the official twilio SDK); apiBase points it at the local fake in development and tests. */
  sms: { accountSid: string; authToken: string; fromNumber: string; apiBase: string | null };
  /** The outbox job: every process may run it; each message still goes once. */
  messaging: {
    jobEnabled: boolean;
    intervalMs: number;
    batchSize: number;
    /** How long a claimed row belongs to its worker before another may reconcile it. */
    claimSeconds: number;
    maxAttempts: number;
    backoffBaseMs: number;
    backoffMaxMs: number;
    /** Timeout of one provider or SMTP call. */
    sendTimeoutMs: number;
    workerId: string;
    /** Signs the confirm links in messages. */
    linkSecret: string;
  };
}

const num = (v: string | undefined, d: number) => (v === undefined || v === '' ? d : Number(v));

export function loadConfig(env: NodeJS.ProcessEnv = process.env): AppConfig {
  const nodeEnv = env.NODE_ENV ?? 'development';
  const secret = env.JWT_SECRET ?? (nodeEnv === 'production' ? '' : 'local-development-secret-change-me');
  if (!secret) throw new Error('JWT_SECRET must be set in production');
  return {
    env: nodeEnv,
    port: num(env.PORT, 3000),
    db: {
      host: env.DB_HOST ?? '127.0.0.1',
      port: num(env.DB_PORT, 3307),
      name: env.DB_NAME ?? 'ostium',
      user: env.DB_USER ?? 'ostium',
      password: env.DB_PASSWORD ?? 'ostium-local',
      // Connections per process; every transaction holds one for its length.
      poolMax: num(env.DB_POOL_MAX, 20),
    },
    jwt: {
      secret,
      accessTtlSeconds: num(env.ACCESS_TOKEN_TTL_SECONDS, 15 * 60),
      refreshTtlSeconds: num(env.REFRESH_TOKEN_TTL_SECONDS, 7 * 24 * 3600),
    },
    loginRateLimit: { limit: num(env.LOGIN_RATE_LIMIT, 10), ttlMs: num(env.LOGIN_RATE_WINDOW_MS, 60_000) },
    clientDist: env.CLIENT_DIST ?? null,
    seedsDir: env.SEEDS_DIR ?? null,
    uploadDir: env.UPLOAD_DIR ?? '.data/uploads',
    publicUrl: env.PUBLIC_URL ?? `http://127.0.0.1:${num(env.PORT, 3000)}`,
    logLevel: env.LOG_LEVEL ?? (nodeEnv === 'test' ? 'warn' : 'info'),
    mail: {
      host: env.SMTP_HOST ?? '127.0.0.1',
      port: num(env.SMTP_PORT, 1025),
      user: env.SMTP_USER || undefined,
      password: env.SMTP_PASSWORD || undefined,
      from: env.MAIL_FROM ?? 'Ostium <desk@ostium.test>',
      secure: env.SMTP_SECURE === 'true',
    },
    sms: {
      accountSid: env.TWILIO_ACCOUNT_SID ?? 'AC00000000000000000000000000000000',
      authToken: env.TWILIO_AUTH_TOKEN ?? (nodeEnv === 'production' ? '' : 'local-fake-auth-token'),
      fromNumber: env.TWILIO_FROM_NUMBER ?? '+12025550199',
      apiBase: env.TWILIO_API_BASE || null,
    },
    messaging: {
      jobEnabled: env.MESSAGING_JOB !== 'off',
      intervalMs: num(env.MESSAGING_INTERVAL_MS, 2_000),
      batchSize: num(env.MESSAGING_BATCH_SIZE, 50),
      claimSeconds: num(env.MESSAGING_CLAIM_SECONDS, 120),
      maxAttempts: num(env.MESSAGING_MAX_ATTEMPTS, 10),
      backoffBaseMs: num(env.MESSAGING_BACKOFF_BASE_MS, 30_000),
      backoffMaxMs: num(env.MESSAGING_BACKOFF_MAX_MS, 30 * 60_000),
      sendTimeoutMs: num(env.MESSAGING_SEND_TIMEOUT_MS, 15_000),
      workerId: env.MESSAGING_WORKER_ID ?? `${process.pid}`,
      linkSecret: env.LINK_SECRET ?? `${secret}:links`,
    },
  };
}

export const APP_CONFIG = Symbol('APP_CONFIG');
