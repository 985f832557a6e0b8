import '@mantine/core/styles.css';
import '@mantine/notifications/styles.css';
import './global.css';
import { Center, Loader, MantineProvider } from '@mantine/core';
import { Notifications } from '@mantine/notifications';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { useEffect, useState, type ReactNode } from 'react';
import { ApiError, refreshSession } from '../lib/api-client';
import { theme } from './theme';

export function makeQueryClient() {
  return new QueryClient({
    defaultOptions: {
      queries: {
        // A 4xx will not change by asking again; network trouble might.
        retry: (n, e) => !(e instanceof ApiError && e.status >= 400 && e.status < 500) && n < 2,
        refetchOnWindowFocus: false,
      },
    },
  });
}

export function AppProvider({ children, queryClient }: { children: ReactNode; queryClient?: QueryClient }) {
  const [client] = useState(() => queryClient ?? makeQueryClient());
  return (
    <MantineProvider theme={theme} defaultColorScheme="light">
      <Notifications position="top-right" />
      <QueryClientProvider client={client}>{children}</QueryClientProvider>
    </MantineProvider>
  );
}

/** On load, recover the session from the refresh cookie before the first route renders. */
export function SessionGate({ children }: { children: ReactNode }) {
  const [ready, setReady] = useState(false);
  useEffect(() => {
    refreshSession().finally(() => setReady(true));
  }, []);
  if (!ready)
    return (
      <Center mih="100vh">
        <Loader aria-label="Loading" />
      </Center>
    );
  return <>{children}</>;
}
