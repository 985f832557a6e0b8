import { useSyncExternalStore } from 'react';
import { sessionStore } from '../../lib/session';

export function useSession() {
  return useSyncExternalStore(sessionStore.subscribe, sessionStore.get, sessionStore.get);
}
