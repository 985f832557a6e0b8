import { Card, Text, Title } from '@mantine/core';
import type { ReactNode } from 'react';

/** One titled card of a settings page, with an optional hint under the title and an error under the body. */
export function SettingsSection({ title, hint, error, children }: { title: string; hint?: ReactNode; error?: ReactNode; children: ReactNode }) {
  return (
    <Card p="md" component="section" aria-label={title}>
      <Title order={3} fz="sm" mb={2}>
        {title}
      </Title>
      {hint && (
        <Text fz="xs" c="dimmed" mb="sm">
          {hint}
        </Text>
      )}
      {children}
      {error && (
        <Text fz="xs" c="red.7" mt="xs" role="alert">
          {error}
        </Text>
      )}
    </Card>
  );
}
