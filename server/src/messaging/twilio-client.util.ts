// The official twilio SDK, unchanged, pointed somewhere else by configuration only: its HTTP client is a
// RequestClient subclass that swaps the provider's origin for config.sms.apiBase (the local fake in
// development and tests). Outside production without an apiBase there is no client at all, so a text
// can never reach the real network from a developer's machine or a test run.
import twilio from 'twilio';
import type { AppConfig } from '../config/configuration.js';

export type TwilioClient = ReturnType<typeof twilio>;
type RequestOptions = Parameters<InstanceType<typeof twilio.RequestClient>['request']>[0];

export const TEXTS_OFF_REASON = 'TWILIO_API_BASE is not set; texts are off outside production';

/** The provider's REST origins the SDK builds URLs with (api.twilio.com, or api.<edge>.<region>.twilio.com). */
const PROVIDER_ORIGIN = /^https:\/\/api(?:\.[a-z0-9-]+)*\.twilio\.com(?=[/?]|$)/i;

/**
 * `https://api.twilio.com/2010-04-01/…` → `<apiBase>/2010-04-01/…`. Any other URL is refused rather
 * than sent on, so a redirected client can only ever talk to apiBase.
 */
export function rebaseProviderUrl(uri: string, apiBase: string): string {
  if (!PROVIDER_ORIGIN.test(uri)) throw new Error(`refusing to send ${uri.split('?')[0]} anywhere but ${apiBase} while TWILIO_API_BASE is set`);
  return apiBase.replace(/\/+$/, '') + uri.replace(PROVIDER_ORIGIN, '');
}

/** The SDK's own request client with every provider URL rewritten to apiBase. */
export class RebasedRequestClient extends twilio.RequestClient {
  constructor(
    readonly apiBase: string,
    options: ConstructorParameters<typeof twilio.RequestClient>[0] = {},
  ) {
    super(options);
  }

  override request<TData>(opts: RequestOptions & { data?: TData }) {
    return super.request<TData>({ ...opts, uri: rebaseProviderUrl(opts.uri, this.apiBase) });
  }
}

export type TwilioClientHandle = { client: TwilioClient; disabledReason: null } | { client: null; disabledReason: string };

/** The client the senders use, or the reason there is none (never a client that could leak to the real API). */
export function createTwilioClient(config: Pick<AppConfig, 'env' | 'sms' | 'messaging'>): TwilioClientHandle {
  const { accountSid, authToken, apiBase } = config.sms;
  const timeout = config.messaging.sendTimeoutMs;
  if (!apiBase && config.env !== 'production') return { client: null, disabledReason: TEXTS_OFF_REASON };
  if (!authToken) return { client: null, disabledReason: 'TWILIO_AUTH_TOKEN is not set; texts are off' };
  // autoRetry stays off: the outbox owns retries, so a 429 comes back as an error and is retried with backoff.
  const httpClient = apiBase ? new RebasedRequestClient(apiBase, { timeout, keepAlive: true }) : new twilio.RequestClient({ timeout, keepAlive: true });
  return { client: twilio(accountSid, authToken, { httpClient }), disabledReason: null };
}
