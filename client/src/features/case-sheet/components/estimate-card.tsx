import { Alert, Badge, Card, Group, List, Loader, Stack, Table, Text, Title, Tooltip } from '@mantine/core';
import type { CaseOverride, EstimateResult, FactorDefinition, TrayItem } from '@ostium/shared';
import { IconAlertTriangle, IconCheck, IconMicroscope, IconScan } from '@tabler/icons-react';
import type { ReactNode } from 'react';
import { DifficultyBadge } from '../../../components/difficulty-badge';
import { breakdownSum, formatMinutes, ISO_SWATCH } from '../case-sheet.util';

export const CAUTION =
  'This plans chair time; it is not a diagnosis. Clinical decisions rest with the treating clinician, under local regulations and licensed practice.';

export interface EstimateCardProps {
  result: EstimateResult;
  factors: FactorDefinition[];
  /** The minutes booking will use when they differ from the estimate (an endodontist's adjustment). */
  booked?: { minutesPerVisit: number[]; reason: string; saved?: Pick<CaseOverride, 'byName' | 'at'> } | null;
  /** The inputs changed and a new estimate is on its way. */
  updating?: boolean;
  /** A tooth name for the canal assumption, e.g. "lower left first molar". */
  toothName: string;
  /** The adjust control (endodontists only). */
  adjust?: ReactNode;
}

const dayRange = (a?: number, b?: number) => (a === undefined ? '—' : b === undefined || b === a ? `${a} days` : `${a}–${b} days`);

/** The level with its reasons, the visit plan with minutes, the breakdown, the band and the tray list. */
export function EstimateCard({ result, factors, booked, updating, toothName, adjust }: EstimateCardProps) {
  const label = (k: string) => factors.find((f) => f.key === k)?.label ?? k;
  const sum = breakdownSum(result.breakdown);
  const bookedTotal = booked ? booked.minutesPerVisit.reduce((s, m) => s + m, 0) : null;
  const visitMismatch = booked && booked.minutesPerVisit.length !== result.visits.length;

  return (
    <Card component="section" aria-label="Chair-time estimate" aria-busy={updating || undefined}>
      <Stack gap="md">
        <Group justify="space-between" align="flex-start">
          <Stack gap={4}>
            <Title order={3} fz="lg">
              Chair-time estimate
            </Title>
            <Text fz="xs" c="dimmed">
              Estimate table version {result.tableVersion}
            </Text>
          </Stack>
          {updating && (
            <Group gap={6} aria-live="polite">
              <Loader size="xs" />
              <Text fz="xs" c="dimmed">
                Updating…
              </Text>
            </Group>
          )}
        </Group>

        <div aria-label="Difficulty level" role="group">
          <Group gap="sm" align="center">
            <Text fw={600} fz="sm">
              Difficulty
            </Text>
            <DifficultyBadge level={result.level} size="md" />
          </Group>
          <Text fz="sm" mt={4} data-testid="level-reasons">
            {result.levelReasons.length ? (
              <>
                Set by: {result.levelReasons.map(label).join(', ')}
              </>
            ) : (
              'Every factor is low.'
            )}
          </Text>
          {result.cbctSuggested && (
            <Alert mt="xs" variant="light" color="amber" icon={<IconScan size={18} />} p="xs">
              <Text fz="sm">Consider a cone-beam CT: {result.level} cases are flagged for a three-dimensional view before treatment.</Text>
            </Alert>
          )}
        </div>

        <div>
          <Group justify="space-between" mb={4}>
            <Title order={4} fz="sm">
              Visit plan
            </Title>
            {adjust}
          </Group>
          <Table aria-label="Visits">
            <Table.Thead>
              <Table.Tr>
                <Table.Th w={44}>Visit</Table.Th>
                <Table.Th>Purpose</Table.Th>
                <Table.Th ta="right" w={78}>
                  Estimate
                </Table.Th>
                {booked && (
                  <Table.Th ta="right" w={78}>
                    Booked
                  </Table.Th>
                )}
                <Table.Th w={40}>
                  <Tooltip label="Microscope">
                    <IconMicroscope size={16} aria-label="Microscope" />
                  </Tooltip>
                </Table.Th>
              </Table.Tr>
            </Table.Thead>
            <Table.Tbody>
              {result.visits.map((v, i) => (
                <Table.Tr key={v.index}>
                  <Table.Td>{v.index}</Table.Td>
                  <Table.Td>
                    <Text fz="sm">{v.purpose}</Text>
                    <Text fz="xs" c="dimmed">
                      {i > 0 && `${dayRange(v.earliestDaysAfterPrevious, v.latestDaysAfterPrevious)} after visit ${i} · `}then {v.turnoverMinutes} min turnover
                    </Text>
                  </Table.Td>
                  <Table.Td ta="right" fw={600} style={{ whiteSpace: 'nowrap' }}>
                    {v.minutes} min
                  </Table.Td>
                  {booked && (
                    <Table.Td ta="right" fw={700} c="lagoon.9" style={{ whiteSpace: 'nowrap' }}>
                      {booked.minutesPerVisit[i] !== undefined ? `${booked.minutesPerVisit[i]} min` : '—'}
                    </Table.Td>
                  )}
                  <Table.Td>
                    {v.needsMicroscope ? (
                      <Tooltip label="Microscope needed">
                        <IconMicroscope size={18} color="var(--mantine-color-lagoon-8)" aria-label="Microscope needed" role="img" />
                      </Tooltip>
                    ) : (
                      <Text fz="sm" c="dimmed" aria-label="No microscope">
                        —
                      </Text>
                    )}
                  </Table.Td>
                </Table.Tr>
              ))}
            </Table.Tbody>
            <Table.Tfoot>
              <Table.Tr>
                <Table.Th colSpan={2}>Total chair time</Table.Th>
                <Table.Th ta="right" data-testid="total-minutes" style={{ whiteSpace: 'nowrap' }}>
                  {result.totalMinutes} min
                </Table.Th>
                {booked && (
                  <Table.Th ta="right" c="lagoon.9" data-testid="booked-total" style={{ whiteSpace: 'nowrap' }}>
                    {bookedTotal} min
                  </Table.Th>
                )}
                <Table.Th />
              </Table.Tr>
            </Table.Tfoot>
          </Table>
          <Text fz="xs" c="dimmed" mt={4}>
            {formatMinutes(result.totalMinutes)} in {result.visits.length} visit{result.visits.length === 1 ? '' : 's'}; turnover is not included (chair blocked, endodontist free).
          </Text>
          {booked && (
            <Text fz="xs" mt={4}>
              Booked differs from the estimate: “{booked.reason}”
              {booked.saved ? ` — ${booked.saved.byName}, ${new Date(booked.saved.at).toLocaleString([], { dateStyle: 'medium', timeStyle: 'short' })}` : ' (not saved yet)'}
            </Text>
          )}
          {visitMismatch && (
            <Alert mt="xs" color="amber" variant="light" icon={<IconAlertTriangle size={16} />} p="xs">
              The plan now has {result.visits.length} visit{result.visits.length === 1 ? '' : 's'}; the adjustment was made for {booked!.minutesPerVisit.length}. Review it.
            </Alert>
          )}
          {result.band && (
            <Text fz="sm" mt="xs">
              Likely range (80 % of similar cases): {result.band.low}–{result.band.high} min
            </Text>
          )}
          {result.canalsAssumed && (
            <Text fz="sm" mt="xs" c="amber.9">
              {result.canals} canal{result.canals === 1 ? '' : 's'} assumed, the usual count for a {toothName}; confirm it on the radiograph.
            </Text>
          )}
          {result.recallMonths.length > 0 && (
            <Text fz="sm" mt="xs" c="dimmed">
              Recall reviews {result.recallMonths.join(' and ')} months after completion.
            </Text>
          )}
          {result.notes.map((n) => (
            <Alert key={n} mt="xs" color="amber" variant="light" p="xs" icon={<IconAlertTriangle size={16} />}>
              {n}
            </Alert>
          ))}
        </div>

        <div>
          <Title order={4} fz="sm" mb={4}>
            Where the minutes come from
          </Title>
          <Table aria-label="Breakdown">
            <Table.Tbody>
              {result.breakdown.map((l, i) => (
                <Table.Tr key={i}>
                  <Table.Td fz="sm">{l.label}</Table.Td>
                  <Table.Td ta="right" fz="sm" w={90} style={{ whiteSpace: 'nowrap' }}>
                    {i > 0 && l.minutes >= 0 ? '+' : ''}
                    {l.minutes} min
                  </Table.Td>
                </Table.Tr>
              ))}
            </Table.Tbody>
            <Table.Tfoot>
              <Table.Tr>
                <Table.Th>
                  <Group gap={4}>
                    Sum of the lines
                    {sum === result.totalMinutes ? (
                      <Tooltip label="Equals the total chair time">
                        <IconCheck size={14} color="var(--mantine-color-lagoon-7)" aria-label="equals the total" />
                      </Tooltip>
                    ) : (
                      <Badge color="red" size="xs">
                        differs from the total {result.totalMinutes} min
                      </Badge>
                    )}
                  </Group>
                </Table.Th>
                <Table.Th ta="right" data-testid="breakdown-sum" style={{ whiteSpace: 'nowrap' }}>
                  {sum} min
                </Table.Th>
              </Table.Tr>
            </Table.Tfoot>
          </Table>
        </div>

        {result.trayList.length > 0 && (
          <div>
            <Title order={4} fz="sm" mb={4}>
              Tray list
            </Title>
            <List spacing={2} size="sm" listStyleType="none" aria-label="Tray list">
              {result.trayList.map((t, i) => (
                <List.Item key={i}>
                  <TrayLine item={t} />
                </List.Item>
              ))}
            </List>
          </div>
        )}

        <Alert color="stone" variant="light" p="sm">
          <Text fz="sm">{CAUTION}</Text>
        </Alert>
      </Stack>
    </Card>
  );
}

function TrayLine({ item }: { item: TrayItem }) {
  const size = item.size !== undefined ? String(item.size).padStart(2, '0') : null;
  return (
    <Group gap={8} wrap="nowrap">
      {size ? (
        <Group gap={4} wrap="nowrap" w={84}>
          <span
            aria-hidden="true"
            data-colour={item.colour}
            style={{
              display: 'inline-block',
              width: 12,
              height: 12,
              borderRadius: 3,
              border: '1px solid var(--mantine-color-stone-5)',
              background: item.colour ? (ISO_SWATCH[item.colour] ?? 'transparent') : 'transparent',
            }}
          />
          <Text fz="sm" fw={700} ff="monospace">
            {size}
          </Text>
          {item.taper !== undefined && (
            <Text fz="xs" c="dimmed" ff="monospace">
              .{String(Math.round(item.taper * 100)).padStart(2, '0')}
            </Text>
          )}
        </Group>
      ) : (
        <span style={{ width: 84, flex: 'none' }} />
      )}
      <Text fz="sm">
        {item.label}
        {item.colour && (
          <Text span fz="xs" c="dimmed">
            {' '}
            ({item.colour})
          </Text>
        )}
      </Text>
    </Group>
  );
}
