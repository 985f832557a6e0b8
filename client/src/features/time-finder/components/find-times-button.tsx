import { Button, type ButtonProps } from '@mantine/core';
import { can } from '@ostium/shared';
import { IconCalendarSearch } from '@tabler/icons-react';
import { Link } from 'react-router-dom';
import { useSession } from '../../auth/use-session';

/** "Find times" for one case, shown to those who may book; opens the time finder's proposals. */
export function FindTimesButton({ caseId, ...props }: { caseId: number } & Omit<ButtonProps, 'component'>) {
  const role = useSession()?.user.role;
  if (!can(role, 'schedule')) return null;
  return (
    <Button component={Link} to={`/cases/${caseId}/find-times`} leftSection={<IconCalendarSearch size={16} />} {...props}>
      Find times
    </Button>
  );
}
