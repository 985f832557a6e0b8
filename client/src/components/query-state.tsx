import { Alert, Center, Loader } from '@mantine/core';
import type { UseQueryResult } from '@tanstack/react-query';
import type { ReactNode } from 'react';

/** Loading and error states for a query, so each screen only renders its data. */
export function QueryState<T>({ query, children }: { query: UseQueryResult<T>; children: (data: T) => ReactNode }) {
  if (query.isPending)
    return (
      <Center py="xl">
        <Loader size="sm" aria-label="Loading" />
      </Center>
    );
  if (query.isError)
    return (
      <Alert color="red" variant="light" title="Could not load" role="alert">
        {(query.error as Error).message}
      </Alert>
    );
  return <>{children(query.data as T)}</>;
}
