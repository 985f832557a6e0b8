import { createServer } from 'node:net';

/** The local SMTP inbox started by `npm test` (maildev): SMTP 1026, REST API 1081. */
export const SMTP_PORT = Number(process.env.SMTP_PORT ?? 1026);
export const INBOX_URL = `http://127.0.0.1:${process.env.MAIL_WEB_PORT ?? 1081}`;

export interface InboxMail {
  id: string;
  subject: string;
  text?: string;
  html?: string;
  to: { address: string; name: string }[];
  from: { address: string; name: string }[];
}

async function list(): Promise<InboxMail[]> {
  // maildev 3 serves the list at /api/email; older versions at /email.
  for (const path of ['/api/email', '/email']) {
    const res = await fetch(`${INBOX_URL}${path}`).catch(() => null);
    if (res?.ok) return (await res.json()) as InboxMail[];
  }
  throw new Error(`the mail inbox at ${INBOX_URL} is not answering; start maildev (see DEVELOPERS.md)`);
}

/** Polls the inbox until a mail matches (up to `timeoutMs`), else null. */
export async function waitForMail(match: (m: InboxMail) => boolean, timeoutMs = 5_000): Promise<InboxMail | null> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const hit = (await list()).find(match);
    if (hit || Date.now() > until) return hit ?? null;
    await new Promise((r) => setTimeout(r, 200));
  }
}

/** A local port with nothing listening on it, for a mail server that refuses connections. */
export async function closedPort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.once('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const { port } = s.address() as { port: number };
      s.close(() => resolve(port));
    });
  });
}
