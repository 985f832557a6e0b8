import { Box, Button, Group, Text } from '@mantine/core';
import type { ChairUseReport } from '@ostium/shared';
import { IconTable } from '@tabler/icons-react';
import { useState } from 'react';
import { heatmapTable, sortedHeatmap } from '../report-tables.util';
import { fixed1, hourLabel, WEEKDAY_LABELS, WEEKDAY_SHORT } from '../report-format.util';
import { ReportTable } from './report-table';

// Five steps of the primary teal, light to deep; a cell's label switches to white on the deep ones.
const STEPS = [
  { upTo: 0.2, shade: 1, label: 'under 20 %' },
  { upTo: 0.4, shade: 3, label: '20–40 %' },
  { upTo: 0.6, shade: 5, label: '40–60 %' },
  { upTo: 0.8, shade: 7, label: '60–80 %' },
  { upTo: Infinity, shade: 9, label: '80 % and over' },
];
const step = (share: number) => STEPS.find((s) => share < s.upTo) ?? STEPS[STEPS.length - 1]!;

/** Booked share by weekday and hour as a grid of coloured cells, each labelled; the same figures as a table below. */
export function HeatMap({ report, rangePart }: { report: ChairUseReport; rangePart: string }) {
  const [asTable, setAsTable] = useState(false);
  const cells = sortedHeatmap(report);
  if (cells.length === 0) return null;
  const hours = cells.map((c) => c.hour);
  const first = Math.min(...hours);
  const last = Math.max(...hours);
  const columns = Array.from({ length: last - first + 1 }, (_, i) => first + i);
  const weekdays = [...new Set(cells.map((c) => c.weekday))];
  const byKey = new Map(cells.map((c) => [`${c.weekday}:${c.hour}`, c]));

  return (
    <div>
      <Group justify="space-between" mb={6} wrap="wrap" gap="xs">
        <Text fz="sm" fw={700}>
          Booked share by weekday and hour
        </Text>
        <Button size="compact-xs" variant="subtle" leftSection={<IconTable size={14} />} aria-expanded={asTable} onClick={() => setAsTable((v) => !v)} className="no-print">
          {asTable ? 'Hide the table' : 'Show as a table'}
        </Button>
      </Group>
      <Box
        role="img"
        aria-label="Booked share by weekday and hour, as a grid of coloured cells; “Show as a table” lists the same figures."
        className="ostium-heatmap"
        style={{ gridTemplateColumns: `44px repeat(${columns.length}, minmax(40px, 1fr))` }}
      >
        <span />
        {columns.map((h) => (
          <span key={h} className="ostium-heatmap-hour">
            {hourLabel(h)}
          </span>
        ))}
        {weekdays.map((d) => (
          <Row key={d} weekday={d} columns={columns} byKey={byKey} />
        ))}
      </Box>
      <Group gap="md" mt={8} wrap="wrap" aria-hidden="true">
        {STEPS.map((s) => (
          <Group key={s.shade} gap={4} wrap="nowrap">
            <span className="ostium-heatmap-swatch" style={{ background: `var(--mantine-color-lagoon-${s.shade})` }} />
            <Text fz="xs" c="dimmed">
              {s.label}
            </Text>
          </Group>
        ))}
        <Group gap={4} wrap="nowrap">
          <span className="ostium-heatmap-swatch ostium-heatmap-closed" />
          <Text fz="xs" c="dimmed">
            closed
          </Text>
        </Group>
      </Group>
      {asTable && (
        <Box mt="sm">
          <ReportTable model={heatmapTable(report)} rangePart={rangePart} maxHeight={420} hideTitle />
        </Box>
      )}
    </div>
  );
}

function Row({ weekday, columns, byKey }: { weekday: number; columns: number[]; byKey: Map<string, ChairUseReport['heatmap'][number]> }) {
  return (
    <>
      <span className="ostium-heatmap-day" title={WEEKDAY_LABELS[weekday - 1]}>
        {WEEKDAY_SHORT[weekday - 1]}
      </span>
      {columns.map((h) => {
        const c = byKey.get(`${weekday}:${h}`);
        if (!c || c.share === null) return <span key={h} className="ostium-heatmap-cell ostium-heatmap-closed" />;
        const s = step(c.share);
        return (
          <span
            key={h}
            className="ostium-heatmap-cell"
            data-shade={s.shade}
            style={{ background: `var(--mantine-color-lagoon-${s.shade})`, color: s.shade >= 5 ? '#fffdfa' : 'var(--mantine-color-stone-9)' }}
          >
            {fixed1(c.share * 100)}
          </span>
        );
      })}
    </>
  );
}
