import { Badge, Button, Card, Group, List, Stack, Text } from '@mantine/core';
import type { TimeProposal } from '@ostium/shared';
import { IconMicroscope } from '@tabler/icons-react';
import { localDay, localTime, minutesBetween, type BoardLookup } from '../../chair-board/board.util';
import { daysApart, gapText } from '../time-finder.util';

export interface ProposalCardProps {
  proposal: TimeProposal;
  rank: number;
  lookup: BoardLookup;
  booking: boolean;
  disabled: boolean;
  onBook: () => void;
}

/** One proposed series: every visit with its day, time, chair, endodontist and microscope, the gap it leaves and why it ranks here. */
export function ProposalCard({ proposal: p, rank, lookup, booking, disabled, onBook }: ProposalCardProps) {
  const zone = lookup.timeZone;
  return (
    <Card component="article" aria-label={`Proposal ${rank}`} padding="md">
      <Group justify="space-between" align="flex-start" wrap="nowrap">
        <Stack gap={6} style={{ flex: 1 }}>
          {p.visits.map((v, i) => (
            <div key={i}>
              {i > 0 && (
                <Text fz="xs" c="dimmed" mb={2}>
                  {daysApart(p.visits[i - 1]!.start, v.start, zone)} days after visit {i}
                </Text>
              )}
              <Group gap="xs" wrap="wrap">
                <Badge variant="outline" color="stone" size="sm">
                  Visit {i + 1}
                </Badge>
                <Text fw={700} fz="sm">
                  {localDay(v.start, zone)}, {localTime(v.start, zone)}–{localTime(v.end, zone)}
                </Text>
                <Text fz="sm" c="dimmed">
                  {minutesBetween(v.start, v.end)} min
                </Text>
              </Group>
              <Text fz="sm">
                {lookup.chairs.get(v.chairId)?.name ?? `Chair #${v.chairId}`} · {lookup.operators.get(v.operatorId) ?? `Endodontist #${v.operatorId}`}
                {v.microscopeId !== undefined && (
                  <>
                    {' · '}
                    <IconMicroscope size={14} style={{ verticalAlign: '-2px' }} aria-hidden="true" /> {lookup.microscopes.get(v.microscopeId)?.name ?? `Microscope #${v.microscopeId}`}
                  </>
                )}
              </Text>
            </div>
          ))}
          <Text fz="xs" fw={600} c={p.gapMinutesLeft > 0 ? 'amber.8' : 'lagoon.8'}>
            {gapText(p.gapMinutesLeft)}
          </Text>
          {p.reasons.length > 0 && (
            <List size="xs" c="dimmed" spacing={0} aria-label="Why this ranks here">
              {p.reasons.map((r) => (
                <List.Item key={r}>{r}</List.Item>
              ))}
            </List>
          )}
        </Stack>
        <Button onClick={onBook} loading={booking} disabled={disabled} aria-label={`Book proposal ${rank}`}>
          Book
        </Button>
      </Group>
    </Card>
  );
}
