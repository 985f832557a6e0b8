// What a provider call came to, as the outbox job needs it: sent, worth trying again, never, or unknown.

export type SendFailureKind =
  /** Nothing was accepted (refused connection, HTTP 5xx, mail server busy): try again later. */
  | 'retryable'
  /** Trying again cannot help (invalid number, opted out, address refused). */
  | 'permanent'
  /** The request went out but no answer came (timeout, reset): the provider may have accepted it, so ask before sending again. */
  | 'unknown';

export type SendResult =
  | { ok: true; providerId: string | null; providerStatus: string | null }
  | { ok: false; kind: SendFailureKind; reason: string };

/** A message the provider holds, as found when checking whether an interrupted send went out. */
export interface ProviderMessage {
  sid: string;
  status: string | null;
}
