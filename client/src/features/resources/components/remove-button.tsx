import { ActionIcon } from '@mantine/core';
import { IconTrash } from '@tabler/icons-react';

/** The bin button of every resource row; the label names what goes. */
export function RemoveButton({ label, onClick, loading }: { label: string; onClick: () => void; loading?: boolean }) {
  return (
    <ActionIcon variant="subtle" color="plum" aria-label={label} loading={loading} onClick={onClick}>
      <IconTrash size={16} />
    </ActionIcon>
  );
}
