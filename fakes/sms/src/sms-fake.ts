// A local stand-in for the text-messaging provider's REST API (the 2010-04-01 Messages resource the
// official twilio SDK talks to), for development and tests. It records every message, answers with the
// real resource shape, walks each message through its delivery statuses calling the StatusCallback
// signed like the real service, plays patients replying through the signed inbound webhook, and can be
// told to misbehave. Nothing leaves the machine except the callbacks and webhooks to the URLs it is given.
// Error codes and messages follow the provider's documented error shape; the codes are from memory.
import { randomBytes, timingSafeEqual } from 'node:crypto';
import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import type { AddressInfo, Socket } from 'node:net';
import { BodyTooLargeError, parseForm, postForm, readBody, sendEmpty, sendJson } from './http.util.js';
import { renderPage } from './page.js';
import { countSegments } from './segments.js';
import { signTwilioRequest } from './signature.js';

export const API_VERSION = '2010-04-01';
export const DEFAULT_ACCOUNT_SID = 'AC00000000000000000000000000000000';
export const DEFAULT_AUTH_TOKEN = 'local-fake-auth-token';
/** The practice's sending number in development (NANP fictional range). */
export const DEFAULT_OUR_NUMBER = '+12025550199';

export type FaultMode = 'http500' | 'slow' | 'timeout' | 'none';
export const FAULT_MODES: readonly FaultMode[] = ['http500', 'slow', 'timeout', 'none'];

export interface FaultSpec {
  mode: FaultMode;
  /** Active for this long from now… */
  forMs?: number;
  /** …or for this many send requests (without either: until cleared). */
  count?: number;
  /** For `slow`: how long the answer waits (default 2000 ms). */
  delayMs?: number;
}

export interface ActiveFault {
  mode: Exclude<FaultMode, 'none'>;
  /** ISO instant the fault ends, when set with forMs. */
  until: string | null;
  /** Send requests it still applies to, when set with count. */
  remaining: number | null;
  delayMs: number;
  /** Requests it has hit so far. */
  hits: number;
}

export type MessageStatus = 'queued' | 'sent' | 'delivered' | 'undelivered' | 'failed' | 'received';
export type MessageDirection = 'outbound-api' | 'outbound-reply' | 'inbound';
export type FailingOutcome = 'undelivered' | 'failed';

export interface StatusStep {
  status: MessageStatus;
  at: string;
  errorCode: number | null;
}

export interface CallbackResult {
  status: MessageStatus;
  url: string;
  at: string;
  /** The HTTP status the callback got, or null when it got no answer. */
  httpStatus: number | null;
  error: string | null;
}

export interface WebhookResult {
  url: string;
  at: string;
  httpStatus: number | null;
  body: string;
  error: string | null;
  /** 'account' when signed with the account's token, 'other' when a test asked for a wrong signature. */
  signedWith: 'account' | 'other';
}

export interface FakeMessage {
  sid: string;
  accountSid: string;
  direction: MessageDirection;
  from: string | null;
  to: string;
  body: string;
  messagingServiceSid: string | null;
  mediaUrls: string[];
  numSegments: number;
  encoding: 'GSM-7' | 'UCS-2';
  status: MessageStatus;
  errorCode: number | null;
  errorMessage: string | null;
  statusCallback: string | null;
  dateCreated: string;
  dateUpdated: string;
  dateSent: string | null;
  history: StatusStep[];
  callbacks: CallbackResult[];
  /** For inbound messages: what the app's webhook answered. */
  webhook: WebhookResult | null;
}

export interface FakeStats {
  accepted: number;
  refused: number;
  refusedBy: { http500: number; timeout: number; auth: number; invalid: number };
  inbound: number;
  byStatus: Partial<Record<MessageStatus, number>>;
  callbacks: { sent: number; answered2xx: number; failed: number };
}

export interface ReplyRequest {
  from: string;
  body: string;
  to?: string;
  url?: string;
  /** Sign with this token instead of the account's (to test that the app refuses it). */
  signWith?: string;
}

export interface ReplyResult {
  status: number;
  body: string;
  sid: string;
}

export interface SmsFakeOptions {
  /** 0 (the default) picks a free port. */
  port?: number;
  host?: string;
  accountSid?: string;
  authToken?: string;
  /** Where patients' replies are posted (the app's inbound webhook). */
  inboundUrl?: string | null;
  /** Time between delivery status steps (default 200 ms). */
  statusDelayMs?: number;
  /** The number replies go to before anything was sent, and the sender for messaging-service sends. */
  defaultTo?: string;
  /** How long a callback or webhook may take before it counts as failed (default 5000 ms). */
  callbackTimeoutMs?: number;
}

export interface SmsFake {
  url: string;
  port: number;
  accountSid: string;
  /** Every message, oldest first (copies). */
  messages(filter?: { to?: string; direction?: MessageDirection }): FakeMessage[];
  stats(): FakeStats;
  /** Forgets messages, counters, the fault and failing numbers; cancels pending status steps. */
  reset(): void;
  setFault(fault: FaultSpec): ActiveFault | null;
  clearFault(): void;
  fault(): ActiveFault | null;
  /** Sends to these numbers end `undelivered` (or `failed`) with error 30003. Replaces the list. */
  setFailingNumbers(numbers: string[], outcome?: FailingOutcome): void;
  reply(reply: ReplyRequest): Promise<ReplyResult>;
  /** Resolves once no status step or callback is pending. */
  settled(): Promise<void>;
  close(): Promise<void>;
}

/** A bad control request: answered 400 naming the field. */
export class FakeInputError extends Error {
  constructor(
    readonly field: string,
    message: string,
  ) {
    super(message);
  }
}

// Provider error codes (from memory: check the provider's error dictionary before relying on them).
const ERR = {
  auth: 20003, // "Authenticate": missing or wrong credentials
  notFound: 20404, // the requested resource was not found
  method: 20004, // method not allowed
  internal: 20500, // internal server error
  toMissing: 21604, // "A 'To' phone number is required."
  bodyMissing: 21602, // "Message body is required."
  fromMissing: 21603, // "A 'From' phone number is required."
  toInvalid: 21211, // invalid 'To' phone number
  fromInvalid: 21212, // invalid 'From' number
  bodyTooLong: 21617, // body over 1,600 characters
  callbackInvalid: 21609, // invalid StatusCallback URL
  unreachable: 30003, // delivery: unreachable destination handset
} as const;

const E164 = /^\+[1-9]\d{6,14}$/;
const ALPHANUMERIC_SENDER = /^(?=.*[A-Za-z])[A-Za-z0-9 ]{1,11}$/;
const MAX_BODY_CHARS = 1600; // from memory: the provider's limit for one concatenated message

const rfc2822 = (d: Date): string => d.toUTCString().replace(/GMT$/, '+0000');
const hex32 = (): string => randomBytes(16).toString('hex');
const newSid = (prefix: string): string => prefix + hex32();

interface MessageRecord extends FakeMessage {
  /** Callbacks of one message go one after another, in status order. */
  chain: Promise<void>;
}

type ParsedFault = { mode: Exclude<FaultMode, 'none'>; until: number | null; remaining: number | null; delayMs: number; hits: number };

export async function startSmsFake(options: SmsFakeOptions = {}): Promise<SmsFake> {
  const host = options.host ?? '127.0.0.1';
  const accountSid = options.accountSid ?? DEFAULT_ACCOUNT_SID;
  const authToken = options.authToken ?? DEFAULT_AUTH_TOKEN;
  const inboundUrl = options.inboundUrl || null;
  const statusDelayMs = options.statusDelayMs ?? 200;
  const defaultTo = options.defaultTo ?? DEFAULT_OUR_NUMBER;
  const callbackTimeoutMs = options.callbackTimeoutMs ?? 5000;

  let records: MessageRecord[] = [];
  let lastFrom: string | null = null;
  let failing = new Map<string, FailingOutcome>();
  let fault: ParsedFault | null = null;
  let faultTimer: NodeJS.Timeout | null = null;
  const heldSockets = new Set<Socket>();
  const stepTimers = new Set<NodeJS.Timeout>();
  const otherTimers = new Set<NodeJS.Timeout>();
  const inFlight = new Set<AbortController>();
  let pending = 0;
  let waiters: Array<() => void> = [];
  let closing = false;
  const emptyStats = (): Omit<FakeStats, 'byStatus' | 'inbound'> => ({
    accepted: 0,
    refused: 0,
    refusedBy: { http500: 0, timeout: 0, auth: 0, invalid: 0 },
    callbacks: { sent: 0, answered2xx: 0, failed: 0 },
  });
  let counters = emptyStats();

  const workStarted = (): void => {
    pending += 1;
  };
  const workDone = (): void => {
    pending = Math.max(0, pending - 1);
    if (pending === 0) {
      const w = waiters;
      waiters = [];
      for (const fn of w) fn();
    }
  };

  function later(ms: number, fn: () => void, set: Set<NodeJS.Timeout>): void {
    const t = setTimeout(() => {
      set.delete(t);
      fn();
    }, ms);
    set.add(t);
  }

  // ---- messages and their delivery ------------------------------------------------------------

  function copy(r: MessageRecord): FakeMessage {
    const { chain: _chain, ...rest } = r;
    return structuredClone(rest);
  }

  function resource(r: FakeMessage): Record<string, unknown> {
    const base = `/${API_VERSION}/Accounts/${r.accountSid}/Messages/${r.sid}`;
    return {
      account_sid: r.accountSid,
      api_version: API_VERSION,
      body: r.body,
      date_created: rfc2822(new Date(r.dateCreated)),
      date_sent: r.dateSent ? rfc2822(new Date(r.dateSent)) : null,
      date_updated: rfc2822(new Date(r.dateUpdated)),
      direction: r.direction,
      error_code: r.errorCode,
      error_message: r.errorMessage,
      from: r.from,
      messaging_service_sid: r.messagingServiceSid,
      num_media: String(r.mediaUrls.length),
      num_segments: String(Math.max(1, r.numSegments)),
      price: null,
      price_unit: 'USD',
      sid: r.sid,
      status: r.status,
      subresource_uris: { media: `${base}/Media.json`, feedback: `${base}/Feedback.json` },
      to: r.to,
      uri: `${base}.json`,
    };
  }

  function addRecord(m: Omit<FakeMessage, 'dateCreated' | 'dateUpdated' | 'history' | 'callbacks' | 'numSegments' | 'encoding' | 'sid'> & { sid?: string }): MessageRecord {
    const now = new Date().toISOString();
    const seg = countSegments(m.body);
    const rec: MessageRecord = {
      ...m,
      sid: m.sid ?? newSid('SM'),
      numSegments: seg.segments,
      encoding: seg.encoding,
      dateCreated: now,
      dateUpdated: now,
      history: [{ status: m.status, at: now, errorCode: m.errorCode }],
      callbacks: [],
      webhook: m.webhook,
      chain: Promise.resolve(),
    };
    records.push(rec);
    return rec;
  }

  function startDelivery(rec: MessageRecord): void {
    const outcome = failing.get(rec.to);
    const steps: Array<[MessageStatus, number | null]> =
      outcome === 'failed'
        ? [['failed', ERR.unreachable]]
        : outcome === 'undelivered'
          ? [['sent', null], ['undelivered', ERR.unreachable]]
          : [['sent', null], ['delivered', null]];
    const step = (i: number): void => {
      workStarted();
      later(
        statusDelayMs,
        () => {
          if (records.includes(rec)) {
            applyStatus(rec, steps[i][0], steps[i][1]);
            if (i + 1 < steps.length) step(i + 1);
          }
          workDone();
        },
        stepTimers,
      );
    };
    step(0);
  }

  function applyStatus(rec: MessageRecord, status: MessageStatus, errorCode: number | null): void {
    const now = new Date().toISOString();
    rec.status = status;
    rec.errorCode = errorCode;
    rec.errorMessage = errorCode === ERR.unreachable ? 'Unreachable destination handset' : null;
    rec.dateUpdated = now;
    if (status === 'sent' && !rec.dateSent) rec.dateSent = now;
    rec.history.push({ status, at: now, errorCode });
    if (rec.statusCallback) {
      const url = rec.statusCallback;
      workStarted();
      rec.chain = rec.chain.then(() => sendStatusCallback(rec, url, status, errorCode)).finally(workDone);
    }
  }

  async function sendStatusCallback(rec: MessageRecord, url: string, status: MessageStatus, errorCode: number | null): Promise<void> {
    if (closing) return;
    const params: Record<string, string> = {
      MessageSid: rec.sid,
      MessageStatus: status,
      SmsSid: rec.sid,
      SmsStatus: status,
      AccountSid: rec.accountSid,
      From: rec.from ?? '',
      To: rec.to,
      ApiVersion: API_VERSION,
    };
    if (rec.messagingServiceSid) params.MessagingServiceSid = rec.messagingServiceSid;
    if (errorCode !== null) params.ErrorCode = String(errorCode);
    const result: CallbackResult = { status, url, at: new Date().toISOString(), httpStatus: null, error: null };
    // Counted in the counters of the moment it started, so a reset meanwhile starts clean.
    const tally = counters.callbacks;
    tally.sent += 1;
    const abort = new AbortController();
    inFlight.add(abort);
    try {
      // Signed over the callback URL exactly as the sender gave it.
      const answer = await postForm(url, params, { 'X-Twilio-Signature': signTwilioRequest(authToken, url, params) }, { timeoutMs: callbackTimeoutMs, signal: abort.signal });
      result.httpStatus = answer.status;
      if (answer.status >= 200 && answer.status < 300) tally.answered2xx += 1;
      else tally.failed += 1;
    } catch (e) {
      result.error = errorText(e);
      tally.failed += 1;
    } finally {
      inFlight.delete(abort);
    }
    rec.callbacks.push(result);
  }

  // ---- faults ---------------------------------------------------------------------------------

  function releaseHeld(): void {
    for (const s of heldSockets) s.destroy();
    heldSockets.clear();
  }

  function clearFault(): void {
    if (faultTimer) clearTimeout(faultTimer);
    faultTimer = null;
    fault = null;
    releaseHeld();
  }

  function publicFault(): ActiveFault | null {
    if (!fault) return null;
    return {
      mode: fault.mode,
      until: fault.until === null ? null : new Date(fault.until).toISOString(),
      remaining: fault.remaining,
      delayMs: fault.delayMs,
      hits: fault.hits,
    };
  }

  function setFault(spec: FaultSpec): ActiveFault | null {
    const parsed = parseFault(spec);
    clearFault();
    if (parsed.mode === 'none') return null;
    fault = { mode: parsed.mode, until: parsed.forMs === undefined ? null : Date.now() + parsed.forMs, remaining: parsed.count ?? null, delayMs: parsed.delayMs ?? 2000, hits: 0 };
    if (parsed.forMs !== undefined) {
      faultTimer = setTimeout(clearFault, parsed.forMs);
    }
    return publicFault();
  }

  /** The fault that applies to this send request, if any (a count-limited fault is used up here). */
  function takeFault(): ParsedFault | null {
    if (!fault) return null;
    if (fault.until !== null && Date.now() >= fault.until) {
      clearFault();
      return null;
    }
    fault.hits += 1;
    const applied = { ...fault };
    if (fault.remaining !== null) {
      fault.remaining -= 1;
      // Used up: later requests go through. Sockets it holds stay held until the fault is cleared,
      // set again, or the server closes, so the client meets a real timeout rather than a reset.
      if (fault.remaining <= 0) fault = null;
    }
    return applied;
  }

  // ---- inbound replies ------------------------------------------------------------------------

  async function reply(r: ReplyRequest): Promise<ReplyResult> {
    const input = parseReply(r);
    const url = input.url ?? inboundUrl;
    if (!url) throw new FakeInputError('url', 'url is required: no inbound URL is configured (SMS_FAKE_INBOUND_URL)');
    const to = input.to ?? lastFrom ?? defaultTo;
    const sid = newSid('SM');
    const seg = countSegments(input.body);
    // The field set of the provider's inbound message webhook (from memory); MessagingServiceSid is
    // left out because the fake's number is not in a messaging service.
    const params: Record<string, string> = {
      ToCountry: 'US',
      ToState: '',
      SmsMessageSid: sid,
      NumMedia: '0',
      ToCity: '',
      FromZip: '',
      SmsSid: sid,
      FromState: '',
      SmsStatus: 'received',
      FromCity: '',
      Body: input.body,
      FromCountry: 'US',
      To: to,
      ToZip: '',
      NumSegments: String(Math.max(1, seg.segments)),
      MessageSid: sid,
      AccountSid: accountSid,
      From: input.from,
      ApiVersion: API_VERSION,
    };
    const signature = signTwilioRequest(input.signWith ?? authToken, url, params);
    const rec = addRecord({
      sid,
      accountSid,
      direction: 'inbound',
      from: input.from,
      to,
      body: input.body,
      messagingServiceSid: null,
      mediaUrls: [],
      status: 'received',
      errorCode: null,
      errorMessage: null,
      statusCallback: null,
      dateSent: new Date().toISOString(),
      webhook: null,
    });
    const result: WebhookResult = { url, at: new Date().toISOString(), httpStatus: null, body: '', error: null, signedWith: input.signWith === undefined || input.signWith === authToken ? 'account' : 'other' };
    rec.webhook = result;
    const abort = new AbortController();
    inFlight.add(abort);
    workStarted();
    try {
      const answer = await postForm(url, params, { 'X-Twilio-Signature': signature }, { timeoutMs: callbackTimeoutMs, signal: abort.signal });
      result.httpStatus = answer.status;
      result.body = answer.body;
      if (answer.status >= 200 && answer.status < 300) sendTwimlReplies(answer.body, rec);
      return { status: answer.status, body: answer.body, sid };
    } catch (e) {
      result.error = errorText(e);
      throw new WebhookUnreachableError(`the inbound webhook ${url} did not answer: ${result.error}`);
    } finally {
      inFlight.delete(abort);
      workDone();
    }
  }

  /** A webhook may answer with messaging markup holding <Message> replies; the real service sends them. */
  function sendTwimlReplies(markup: string, inbound: MessageRecord): void {
    for (const body of twimlMessages(markup)) {
      const rec = addRecord({
        accountSid,
        direction: 'outbound-reply',
        from: inbound.to,
        to: inbound.from ?? '',
        body,
        messagingServiceSid: null,
        mediaUrls: [],
        status: 'queued',
        errorCode: null,
        errorMessage: null,
        statusCallback: null,
        dateSent: null,
        webhook: null,
      });
      counters.accepted += 1;
      startDelivery(rec);
    }
  }

  // ---- the REST API ---------------------------------------------------------------------------

  function apiError(res: ServerResponse, status: number, code: number, message: string): void {
    sendJson(res, status, { code, message, more_info: `https://www.twilio.com/docs/errors/${code}`, status });
  }

  function authorised(req: IncomingMessage): boolean {
    const header = req.headers.authorization ?? '';
    const m = /^Basic\s+(.+)$/i.exec(header);
    if (!m) return false;
    const decoded = Buffer.from(m[1], 'base64').toString('utf8');
    const expected = Buffer.from(`${accountSid}:${authToken}`);
    const given = Buffer.from(decoded);
    return given.length === expected.length && timingSafeEqual(given, expected);
  }

  async function handleApi(req: IncomingMessage, res: ServerResponse, url: URL): Promise<void> {
    const text = await readBody(req);
    const list = /^\/2010-04-01\/Accounts\/([^/]+)\/Messages\.json$/.exec(url.pathname);
    const one = /^\/2010-04-01\/Accounts\/([^/]+)\/Messages\/([^/]+)\.json$/.exec(url.pathname);
    const isSend = !!list && req.method === 'POST';

    if (isSend) {
      const f = takeFault();
      if (f?.mode === 'http500') {
        counters.refused += 1;
        counters.refusedBy.http500 += 1;
        return apiError(res, 500, ERR.internal, 'Internal Server Error');
      }
      if (f?.mode === 'timeout') {
        // The request has been read; no answer ever comes.
        counters.refused += 1;
        counters.refusedBy.timeout += 1;
        const socket = req.socket;
        heldSockets.add(socket);
        socket.once('close', () => heldSockets.delete(socket));
        return;
      }
      if (!authorised(req) || list[1] !== accountSid) {
        counters.refused += 1;
        counters.refusedBy.auth += 1;
        return apiError(res, 401, ERR.auth, 'Authenticate');
      }
      return send(req, res, text, f?.mode === 'slow' ? f.delayMs : 0);
    }

    if (!authorised(req)) return apiError(res, 401, ERR.auth, 'Authenticate');
    const pathSid = (list ?? one)?.[1];
    if (pathSid !== undefined && pathSid !== accountSid) return apiError(res, 401, ERR.auth, 'Authenticate');
    if (list && req.method === 'GET') return sendJson(res, 200, listPage(url));
    if (one && req.method === 'GET') {
      const rec = records.find((r) => r.sid === one[2]);
      if (!rec) return apiError(res, 404, ERR.notFound, `The requested resource ${url.pathname} was not found`);
      return sendJson(res, 200, resource(rec));
    }
    if (list || one) return apiError(res, 405, ERR.method, 'Method not allowed');
    return apiError(res, 404, ERR.notFound, `The requested resource ${url.pathname} was not found`);
  }

  function send(req: IncomingMessage, res: ServerResponse, text: string, delayMs: number): void {
    const form = parseForm(text);
    const first = (name: string): string | undefined => form.get(name)?.[0];
    const to = first('To')?.trim();
    const from = first('From')?.trim() || undefined;
    const service = first('MessagingServiceSid')?.trim() || undefined;
    const body = first('Body') ?? '';
    const media = form.get('MediaUrl') ?? [];
    const callback = first('StatusCallback')?.trim() || null;
    const invalid = (code: number, message: string): void => {
      counters.refused += 1;
      counters.refusedBy.invalid += 1;
      apiError(res, 400, code, message);
    };
    if (!to) return invalid(ERR.toMissing, "A 'To' phone number is required.");
    if (!E164.test(to)) return invalid(ERR.toInvalid, `The 'To' number ${to} is not a valid phone number.`);
    if (!from && !service) return invalid(ERR.fromMissing, "A 'From' phone number is required.");
    if (from && !E164.test(from) && !ALPHANUMERIC_SENDER.test(from)) return invalid(ERR.fromInvalid, `The 'From' number ${from} is not a valid phone number, shortcode, or alphanumeric sender ID.`);
    if (body === '' && media.length === 0) return invalid(ERR.bodyMissing, 'Message body is required.');
    if ([...body].length > MAX_BODY_CHARS) return invalid(ERR.bodyTooLong, `The concatenated message body exceeds the ${MAX_BODY_CHARS} character limit.`);
    if (callback && !isHttpUrl(callback)) return invalid(ERR.callbackInvalid, `The StatusCallback URL ${callback} is not a valid URL.`);

    const sender = from ?? defaultTo;
    const rec = addRecord({
      accountSid,
      direction: 'outbound-api',
      from: sender,
      to,
      body,
      messagingServiceSid: service ?? null,
      mediaUrls: media,
      status: 'queued',
      errorCode: null,
      errorMessage: null,
      statusCallback: callback,
      dateSent: null,
      webhook: null,
    });
    counters.accepted += 1;
    lastFrom = sender;
    // The answer describes the message as accepted; delivery goes on whether or not the answer is slow.
    const answer = resource(rec);
    startDelivery(rec);
    const headers = { 'Twilio-Request-Id': newSid('RQ') };
    if (delayMs > 0) later(delayMs, () => sendJson(res, 201, answer, headers), otherTimers);
    else sendJson(res, 201, answer, headers);
    void req;
  }

  function listPage(url: URL): Record<string, unknown> {
    const q = url.searchParams;
    const to = q.get('To');
    const from = q.get('From');
    const onDay = q.get('DateSent');
    const before = q.get('DateSent<');
    const after = q.get('DateSent>');
    const pageSize = clampInt(q.get('PageSize'), 50, 1, 1000);
    const page = clampInt(q.get('Page'), 0, 0, 1_000_000);
    const sentAt = (r: FakeMessage): number => Date.parse(r.dateSent ?? r.dateCreated);
    const matching = records
      .filter((r) => (!to || r.to === to) && (!from || r.from === from))
      .filter((r) => !onDay || new Date(sentAt(r)).toISOString().slice(0, 10) === onDay.slice(0, 10))
      .filter((r) => !before || sentAt(r) <= Date.parse(before))
      .filter((r) => !after || sentAt(r) >= Date.parse(after))
      .reverse(); // newest first, like the real list
    const slice = matching.slice(page * pageSize, (page + 1) * pageSize);
    const path = url.pathname;
    const pageUri = (n: number): string => {
      const p = new URLSearchParams();
      for (const [k, v] of q) if (k !== 'Page' && k !== 'PageSize' && k !== 'PageToken') p.append(k, v);
      p.set('PageSize', String(pageSize));
      p.set('Page', String(n));
      return `${path}?${p.toString()}`;
    };
    const start = page * pageSize;
    return {
      end: slice.length ? start + slice.length - 1 : start,
      first_page_uri: pageUri(0),
      messages: slice.map(resource),
      next_page_uri: (page + 1) * pageSize < matching.length ? pageUri(page + 1) : null,
      page,
      page_size: pageSize,
      previous_page_uri: page > 0 ? pageUri(page - 1) : null,
      start,
      uri: `${path}${url.search}`,
    };
  }

  // ---- the control API and the page -----------------------------------------------------------

  function stats(): FakeStats {
    const byStatus: Partial<Record<MessageStatus, number>> = {};
    for (const r of records) byStatus[r.status] = (byStatus[r.status] ?? 0) + 1;
    return structuredClone({ ...counters, inbound: records.filter((r) => r.direction === 'inbound').length, byStatus });
  }

  function messages(filter: { to?: string; direction?: MessageDirection } = {}): FakeMessage[] {
    return records.filter((r) => (!filter.to || r.to === filter.to) && (!filter.direction || r.direction === filter.direction)).map(copy);
  }

  function forgetMessages(): void {
    for (const t of stepTimers) clearTimeout(t);
    // Cancelled steps will never finish their work items.
    pending -= stepTimers.size;
    stepTimers.clear();
    records = [];
    counters = emptyStats();
    lastFrom = null;
    if (pending <= 0) {
      pending = 0;
      const w = waiters;
      waiters = [];
      for (const fn of w) fn();
    }
  }

  function reset(): void {
    forgetMessages();
    clearFault();
    failing = new Map();
  }

  function setFailingNumbers(numbers: string[], outcome: FailingOutcome = 'undelivered'): void {
    failing = new Map(numbers.map((n) => [n, outcome]));
  }

  function info(): Record<string, unknown> {
    return {
      accountSid,
      inboundUrl,
      statusDelayMs,
      defaultTo,
      lastFrom,
      fault: publicFault(),
      failingNumbers: [...failing].map(([number, outcome]) => ({ number, outcome })),
    };
  }

  async function handleControl(req: IncomingMessage, res: ServerResponse, url: URL): Promise<void> {
    const route = `${req.method} ${url.pathname}`;
    const text = await readBody(req);
    const json = (): Record<string, unknown> => parseJsonObject(text);
    switch (route) {
      case 'GET /fake/messages': {
        const to = url.searchParams.get('to') ?? undefined;
        return sendJson(res, 200, messages({ to }));
      }
      case 'DELETE /fake/messages':
        forgetMessages();
        return sendEmpty(res);
      case 'POST /fake/reset':
        reset();
        return sendEmpty(res);
      case 'GET /fake/stats':
        return sendJson(res, 200, stats());
      case 'GET /fake/info':
        return sendJson(res, 200, info());
      case 'GET /fake/faults':
        return sendJson(res, 200, { fault: publicFault() });
      case 'POST /fake/faults':
        return sendJson(res, 200, { fault: setFault(json() as unknown as FaultSpec) });
      case 'DELETE /fake/faults':
        clearFault();
        return sendEmpty(res);
      case 'GET /fake/numbers/failing':
        return sendJson(res, 200, { numbers: [...failing.keys()], outcomes: Object.fromEntries(failing) });
      case 'POST /fake/numbers/failing': {
        const { numbers, outcome } = parseFailing(json());
        setFailingNumbers(numbers, outcome);
        return sendJson(res, 200, { numbers, outcome });
      }
      case 'POST /fake/reply': {
        const body = json();
        try {
          const r = await reply(body as unknown as ReplyRequest);
          return sendJson(res, 200, r);
        } catch (e) {
          if (e instanceof WebhookUnreachableError) return sendJson(res, 502, { statusCode: 502, message: e.message });
          throw e;
        }
      }
      default:
        return sendJson(res, 404, { statusCode: 404, message: `no control route ${route}` });
    }
  }

  async function handle(req: IncomingMessage, res: ServerResponse): Promise<void> {
    const url = new URL(req.url ?? '/', 'http://sms-fake.invalid');
    try {
      if (url.pathname.startsWith(`/${API_VERSION}/`)) return await handleApi(req, res, url);
      if (url.pathname.startsWith('/fake/')) return await handleControl(req, res, url);
      if (url.pathname === '/' && (req.method === 'GET' || req.method === 'HEAD')) {
        const html = renderPage();
        res.writeHead(200, { 'Content-Type': 'text/html; charset=utf-8', 'Content-Length': Buffer.byteLength(html), 'Cache-Control': 'no-store' });
        return void res.end(req.method === 'HEAD' ? undefined : html);
      }
      return sendJson(res, 404, { statusCode: 404, message: `nothing at ${url.pathname}` });
    } catch (e) {
      if (e instanceof FakeInputError) return sendJson(res, 400, { statusCode: 400, message: e.message, errors: [{ field: e.field, message: e.message }] });
      if (e instanceof BodyTooLargeError) return sendJson(res, 413, { statusCode: 413, message: e.message });
      return sendJson(res, 500, { statusCode: 500, message: errorText(e) });
    }
  }

  const server: Server = createServer((req, res) => void handle(req, res));
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 0, host, () => {
      server.off('error', reject);
      resolve();
    });
  });
  const port = (server.address() as AddressInfo).port;

  return {
    url: `http://${host}:${port}`,
    port,
    accountSid,
    messages,
    stats,
    reset,
    setFault,
    clearFault,
    fault: publicFault,
    setFailingNumbers,
    reply,
    settled: () => (pending === 0 ? Promise.resolve() : new Promise<void>((resolve) => waiters.push(resolve))),
    async close() {
      if (closing) return;
      closing = true;
      for (const t of stepTimers) clearTimeout(t);
      for (const t of otherTimers) clearTimeout(t);
      stepTimers.clear();
      otherTimers.clear();
      for (const a of inFlight) a.abort();
      clearFault();
      const closed = new Promise<void>((resolve) => server.close(() => resolve()));
      server.closeAllConnections();
      await closed;
      pending = 0;
      for (const fn of waiters) fn();
      waiters = [];
    },
  };
}

export class WebhookUnreachableError extends Error {}

// ---- input checks for the control API (each names the field it refuses) --------------------

function parseJsonObject(text: string): Record<string, unknown> {
  if (text.trim() === '') return {};
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch {
    throw new FakeInputError('body', 'the request body is not valid JSON');
  }
  if (typeof value !== 'object' || value === null || Array.isArray(value)) throw new FakeInputError('body', 'the request body must be a JSON object');
  return value as Record<string, unknown>;
}

function onlyFields(value: Record<string, unknown>, allowed: string[]): void {
  for (const k of Object.keys(value)) if (!allowed.includes(k)) throw new FakeInputError(k, `${k} is not a known field (expected ${allowed.join(', ')})`);
}

function optionalInt(value: Record<string, unknown>, field: string, min: number): number | undefined {
  const v = value[field];
  if (v === undefined || v === null) return undefined;
  if (typeof v !== 'number' || !Number.isInteger(v) || v < min) throw new FakeInputError(field, `${field} must be a whole number of at least ${min}`);
  return v;
}

function parseFault(spec: FaultSpec): { mode: FaultMode; forMs?: number; count?: number; delayMs?: number } {
  const value = (typeof spec === 'object' && spec !== null ? spec : {}) as unknown as Record<string, unknown>;
  onlyFields(value, ['mode', 'forMs', 'count', 'delayMs']);
  if (!FAULT_MODES.includes(value.mode as FaultMode)) throw new FakeInputError('mode', `mode must be one of ${FAULT_MODES.join(', ')}`);
  return {
    mode: value.mode as FaultMode,
    forMs: optionalInt(value, 'forMs', 1),
    count: optionalInt(value, 'count', 1),
    delayMs: optionalInt(value, 'delayMs', 0),
  };
}

function parseFailing(value: Record<string, unknown>): { numbers: string[]; outcome: FailingOutcome } {
  onlyFields(value, ['numbers', 'outcome']);
  const numbers = value.numbers;
  if (!Array.isArray(numbers) || !numbers.every((n) => typeof n === 'string' && E164.test(n))) throw new FakeInputError('numbers', 'numbers must be a list of E.164 phone numbers');
  const outcome = value.outcome ?? 'undelivered';
  if (outcome !== 'undelivered' && outcome !== 'failed') throw new FakeInputError('outcome', 'outcome must be undelivered or failed');
  return { numbers: numbers as string[], outcome };
}

function parseReply(r: ReplyRequest): Required<Pick<ReplyRequest, 'from' | 'body'>> & Omit<ReplyRequest, 'from' | 'body'> {
  const value = (typeof r === 'object' && r !== null ? r : {}) as unknown as Record<string, unknown>;
  onlyFields(value, ['from', 'body', 'to', 'url', 'signWith']);
  if (typeof value.from !== 'string' || !E164.test(value.from.trim())) throw new FakeInputError('from', 'from must be an E.164 phone number such as +12025550142');
  if (typeof value.body !== 'string') throw new FakeInputError('body', 'body must be a string');
  if ([...value.body].length > MAX_BODY_CHARS) throw new FakeInputError('body', `body must be at most ${MAX_BODY_CHARS} characters`);
  if (value.to !== undefined && (typeof value.to !== 'string' || !E164.test(value.to.trim()))) throw new FakeInputError('to', 'to must be an E.164 phone number');
  if (value.url !== undefined && (typeof value.url !== 'string' || !isHttpUrl(value.url))) throw new FakeInputError('url', 'url must be an http(s) URL');
  if (value.signWith !== undefined && (typeof value.signWith !== 'string' || value.signWith === '')) throw new FakeInputError('signWith', 'signWith must be a non-empty string');
  return {
    from: value.from.trim(),
    body: value.body,
    to: (value.to as string | undefined)?.trim(),
    url: value.url as string | undefined,
    signWith: value.signWith as string | undefined,
  };
}

function isHttpUrl(s: string): boolean {
  try {
    const u = new URL(s);
    return u.protocol === 'http:' || u.protocol === 'https:';
  } catch {
    return false;
  }
}

function clampInt(raw: string | null, fallback: number, min: number, max: number): number {
  const n = raw === null ? NaN : Number(raw);
  return Number.isInteger(n) ? Math.min(max, Math.max(min, n)) : fallback;
}

function errorText(e: unknown): string {
  if (e instanceof Error) return (e as NodeJS.ErrnoException).code ? `${(e as NodeJS.ErrnoException).code}: ${e.message}` : e.message;
  return String(e);
}

const XML_ENTITIES: Record<string, string> = { amp: '&', lt: '<', gt: '>', quot: '"', apos: "'" };

/** The texts of <Message> replies in messaging markup (with or without an inner <Body>). */
export function twimlMessages(markup: string): string[] {
  const out: string[] = [];
  for (const m of markup.matchAll(/<Message(?:\s[^>]*)?>([\s\S]*?)<\/Message>/g)) {
    const inner = /<Body(?:\s[^>]*)?>([\s\S]*?)<\/Body>/.exec(m[1])?.[1] ?? m[1].replace(/<[^>]*>/g, '');
    const text = inner.replace(/&(#x[0-9a-f]+|#\d+|\w+);/gi, (all, ent: string) => {
      if (ent[0] === '#') return String.fromCodePoint(ent[1].toLowerCase() === 'x' ? parseInt(ent.slice(2), 16) : parseInt(ent.slice(1), 10));
      return XML_ENTITIES[ent] ?? all;
    });
    if (text.trim()) out.push(text.trim());
  }
  return out;
}
