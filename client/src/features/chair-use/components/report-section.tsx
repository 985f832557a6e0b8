import { Alert, Button, Card, Group, SimpleGrid, Skeleton, Stack, Text, Title } from '@mantine/core';
import type { UseQueryResult } from '@tanstack/react-query';
import { IconRefresh } from '@tabler/icons-react';
import type { ReactNode } from 'react';
import { EmptyState } from '../../../components/empty-state';

/** The shape of a section while its report loads: figure cards, a chart and a table. */
export function SectionSkeleton({ cards = 3 }: { cards?: number }) {
  return (
    <Stack gap="sm" aria-busy="true" aria-label="Loading">
      <SimpleGrid cols={{ base: 1, sm: cards }}>
        {Array.from({ length: cards }, (_, i) => (
          <Skeleton key={i} h={86} radius="md" />
        ))}
      </SimpleGrid>
      <Skeleton h={180} radius="md" />
      <Stack gap={6}>
        {Array.from({ length: 4 }, (_, i) => (
          <Skeleton key={i} h={22} radius="sm" />
        ))}
      </Stack>
    </Stack>
  );
}

export interface SectionEmpty {
  title: string;
  hint: ReactNode;
}

/**
 * One part of the Chair use page: a titled card that shows a skeleton while its report loads, the
 * server's message with a retry when it fails, an empty state that says what to do, or the report.
 */
export function ReportSection<T>({
  id,
  title,
  description,
  query,
  empty,
  cards,
  children,
}: {
  id: string;
  title: string;
  description: ReactNode;
  query: UseQueryResult<T>;
  /** Says when the report holds nothing to show, and what to do then. */
  empty?: (data: T) => SectionEmpty | null;
  cards?: number;
  children: (data: T) => ReactNode;
}) {
  const headingId = `${id}-heading`;
  const emptyState = query.data !== undefined && empty ? empty(query.data) : null;
  return (
    <Card component="section" id={id} aria-labelledby={headingId} className="ostium-report-section">
      <Stack gap="md">
        <div>
          <Title order={3} fz="lg" id={headingId}>
            {title}
          </Title>
          <Text fz="sm" c="dimmed">
            {description}
          </Text>
        </div>
        {query.isPending ? (
          <SectionSkeleton cards={cards} />
        ) : query.isError ? (
          <Alert color="red" variant="light" title={`Could not load ${title.toLowerCase()}`} role="alert">
            <Group justify="space-between" wrap="wrap" gap="xs">
              <Text fz="sm">{(query.error as Error).message}</Text>
              <Button size="compact-sm" variant="light" color="red" leftSection={<IconRefresh size={14} />} onClick={() => void query.refetch()}>
                Try again
              </Button>
            </Group>
          </Alert>
        ) : emptyState ? (
          <EmptyState title={emptyState.title} hint={emptyState.hint} />
        ) : (
          children(query.data as T)
        )}
      </Stack>
    </Card>
  );
}
