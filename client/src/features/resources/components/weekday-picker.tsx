import { Group, Text, UnstyledButton } from '@mantine/core';
import { useId } from 'react';
import { DAY_NAMES, RRULE_DAYS, type RruleDay } from '../rrule.util';
import classes from './weekday-picker.module.css';

/** Seven toggles, Monday first; each is a button with its full day name for screen readers. */
export function WeekdayPicker({ value, onChange, label = 'Days', error }: { value: RruleDay[]; onChange: (days: RruleDay[]) => void; label?: string; error?: string }) {
  const id = useId();
  const on = new Set(value);
  return (
    <div>
      <Text fz="sm" fw={500} mb={4} id={id}>
        {label}
      </Text>
      <Group gap={4} role="group" aria-labelledby={id} wrap="nowrap">
        {RRULE_DAYS.map((d) => (
          <UnstyledButton
            key={d}
            className={classes.day}
            aria-pressed={on.has(d)}
            aria-label={DAY_NAMES[d].long}
            data-on={on.has(d) || undefined}
            onClick={() => onChange(RRULE_DAYS.filter((x) => (x === d ? !on.has(d) : on.has(x))))}
          >
            {DAY_NAMES[d].short.slice(0, 2)}
          </UnstyledButton>
        ))}
      </Group>
      {error && (
        <Text fz="xs" c="red.7" mt={2}>
          {error}
        </Text>
      )}
    </div>
  );
}
