import { Badge, Group, Text } from '@mantine/core';
import { formatTooth, type ReferralStatus, type ToothNotation, type Urgency } from '@ostium/shared';
import { IconAlertTriangle } from '@tabler/icons-react';
import { STATUS_LABELS, STATUS_STYLE, URGENCY_COLORS, URGENCY_LABELS } from '../referral-labels.util';

export function StatusBadge({ status, size = 'sm' }: { status: ReferralStatus; size?: 'xs' | 'sm' | 'md' }) {
  const s = STATUS_STYLE[status];
  return (
    <Badge color={s.color} variant={s.variant} size={size} style={{ textTransform: 'none' }}>
      {STATUS_LABELS[status]}
    </Badge>
  );
}

export function UrgencyBadge({ urgency, size = 'sm' }: { urgency: Urgency; size?: 'xs' | 'sm' | 'md' }) {
  return (
    <Badge
      color={URGENCY_COLORS[urgency]}
      size={size}
      variant={urgency === 'routine' ? 'outline' : 'light'}
      leftSection={urgency === 'urgent' ? <IconAlertTriangle size={11} /> : undefined}
      style={{ textTransform: 'none' }}
    >
      {URGENCY_LABELS[urgency]}
    </Badge>
  );
}

/** A stored (FDI) tooth in the practice's notation, with the FDI form in small text when they differ. */
export function ToothNumber({ fdi, notation }: { fdi: string; notation: ToothNotation }) {
  const shown = formatTooth(fdi, notation);
  return (
    <Group gap={4} wrap="nowrap" component="span" display="inline-flex" align="baseline">
      <Text span fw={700} fz="sm">
        {shown}
      </Text>
      {notation !== 'fdi' && (
        <Text span fz={10} c="dimmed">
          FDI {fdi}
        </Text>
      )}
    </Group>
  );
}
