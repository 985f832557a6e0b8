// Small HTTP helpers on Node's own http module: reading bodies, answering JSON, posting forms.
import { request as httpRequest, type IncomingMessage, type ServerResponse } from 'node:http';
import { request as httpsRequest } from 'node:https';

export const MAX_BODY_BYTES = 1024 * 1024;

export class BodyTooLargeError extends Error {}

export function readBody(req: IncomingMessage, limit = MAX_BODY_BYTES): Promise<string> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let size = 0;
    req.on('data', (chunk: Buffer) => {
      size += chunk.length;
      if (size > limit) {
        reject(new BodyTooLargeError(`body larger than ${limit} bytes`));
        req.resume();
        return;
      }
      chunks.push(chunk);
    });
    req.on('end', () => resolve(Buffer.concat(chunks).toString('utf8')));
    req.on('error', reject);
  });
}

export function sendJson(res: ServerResponse, status: number, value: unknown, headers: Record<string, string> = {}): void {
  if (res.writableEnded || res.destroyed) return;
  const body = JSON.stringify(value, null, 2);
  res.writeHead(status, { 'Content-Type': 'application/json; charset=utf-8', 'Content-Length': Buffer.byteLength(body), ...headers });
  res.end(body);
}

export function sendEmpty(res: ServerResponse, status = 204): void {
  if (res.writableEnded || res.destroyed) return;
  res.writeHead(status);
  res.end();
}

/** Form fields as the wire carries them: a repeated name keeps every value in order. */
export function parseForm(text: string): Map<string, string[]> {
  const out = new Map<string, string[]>();
  for (const [name, value] of new URLSearchParams(text)) {
    const list = out.get(name);
    if (list) list.push(value);
    else out.set(name, [value]);
  }
  return out;
}

export function encodeForm(params: Record<string, string>): string {
  return new URLSearchParams(params).toString();
}

export interface PostResult {
  status: number;
  body: string;
}

/** POSTs a form and resolves with the answer; rejects on a network error, a timeout or an abort. */
export function postForm(
  url: string,
  params: Record<string, string>,
  headers: Record<string, string>,
  opts: { timeoutMs: number; signal?: AbortSignal },
): Promise<PostResult> {
  const target = new URL(url);
  const send = target.protocol === 'https:' ? httpsRequest : httpRequest;
  const body = encodeForm(params);
  return new Promise((resolve, reject) => {
    const req = send(
      target,
      {
        method: 'POST',
        signal: opts.signal,
        headers: {
          'Content-Type': 'application/x-www-form-urlencoded; charset=utf-8',
          'Content-Length': Buffer.byteLength(body),
          'User-Agent': 'ostium-sms-stand-in/0.1',
          ...headers,
        },
      },
      (res) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => resolve({ status: res.statusCode ?? 0, body: Buffer.concat(chunks).toString('utf8') }));
        res.on('error', reject);
      },
    );
    req.setTimeout(opts.timeoutMs, () => req.destroy(new Error(`no answer within ${opts.timeoutMs} ms`)));
    req.on('error', reject);
    req.end(body);
  });
}
