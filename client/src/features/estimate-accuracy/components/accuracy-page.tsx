import { Card, Group, SimpleGrid, Stack, Table, Text, Title } from '@mantine/core';
import type { CellAccuracy } from '@ostium/shared';
import { DifficultyBadge } from '../../../components/difficulty-badge';
import { EmptyState } from '../../../components/empty-state';
import { PageHeader } from '../../../components/page-header';
import { QueryState } from '../../../components/query-state';
import { PROCEDURE_LABELS } from '../../case-sheet/case-sheet.util';
import { useSession } from '../../auth/use-session';
import { canImportHistory } from '../access';
import { round1, signed, sortCells, summarise } from '../accuracy.util';
import { useAccuracy } from '../api/accuracy';
import { AccuracyChart } from './accuracy-chart';
import { HistoryImport } from './history-import';

/** /estimates/accuracy — estimated vs actual chair time per cell, before and after the calibration learned from visits. */
export function AccuracyPage() {
  const accuracy = useAccuracy();
  const mayImport = canImportHistory(useSession()?.user.role);
  return (
    <>
      <PageHeader
        title="Estimate accuracy"
        description="How far actual visits were from the estimate, per procedure, tooth group and difficulty — with the table alone and after calibration from completed visits."
      />
      <Stack gap="md">
        <QueryState query={accuracy}>
          {(cells) =>
            cells.length === 0 ? (
              <Card>
                <EmptyState
                  title="No completed visits yet"
                  hint={
                    mayImport
                      ? 'Import past visits from a CSV file below, or record seated and dismissed times in the chairside list; the report fills in as visits are completed.'
                      : 'The report fills in as seated and dismissed times are recorded in the chairside list, or a manager imports past visits.'
                  }
                />
              </Card>
            ) : (
              <AccuracyReport cells={cells} />
            )
          }
        </QueryState>
        {mayImport && <HistoryImport />}
      </Stack>
    </>
  );
}

function Figure({ label, value, hint }: { label: string; value: string; hint?: string }) {
  return (
    <Card p="md">
      <Text fz="xs" c="dimmed" fw={600} tt="uppercase" style={{ letterSpacing: '0.05em' }}>
        {label}
      </Text>
      <Text fz={22} fw={700}>
        {value}
      </Text>
      {hint && (
        <Text fz="xs" c="dimmed">
          {hint}
        </Text>
      )}
    </Card>
  );
}

function AccuracyReport({ cells }: { cells: CellAccuracy[] }) {
  const s = summarise(cells)!;
  const sorted = sortCells(cells);
  return (
    <>
      <SimpleGrid cols={{ base: 1, sm: 3 }}>
        <Figure label="Visits compared" value={String(s.visits)} hint={`${cells.length} cell${cells.length === 1 ? '' : 's'}`} />
        <Figure label="Mean error, table alone" value={`${round1(s.before.meanAbsoluteError)} min`} hint={`bias ${signed(s.before.bias)} min`} />
        <Figure label="Mean error, after calibration" value={`${round1(s.after.meanAbsoluteError)} min`} hint={`bias ${signed(s.after.bias)} min`} />
      </SimpleGrid>
      <Card>
        <Title order={3} fz="md" mb="xs">
          Estimated vs actual
        </Title>
        <AccuracyChart cells={cells} />
      </Card>
      <Card p={0}>
        <Table.ScrollContainer minWidth={760}>
          <Table aria-label="Accuracy per cell">
            <Table.Thead>
              <Table.Tr>
                <Table.Th rowSpan={2}>Procedure</Table.Th>
                <Table.Th rowSpan={2}>Tooth group</Table.Th>
                <Table.Th rowSpan={2}>Difficulty</Table.Th>
                <Table.Th rowSpan={2} ta="right">
                  Visits
                </Table.Th>
                <Table.Th colSpan={2} ta="center">
                  Mean absolute error (min)
                </Table.Th>
                <Table.Th colSpan={2} ta="center">
                  Bias (min)
                </Table.Th>
              </Table.Tr>
              <Table.Tr>
                <Table.Th ta="right">before</Table.Th>
                <Table.Th ta="right">after</Table.Th>
                <Table.Th ta="right">before</Table.Th>
                <Table.Th ta="right">after</Table.Th>
              </Table.Tr>
            </Table.Thead>
            <Table.Tbody>
              {sorted.map((c) => (
                <Table.Tr key={`${c.procedure}-${c.toothGroup}-${c.level}`}>
                  <Table.Td>{PROCEDURE_LABELS[c.procedure]}</Table.Td>
                  <Table.Td tt="capitalize">{c.toothGroup}</Table.Td>
                  <Table.Td>
                    <DifficultyBadge level={c.level} size="xs" />
                  </Table.Td>
                  <Table.Td ta="right">{c.count}</Table.Td>
                  <Table.Td ta="right">{round1(c.before.meanAbsoluteError).toFixed(1)}</Table.Td>
                  <Table.Td ta="right" fw={600} c={c.after.meanAbsoluteError < c.before.meanAbsoluteError ? 'lagoon.9' : undefined}>
                    {round1(c.after.meanAbsoluteError).toFixed(1)}
                  </Table.Td>
                  <Table.Td ta="right">{signed(c.before.bias)}</Table.Td>
                  <Table.Td ta="right" fw={600}>
                    {signed(c.after.bias)}
                  </Table.Td>
                </Table.Tr>
              ))}
            </Table.Tbody>
          </Table>
        </Table.ScrollContainer>
        <Group px="md" py="xs">
          <Text fz="xs" c="dimmed">
            Bias above zero: visits run longer than estimated. “After” predicts each visit from the calibration learned from all the other visits, so a visit never grades its own prediction.
          </Text>
        </Group>
      </Card>
    </>
  );
}
