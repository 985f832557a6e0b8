#!/usr/bin/env node
// Runs the SMS stand-in on its own: `node fakes/sms/dist/main.js` (the start script does this).
import { DEFAULT_ACCOUNT_SID, DEFAULT_AUTH_TOKEN, startSmsFake } from './sms-fake.js';

function intFrom(name: string, fallback: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw === '') return fallback;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 0) {
    console.error(`[sms-fake] ${name} must be a whole number, got "${raw}"`);
    process.exit(1);
  }
  return n;
}

const fake = await startSmsFake({
  port: intFrom('SMS_FAKE_PORT', 4010),
  accountSid: process.env.TWILIO_ACCOUNT_SID || DEFAULT_ACCOUNT_SID,
  authToken: process.env.TWILIO_AUTH_TOKEN || DEFAULT_AUTH_TOKEN,
  inboundUrl: process.env.SMS_FAKE_INBOUND_URL || null,
  statusDelayMs: intFrom('SMS_FAKE_STATUS_DELAY_MS', 200),
}).catch((e: NodeJS.ErrnoException) => {
  const why = e.code === 'EADDRINUSE' ? `port ${process.env.SMS_FAKE_PORT ?? 4010} is in use (another stand-in already running?)` : e.message;
  console.error(`[sms-fake] could not start: ${why}`);
  process.exit(1);
});

console.log(`[sms-fake] SMS stand-in on ${fake.url} (account ${fake.accountSid}; replies → ${process.env.SMS_FAKE_INBOUND_URL || 'no inbound URL'})`);

let stopping = false;
const stop = (): void => {
  if (stopping) return;
  stopping = true;
  void fake.close().then(() => process.exit(0));
};
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
