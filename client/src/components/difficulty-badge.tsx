import { Badge, Group } from '@mantine/core';
import type { Level } from '@ostium/shared';

// Colour and shape both carry the level, so the badge reads in greyscale and for colour-blind users.
const STYLE: Record<Level, { color: string; dots: number; label: string }> = {
  low: { color: 'lagoon', dots: 1, label: 'Low' },
  moderate: { color: 'amber', dots: 2, label: 'Moderate' },
  high: { color: 'plum', dots: 3, label: 'High' },
};

export interface DifficultyBadgeProps {
  level: Level;
  /** Dots only, for tight table cells; the label stays available to assistive technology and on hover. */
  compact?: boolean;
  size?: 'xs' | 'sm' | 'md';
}

export function DifficultyBadge({ level, compact = false, size = 'sm' }: DifficultyBadgeProps) {
  const s = STYLE[level];
  const dot = size === 'xs' ? 5 : size === 'sm' ? 6 : 7;
  return (
    <Badge
      role="img"
      aria-label={`Difficulty: ${level}`}
      title={`Difficulty: ${s.label.toLowerCase()}`}
      data-level={level}
      color={s.color}
      size={size}
      variant="light"
      leftSection={
        <Group gap={2} wrap="nowrap" aria-hidden="true">
          {Array.from({ length: s.dots }, (_, i) => (
            <span
              key={i}
              data-dot=""
              style={{ display: 'inline-block', width: dot, height: dot, borderRadius: '50%', background: `var(--mantine-color-${s.color}-7)` }}
            />
          ))}
        </Group>
      }
      styles={{ label: { textTransform: 'none', fontWeight: 600 } }}
    >
      {compact ? null : s.label}
    </Badge>
  );
}
