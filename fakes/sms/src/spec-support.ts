// Test helpers: an SDK client pointed at the fake, and a tiny receiver for callbacks and webhooks.
import { createServer, type IncomingMessage, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import twilio from 'twilio';

type RequestOptions = Parameters<InstanceType<typeof twilio.RequestClient>['request']>[0];

/** The SDK's own HTTP client with the API host rewritten to the fake (the SDK's `httpClient` option). */
export class FakeApiRequestClient extends twilio.RequestClient {
  constructor(
    private readonly base: string,
    opts?: ConstructorParameters<typeof twilio.RequestClient>[0],
  ) {
    super(opts);
  }

  override request<TData>(opts: RequestOptions & { data?: TData }) {
    return super.request<TData>({ ...opts, uri: opts.uri.replace(/^https:\/\/api\.twilio\.com/, this.base) });
  }
}

export function sdkClient(base: string, accountSid: string, authToken: string, timeoutMs?: number): twilio.Twilio {
  return twilio(accountSid, authToken, { httpClient: new FakeApiRequestClient(base, timeoutMs ? { timeout: timeoutMs } : undefined) });
}

export interface Received {
  path: string;
  signature: string;
  contentType: string;
  params: Record<string, string>;
}

export interface Receiver {
  url: string;
  received: Received[];
  /** Sets what the receiver answers. */
  answer(status: number, body?: string, contentType?: string): void;
  close(): Promise<void>;
}

export async function startReceiver(): Promise<Receiver> {
  const received: Received[] = [];
  let reply = { status: 204, body: '', contentType: 'text/plain' };
  const server: Server = createServer((req: IncomingMessage, res) => {
    const chunks: Buffer[] = [];
    req.on('data', (c: Buffer) => chunks.push(c));
    req.on('end', () => {
      received.push({
        path: req.url ?? '',
        signature: String(req.headers['x-twilio-signature'] ?? ''),
        contentType: String(req.headers['content-type'] ?? ''),
        params: Object.fromEntries(new URLSearchParams(Buffer.concat(chunks).toString('utf8'))),
      });
      res.writeHead(reply.status, { 'Content-Type': reply.contentType });
      res.end(reply.body);
    });
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const { port } = server.address() as AddressInfo;
  return {
    url: `http://127.0.0.1:${port}`,
    received,
    answer(status, body = '', contentType = 'text/plain') {
      reply = { status, body, contentType };
    },
    close: () =>
      new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      }),
  };
}
