import { Stack, Text, ThemeIcon } from '@mantine/core';
import { IconInbox } from '@tabler/icons-react';
import type { ReactNode } from 'react';

/** Says what is missing and what to do next. */
export function EmptyState({ title, hint, action }: { title: string; hint: ReactNode; action?: ReactNode }) {
  return (
    <Stack align="center" gap={6} py="xl">
      <ThemeIcon variant="light" color="stone" size={44} radius="xl">
        <IconInbox size={22} />
      </ThemeIcon>
      <Text fw={600}>{title}</Text>
      <Text c="dimmed" fz="sm" ta="center" maw={420}>
        {hint}
      </Text>
      {action}
    </Stack>
  );
}
