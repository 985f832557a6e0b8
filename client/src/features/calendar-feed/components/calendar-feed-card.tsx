import { Alert, Button, Card, CopyButton, Group, Text, TextInput, Title } from '@mantine/core';
import { IconCalendarShare } from '@tabler/icons-react';
import { useState } from 'react';
import { useIssueFeedToken, useRevokeFeedToken } from '../api/feed-token';

/** An endodontist's own schedule as an iCalendar subscription at a private, revocable address. */
export function CalendarFeedCard({ operatorId }: { operatorId: number }) {
  const issue = useIssueFeedToken(operatorId);
  const revoke = useRevokeFeedToken(operatorId);
  const [url, setUrl] = useState<string | null>(null);
  const [revoked, setRevoked] = useState(false);
  const error = (issue.error ?? revoke.error) as Error | null;
  return (
    <Card>
      <Group gap="xs" mb={4}>
        <IconCalendarShare size={18} />
        <Title order={3} fz="md">
          My schedule in a calendar app
        </Title>
      </Group>
      <Text fz="sm" c="dimmed" mb="sm">
        A private address your calendar app can subscribe to. It shows times, chairs, teeth and procedures with patient initials only.
        Making a new address stops the old one.
      </Text>
      {url && (
        <Group gap="xs" mb="sm" wrap="nowrap">
          <TextInput readOnly value={url} aria-label="Calendar feed address" style={{ flex: 1 }} onFocus={(e) => e.currentTarget.select()} />
          <CopyButton value={url}>{({ copied, copy }) => <Button variant="light" onClick={copy}>{copied ? 'Copied' : 'Copy'}</Button>}</CopyButton>
        </Group>
      )}
      {revoked && !url && (
        <Text fz="sm" mb="sm">
          The address no longer works.
        </Text>
      )}
      {error && (
        <Alert color="red" variant="light" mb="sm">
          {error.message}
        </Alert>
      )}
      <Group gap="sm">
        <Button size="xs" loading={issue.isPending} onClick={() => issue.mutate(undefined, { onSuccess: (r) => (setUrl(r.url), setRevoked(false)) })}>
          {url ? 'Make a new address' : 'Get my calendar address'}
        </Button>
        <Button size="xs" variant="subtle" color="stone" loading={revoke.isPending} onClick={() => revoke.mutate(undefined, { onSuccess: () => (setUrl(null), setRevoked(true)) })}>
          Stop the address
        </Button>
      </Group>
    </Card>
  );
}
