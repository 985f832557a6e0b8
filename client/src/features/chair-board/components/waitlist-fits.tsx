import { Anchor, Card, CloseButton, Group, Stack, Text } from '@mantine/core';
import { formatTooth, type Appointment } from '@ostium/shared';
import { IconMicroscope } from '@tabler/icons-react';
import { Link } from 'react-router-dom';
import { QueryState } from '../../../components/query-state';
import { useWaitlistFits } from '../api/waitlist';
import { localDay, localTime, type BoardLookup } from '../board.util';

/** After a cancellation: the waitlisted patients whose visit fits the freed time, to offer it to. */
export function WaitlistFits({ freed, lookup, onClose }: { freed: Appointment; lookup: BoardLookup; onClose: () => void }) {
  const fits = useWaitlistFits(freed.id);
  const zone = lookup.timeZone;
  const tooth = (fdi: string) => {
    try {
      return formatTooth(fdi, lookup.notation);
    } catch {
      return fdi;
    }
  };
  return (
    <Card component="section" aria-label="Waitlist for the freed time" padding="sm" mb="sm">
      <Group justify="space-between" mb={4}>
        <Text fw={600} fz="sm">
          Freed: {localDay(freed.start, zone)}, {localTime(freed.start, zone)}–{localTime(freed.end, zone)} · {lookup.chairs.get(freed.chairId)?.name ?? ''}
        </Text>
        <CloseButton aria-label="Close the waitlist" onClick={onClose} />
      </Group>
      <QueryState query={fits}>
        {(entries) =>
          entries.length === 0 ? (
            <Text fz="sm" c="dimmed">
              Nobody on the waitlist fits this time.
            </Text>
          ) : (
            <Stack gap={4}>
              {entries.map((e) => (
                <Group key={e.id} gap="sm" wrap="nowrap">
                  <Text fz="sm" fw={600}>
                    {e.patient.name}
                  </Text>
                  <Text fz="sm">
                    tooth {tooth(e.toothFdi)} · {e.minutesPerVisit.join(' + ')} min
                    {e.needsMicroscope && <IconMicroscope size={14} aria-label="needs a microscope" style={{ verticalAlign: '-2px', marginLeft: 4 }} />}
                  </Text>
                  {e.fit && (
                    <Text fz="sm" c="dimmed">
                      would go at {localTime(e.fit.start, zone)}
                    </Text>
                  )}
                  <Anchor component={Link} to={`/cases/${e.caseId}/find-times`} fz="sm">
                    Find times
                  </Anchor>
                </Group>
              ))}
            </Stack>
          )
        }
      </QueryState>
    </Card>
  );
}
