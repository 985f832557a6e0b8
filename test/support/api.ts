import { baseUrl, DEMO_PASSWORD } from './browser.js';

/** Calls the running app's API as a demo user (set-up steps a browser test does not need to click through). */
export async function apiAs(email: string) {
  const res = await fetch(`${baseUrl()}/api/auth/login`, { method: 'POST', headers: { 'Content-Type': 'application/json' }, body: JSON.stringify({ email, password: DEMO_PASSWORD }) });
  const { accessToken } = (await res.json()) as { accessToken: string };
  const call = async <T>(method: string, path: string, body?: unknown): Promise<T> => {
    const r = await fetch(`${baseUrl()}/api${path}`, {
      method,
      headers: { Authorization: `Bearer ${accessToken}`, ...(body ? { 'Content-Type': 'application/json' } : {}) },
      body: body ? JSON.stringify(body) : undefined,
    });
    if (!r.ok) throw new Error(`${method} ${path}: ${r.status} ${await r.text()}`);
    return (await r.json()) as T;
  };
  return { get: <T>(p: string) => call<T>('GET', p), post: <T>(p: string, b: unknown) => call<T>('POST', p, b), patch: <T>(p: string, b: unknown) => call<T>('PATCH', p, b) };
}
