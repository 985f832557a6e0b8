import { Group, Text } from '@mantine/core';

/** Ostium's mark: an opening seen end-on, our own drawing. */
export function BrandMark({ size = 28 }: { size?: number }) {
  return (
    <svg width={size} height={size} viewBox="0 0 32 32" aria-hidden="true">
      <rect width="32" height="32" rx="8" fill="var(--mantine-color-lagoon-8)" />
      <ellipse cx="16" cy="16" rx="9" ry="11" fill="none" stroke="#e9e4dc" strokeWidth="2.5" />
      <ellipse cx="16" cy="19" rx="3" ry="4" fill="#e9e4dc" />
    </svg>
  );
}

export function Brand() {
  return (
    <Group gap={8} wrap="nowrap">
      <BrandMark />
      <Text fw={700} fz="lg" c="lagoon.9" style={{ letterSpacing: '0.02em' }}>
        Ostium
      </Text>
    </Group>
  );
}
