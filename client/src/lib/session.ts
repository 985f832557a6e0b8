import type { AuthUser, LoginResponse } from '@ostium/shared';

// The access token lives in memory only; a page reload recovers it from the refresh cookie.
export interface Session {
  accessToken: string;
  user: AuthUser;
}

let session: Session | null = null;
const listeners = new Set<() => void>();

export const sessionStore = {
  get: () => session,
  set(next: LoginResponse | null) {
    session = next ? { accessToken: next.accessToken, user: next.user } : null;
    listeners.forEach((l) => l());
  },
  subscribe(listener: () => void) {
    listeners.add(listener);
    return () => listeners.delete(listener);
  },
};
