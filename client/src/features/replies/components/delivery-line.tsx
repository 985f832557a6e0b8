import { Button, Group, Text } from '@mantine/core';
import type { OutboxMessage } from '@ostium/shared';
import { IconAlertTriangle, IconBan, IconCheck, IconChecks, IconClockHour4, IconClockShare, IconPlayerSkipForward, IconRefresh, IconSend, type Icon } from '@tabler/icons-react';
import { deliveryState, type DeliveryTone } from '../replies.util';

const TONE_COLOR: Record<DeliveryTone, string> = { waiting: 'amber.8', done: 'lagoon.8', problem: 'red.8', quiet: 'stone.6' };

const ICONS: Record<OutboxMessage['status'] | 'moved', Icon> = {
  pending: IconClockHour4,
  moved: IconClockShare,
  sending: IconSend,
  sent: IconCheck,
  delivered: IconChecks,
  failed: IconAlertTriangle,
  skipped: IconPlayerSkipForward,
  cancelled: IconBan,
};

/** The state of one message we sent, in words with an icon, the reason when there is one, and Retry when it failed. */
export function DeliveryLine({ message, zone, onRetry, retrying }: { message: OutboxMessage; zone: string; onRetry?: () => void; retrying?: boolean }) {
  const s = deliveryState(message, zone);
  const Icon = ICONS[s.word.startsWith('Moved') ? 'moved' : message.status];
  const color = TONE_COLOR[s.tone];
  return (
    <Group gap={6} wrap="nowrap" align="flex-start" data-testid="delivery" data-status={message.status}>
      <Icon size={14} color={`var(--mantine-color-${color.replace('.', '-')})`} style={{ flex: 'none', marginTop: 2 }} aria-hidden="true" />
      <Text fz="xs" c={color} style={{ flex: 1 }}>
        <Text span fz="xs" fw={700} c={color}>
          {s.word}
        </Text>
        {s.detail && <>: {s.detail}</>}
      </Text>
      {s.retryable && onRetry && (
        <Button size="compact-xs" variant="light" color="red" leftSection={<IconRefresh size={12} />} onClick={onRetry} loading={retrying}>
          Retry
        </Button>
      )}
    </Group>
  );
}
