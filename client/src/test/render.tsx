import { MantineProvider } from '@mantine/core';
import { render as rtl } from '@testing-library/react';
import type { ReactElement } from 'react';
import { createMemoryRouter, RouterProvider, type RouteObject } from 'react-router-dom';
import { AppProvider, makeQueryClient } from '../app/provider';
import { theme } from '../app/theme';

/**
 * Renders routes inside the real theme, a fresh QueryClient and a memory router. The inner provider's
 * test mode (Mantine's own advice) drops transitions and portals: happy-dom never finishes a transition,
 * so dropdowns, tooltips and modals would stay `display: none`.
 */
export function renderRoutes(routes: RouteObject[], path = '/') {
  const router = createMemoryRouter(routes, { initialEntries: [path] });
  const queryClient = makeQueryClient();
  const utils = rtl(
    <AppProvider queryClient={queryClient}>
      <MantineProvider theme={theme} env="test">
        <RouterProvider router={router} />
      </MantineProvider>
    </AppProvider>,
  );
  return { ...utils, router, queryClient };
}

export const renderPage = (element: ReactElement, path = '/') => renderRoutes([{ path: '*', element }], path);

/** One recorded request. `query` is the parsed query string; multipart bodies become plain objects. */
export interface MockCall {
  key: string;
  body: unknown;
  url: string;
  query: URLSearchParams;
  headers: Record<string, string>;
}

/** A file part of a multipart body, as recorded by mockFetch. */
export interface MockFilePart {
  name: string;
  type: string;
  size: number;
}

// Header names are case-insensitive; recorded in lower case so tests need not guess the spelling.
const lowerKeys = (h: Record<string, string>) => Object.fromEntries(Object.entries(h).map(([k, v]) => [k.toLowerCase(), v]));

type Answer = (body: unknown, call: MockCall) => { status: number; body?: unknown };

function readBody(body: unknown): unknown {
  if (body === undefined || body === null) return undefined;
  if (typeof FormData !== 'undefined' && body instanceof FormData) {
    const out: Record<string, string | MockFilePart> = {};
    body.forEach((v, k) => {
      out[k] = typeof v === 'string' ? v : { name: v.name, type: v.type, size: v.size };
    });
    return out;
  }
  return JSON.parse(String(body));
}

/**
 * A fetch stand-in answering by "METHOD /path". It also stands in for XMLHttpRequest, which the API
 * client uses for uploads with progress, so the same answers serve multipart uploads.
 */
export function mockFetch(answers: Record<string, Answer>) {
  const calls: MockCall[] = [];
  const answer = (method: string, input: string, raw: unknown, headers: Record<string, string> = {}) => {
    const u = new URL(input, 'http://localhost');
    const key = `${method} ${u.pathname}`;
    const call: MockCall = { key, body: readBody(raw), url: u.pathname + u.search, query: u.searchParams, headers };
    calls.push(call);
    const a = answers[key];
    return a ? a(call.body, call) : { status: 404, body: { statusCode: 404, message: `no mock for ${key}` } };
  };

  const fn = async (input: RequestInfo | URL, init?: RequestInit) => {
    const { status, body: out } = answer(init?.method ?? 'GET', String(input), init?.body, lowerKeys(Object.fromEntries(new Headers(init?.headers))));
    return new Response(out === undefined ? null : JSON.stringify(out), { status, headers: { 'Content-Type': 'application/json' } });
  };
  globalThis.fetch = fn as typeof fetch;
  (globalThis as unknown as { XMLHttpRequest: unknown }).XMLHttpRequest = makeXhr(answer);
  return calls;
}

/** The parts of XMLHttpRequest that lib/api-client.ts uses; reports progress in two steps, then answers. */
function makeXhr(answer: (method: string, url: string, body: unknown, headers: Record<string, string>) => { status: number; body?: unknown }) {
  return class MockXhr {
    status = 0;
    statusText = '';
    responseText = '';
    upload: { onprogress: ((e: { lengthComputable: boolean; loaded: number; total: number }) => void) | null } = { onprogress: null };
    onload: (() => void) | null = null;
    onerror: (() => void) | null = null;
    private method = 'GET';
    private target = '';
    readonly headers: Record<string, string> = {};
    open(method: string, url: string) {
      this.method = method;
      this.target = url;
    }
    setRequestHeader(k: string, v: string) {
      this.headers[k] = v;
    }
    abort() {}
    send(body: unknown) {
      setTimeout(() => {
        this.upload.onprogress?.({ lengthComputable: true, loaded: 1, total: 2 });
        setTimeout(() => {
          const { status, body: out } = answer(this.method, this.target, body, lowerKeys(this.headers));
          this.upload.onprogress?.({ lengthComputable: true, loaded: 2, total: 2 });
          this.status = status;
          this.responseText = out === undefined ? '' : JSON.stringify(out);
          this.onload?.();
        }, 5);
      }, 0);
    }
  };
}
