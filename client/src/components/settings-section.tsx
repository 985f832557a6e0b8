import { Alert, Card, Text, Title } from '@mantine/core';
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

/** A settings page's refused save: the server's message, and the field errors no section shows. */
export function NotSavedAlert({ message, details }: { message: string; details: string[] }) {
  return (
    <Alert color="red" variant="light" mb="md" title="Not saved" role="alert">
      {message}
      {details.length > 0 && (
        <ul style={{ margin: '4px 0 0', paddingLeft: 18 }}>
          {details.map((m) => (
            <li key={m}>{m}</li>
          ))}
        </ul>
      )}
    </Alert>
  );
}
