import { Button, Group, Table, Text, Title } from '@mantine/core';
import { LEVELS, type Level } from '@ostium/shared';
import { IconDownload } from '@tabler/icons-react';
import type { ReactNode } from 'react';
import { DifficultyBadge } from '../../../components/difficulty-badge';
import { csvFileName, downloadCsv, tableCsv, type ReportColumn, type ReportTableModel } from '../report-csv.util';
import { LEVEL_LABELS } from '../report-format.util';
import { DefinitionLabel } from './definition-label';

const LEVEL_BY_LABEL = new Map<string, Level>(LEVELS.map((l) => [LEVEL_LABELS[l], l]));

function Cell({ column, text }: { column: ReportColumn; text: string }) {
  const level = column.kind === 'level' ? LEVEL_BY_LABEL.get(text) : undefined;
  return level ? <DifficultyBadge level={level} size="xs" /> : <>{text}</>;
}

/**
 * A report table and its "Download CSV": both come from one model of formatted cells, so the file holds
 * exactly what the table shows, with the column headers in words and the range in the file name.
 */
export function ReportTable({
  model,
  rangePart,
  note,
  empty = 'Nothing in this range.',
  minWidth = 560,
  maxHeight,
  hideTitle = false,
}: {
  model: ReportTableModel;
  rangePart: string;
  note?: ReactNode;
  empty?: ReactNode;
  minWidth?: number;
  /** Long lists scroll inside the card with the header kept in view; every row stays in the table and the file. */
  maxHeight?: number;
  hideTitle?: boolean;
}) {
  const align = (c: ReportColumn) => (c.kind === 'number' ? 'right' : 'left');
  return (
    <div className="ostium-report-table">
      <Group justify="space-between" align="center" mb={6} wrap="nowrap" gap="sm">
        {hideTitle ? <span /> : (
          <Title order={4} fz="sm" fw={700}>
            {model.title}
          </Title>
        )}
        <Button
          size="compact-xs"
          variant="subtle"
          leftSection={<IconDownload size={14} />}
          className="no-print"
          aria-label={`Download CSV — ${model.title}`}
          onClick={() => downloadCsv(csvFileName(model, rangePart), tableCsv(model))}
        >
          Download CSV
        </Button>
      </Group>
      <Table.ScrollContainer minWidth={minWidth} maxHeight={maxHeight}>
        <Table aria-label={model.title} fz="sm" withTableBorder withRowBorders stickyHeader={maxHeight !== undefined}>
          <Table.Thead bg="stone.0">
            <Table.Tr>
              {model.columns.map((c) => (
                <Table.Th key={c.label} ta={align(c)} fz="xs">
                  {c.definition ? <DefinitionLabel term={c.definition}>{c.label}</DefinitionLabel> : c.label}
                </Table.Th>
              ))}
            </Table.Tr>
          </Table.Thead>
          <Table.Tbody>
            {model.rows.length === 0 ? (
              <Table.Tr>
                <Table.Td colSpan={model.columns.length}>
                  <Text fz="sm" c="dimmed">
                    {empty}
                  </Text>
                </Table.Td>
              </Table.Tr>
            ) : (
              model.rows.map((row, i) => (
                <Table.Tr key={i}>
                  {row.map((cell, j) => (
                    <Table.Td key={j} ta={align(model.columns[j]!)} style={{ fontVariantNumeric: 'tabular-nums' }}>
                      <Cell column={model.columns[j]!} text={cell} />
                    </Table.Td>
                  ))}
                </Table.Tr>
              ))
            )}
          </Table.Tbody>
          {model.totals && model.rows.length > 0 && (
            <Table.Tfoot>
              <Table.Tr>
                {model.totals.map((cell, j) => (
                  <Table.Td key={j} ta={align(model.columns[j]!)} fw={700} style={{ fontVariantNumeric: 'tabular-nums' }}>
                    {cell}
                  </Table.Td>
                ))}
              </Table.Tr>
            </Table.Tfoot>
          )}
        </Table>
      </Table.ScrollContainer>
      {note && (
        <Text fz="xs" c="dimmed" mt={4}>
          {note}
        </Text>
      )}
    </div>
  );
}
