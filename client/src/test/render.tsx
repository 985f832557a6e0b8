import { render as rtl } from '@testing-library/react';
import type { ReactElement } from 'react';
import { createMemoryRouter, RouterProvider, type RouteObject } from 'react-router-dom';
import { AppProvider, makeQueryClient } from '../app/provider';

/** Renders routes inside the real theme, a fresh QueryClient and a memory router. */
export function renderRoutes(routes: RouteObject[], path = '/') {
  const router = createMemoryRouter(routes, { initialEntries: [path] });
  const queryClient = makeQueryClient();
  const utils = rtl(
    <AppProvider queryClient={queryClient}>
      <RouterProvider router={router} />
    </AppProvider>,
  );
  return { ...utils, router, queryClient };
}

export const renderPage = (element: ReactElement, path = '/') => renderRoutes([{ path: '*', element }], path);

/** A fetch stand-in answering by "METHOD /path". */
export function mockFetch(answers: Record<string, (body: unknown) => { status: number; body?: unknown }>) {
  const calls: { key: string; body: unknown }[] = [];
  const fn = async (input: RequestInfo | URL, init?: RequestInit) => {
    const u = new URL(String(input), 'http://localhost');
    const key = `${init?.method ?? 'GET'} ${u.pathname}`;
    const body = init?.body ? JSON.parse(String(init.body)) : undefined;
    calls.push({ key, body });
    const answer = answers[key];
    const { status, body: out } = answer ? answer(body) : { status: 404, body: { statusCode: 404, message: `no mock for ${key}` } };
    return new Response(out === undefined ? null : JSON.stringify(out), { status, headers: { 'Content-Type': 'application/json' } });
  };
  globalThis.fetch = fn as typeof fetch;
  return calls;
}
