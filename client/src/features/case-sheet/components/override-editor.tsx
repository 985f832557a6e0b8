import { Button, Group, NumberInput, Paper, Stack, Text, Textarea } from '@mantine/core';
import type { EstimateVisit } from '@ostium/shared';
import { useState } from 'react';
import { overrideErrors } from '../case-sheet.util';

export interface OverrideEditorProps {
  visits: EstimateVisit[];
  /** Minutes to start from: the current adjustment, or the estimate. */
  initialMinutes: number[];
  initialReason: string;
  onApply: (o: { minutesPerVisit: number[]; reason: string }) => void;
  onCancel: () => void;
  /** Errors from the server, keyed `override.reason`, `override.minutesPerVisit.0`. */
  serverErrors?: Record<string, string>;
}

/** An endodontist's minutes per visit; the reason is required, and booking then uses these figures. */
export function OverrideEditor({ visits, initialMinutes, initialReason, onApply, onCancel, serverErrors = {} }: OverrideEditorProps) {
  const [minutes, setMinutes] = useState<(number | string)[]>(() => visits.map((v, i) => initialMinutes[i] ?? v.minutes));
  const [reason, setReason] = useState(initialReason);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const shown = { ...serverErrors, ...errors };

  const apply = () => {
    const found = overrideErrors(minutes, reason);
    setErrors(found);
    if (Object.keys(found).length === 0) onApply({ minutesPerVisit: minutes as number[], reason: reason.trim() });
  };

  return (
    <Paper withBorder p="sm" bg="stone.0" component="form" aria-label="Adjust chair time" onSubmit={(e) => { e.preventDefault(); apply(); }}>
      <Stack gap="xs">
        <Text fz="sm" fw={600}>
          Adjust chair time
        </Text>
        <Group gap="sm" align="flex-start">
          {visits.map((v, i) => (
            <NumberInput
              key={v.index}
              size="xs"
              w={140}
              label={`Visit ${v.index} minutes`}
              description={`estimate ${v.minutes}`}
              min={5}
              max={600}
              step={5}
              allowDecimal={false}
              value={minutes[i]}
              onChange={(val) => setMinutes((m) => m.map((x, j) => (j === i ? val : x)))}
              error={shown[`override.minutesPerVisit.${i}`]}
            />
          ))}
        </Group>
        <Textarea
          size="xs"
          label="Reason for the change"
          description="Required; it is kept with the case and shown beside the booked minutes."
          rows={2}
          withAsterisk
          value={reason}
          onChange={(e) => setReason(e.currentTarget.value)}
          error={shown['override.reason']}
        />
        <Group justify="flex-end" gap="xs">
          <Button size="xs" variant="subtle" color="stone" onClick={onCancel}>
            Cancel
          </Button>
          <Button size="xs" type="submit">
            Apply adjustment
          </Button>
        </Group>
      </Stack>
    </Paper>
  );
}
