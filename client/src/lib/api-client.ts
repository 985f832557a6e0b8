import type { ApiErrorBody, LoginResponse } from '@ostium/shared';
import { sessionStore } from './session';

/** Every failed call becomes one of these; screens decide how to show it. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly errors: { field: string; message: string }[] = [],
    /** The parsed error body, for answers that carry more than a message (e.g. a 409's `conflicts`). */
    readonly body: unknown = undefined,
  ) {
    super(message);
  }

  /** The message for one field, for form inputs. */
  field(name: string) {
    return this.errors.find((e) => e.field === name)?.message;
  }
}

export interface RequestOptions {
  method?: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
  body?: unknown;
  query?: Record<string, string | number | boolean | undefined | null>;
  signal?: AbortSignal;
  headers?: Record<string, string>;
  /** Progress of an upload (0..1); uses XMLHttpRequest because fetch cannot report it. */
  onUploadProgress?: (fraction: number) => void;
}

let refreshing: Promise<boolean> | null = null;

/** Asks for a new access token with the session cookie; one request at a time. */
export function refreshSession(): Promise<boolean> {
  refreshing ??= fetch('/api/auth/refresh', { method: 'POST', credentials: 'same-origin' })
    .then(async (res) => {
      if (!res.ok) {
        sessionStore.set(null);
        return false;
      }
      sessionStore.set((await res.json()) as LoginResponse);
      return true;
    })
    .catch(() => false)
    .finally(() => {
      refreshing = null;
    });
  return refreshing;
}

function url(path: string, query?: RequestOptions['query']) {
  const q = new URLSearchParams();
  for (const [k, v] of Object.entries(query ?? {})) if (v !== undefined && v !== null && v !== '') q.set(k, String(v));
  const s = q.toString();
  return `/api${path}${s ? `?${s}` : ''}`;
}

async function toError(res: Response): Promise<ApiError> {
  let body: Partial<ApiErrorBody> = {};
  try {
    body = await res.json();
  } catch {
    /* not JSON: fall through to the status text */
  }
  return new ApiError(res.status, body.message ?? (res.statusText || `Request failed (${res.status})`), body.errors ?? [], body);
}

function xhr<T>(method: string, target: string, body: FormData, headers: Record<string, string>, onProgress: (f: number) => void, signal?: AbortSignal): Promise<{ status: number; json: () => Promise<T>; ok: boolean; statusText: string }> {
  return new Promise((resolve, reject) => {
    const x = new XMLHttpRequest();
    x.open(method, target);
    for (const [k, v] of Object.entries(headers)) x.setRequestHeader(k, v);
    x.upload.onprogress = (e) => e.lengthComputable && onProgress(e.loaded / e.total);
    x.onload = () => resolve({ status: x.status, ok: x.status >= 200 && x.status < 300, statusText: x.statusText, json: async () => JSON.parse(x.responseText || 'null') });
    x.onerror = () => reject(new ApiError(0, 'The server could not be reached'));
    signal?.addEventListener('abort', () => x.abort());
    x.send(body);
  });
}

export async function api<T>(path: string, opts: RequestOptions = {}, retried = false): Promise<T> {
  const headers: Record<string, string> = { Accept: 'application/json', ...opts.headers };
  const token = sessionStore.get()?.accessToken;
  if (token) headers.Authorization = `Bearer ${token}`;
  const isForm = typeof FormData !== 'undefined' && opts.body instanceof FormData;
  if (opts.body !== undefined && !isForm) headers['Content-Type'] = 'application/json';
  const method = opts.method ?? 'GET';
  const target = url(path, opts.query);
  let res: Response | Awaited<ReturnType<typeof xhr<T>>>;
  try {
    res =
      isForm && opts.onUploadProgress
        ? await xhr<T>(method, target, opts.body as FormData, headers, opts.onUploadProgress, opts.signal)
        : await fetch(target, {
            method,
            headers,
            credentials: 'same-origin',
            signal: opts.signal,
            body: opts.body === undefined ? undefined : isForm ? (opts.body as FormData) : JSON.stringify(opts.body),
          });
  } catch (e) {
    if (e instanceof ApiError) throw e;
    if ((e as Error).name === 'AbortError') throw e;
    throw new ApiError(0, 'The server could not be reached; check the connection and try again');
  }
  // An expired access token: refresh once and repeat the call, so the page keeps its state.
  if (res.status === 401 && !retried && !path.startsWith('/auth/')) {
    if (await refreshSession()) return api<T>(path, opts, true);
  }
  if (!res.ok) throw 'headers' in res ? await toError(res as Response) : await toErrorFromXhr(res);
  if (res.status === 204) return undefined as T;
  return (await res.json()) as T;
}

async function toErrorFromXhr(res: { status: number; statusText: string; json: () => Promise<unknown> }) {
  let body: Partial<ApiErrorBody> = {};
  try {
    body = (await res.json()) as ApiErrorBody;
  } catch {
    /* not JSON */
  }
  return new ApiError(res.status, body?.message ?? `Request failed (${res.status})`, body?.errors ?? [], body);
}

/** Downloads a protected file (attachments, exports) with the token, as a blob URL. */
export async function apiBlob(path: string): Promise<Blob> {
  const token = sessionStore.get()?.accessToken;
  const res = await fetch(url(path), { headers: token ? { Authorization: `Bearer ${token}` } : {} });
  if (res.status === 401 && (await refreshSession())) return apiBlob(path);
  if (!res.ok) throw await toError(res);
  return res.blob();
}

/**
 * Opens a protected file in a new tab. The tab is opened before the download so the browser counts it as
 * the user's click and does not block it as a pop-up.
 */
export async function openBlobInNewTab(path: string): Promise<void> {
  const tab = window.open('', '_blank');
  try {
    const url = URL.createObjectURL(await apiBlob(path));
    if (tab) tab.location.href = url;
    else window.location.assign(url);
    // The tab has loaded the blob by then; keeping it longer would hold the file in memory.
    setTimeout(() => URL.revokeObjectURL(url), 60_000);
  } catch (e) {
    tab?.close();
    throw e;
  }
}
