import { Alert, List, Text } from '@mantine/core';
import { IconAlertTriangle } from '@tabler/icons-react';
import type { ChangeProblem } from '../board.util';

/** The server's reason for refusing a change, with every conflicting booking named. */
export function ChangeProblemAlert({ problem, onClose }: { problem: ChangeProblem | null; onClose?: () => void }) {
  if (!problem) return null;
  return (
    <Alert color="plum" variant="light" icon={<IconAlertTriangle size={18} />} title={problem.title} role="alert" withCloseButton={!!onClose} onClose={onClose} closeButtonLabel="Dismiss">
      <Text fz="sm">{problem.message}</Text>
      {problem.conflicts.length > 0 && (
        <List size="sm" mt={4} aria-label="Conflicts">
          {problem.conflicts.map((c) => (
            <List.Item key={c}>{c}</List.Item>
          ))}
        </List>
      )}
      <Text fz="xs" c="dimmed" mt={4}>
        The visit was put back where it was.
      </Text>
    </Alert>
  );
}
