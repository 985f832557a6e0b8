import '@mantine/charts/styles.css';
import { BarChart } from '@mantine/charts';
import { Group, SegmentedControl, Text } from '@mantine/core';
import type { CellAccuracy } from '@ostium/shared';
import { useState } from 'react';
import { chartData, type ChartMeasure } from '../accuracy.util';

/** Estimated vs actual per cell: the error of the table alone beside the error after calibration. */
export function AccuracyChart({ cells }: { cells: CellAccuracy[] }) {
  const [measure, setMeasure] = useState<ChartMeasure>('meanAbsoluteError');
  const data = chartData(cells, measure);
  return (
    <div>
      <Group justify="space-between" mb="xs">
        <Text fz="xs" c="dimmed">
          {measure === 'meanAbsoluteError'
            ? 'Mean absolute difference between actual and estimated minutes; lower is better.'
            : 'Mean of actual minus estimated minutes; above zero, visits run longer than planned.'}
        </Text>
        <SegmentedControl
          size="xs"
          aria-label="Measure"
          value={measure}
          onChange={(v) => setMeasure(v as ChartMeasure)}
          data={[
            { value: 'meanAbsoluteError', label: 'Error' },
            { value: 'bias', label: 'Bias' },
          ]}
        />
      </Group>
      <BarChart
        h={Math.max(220, 40 + data.length * 34)}
        data={data}
        dataKey="cell"
        orientation="vertical"
        yAxisProps={{ width: 210 }}
        valueFormatter={(v) => `${v} min`}
        xAxisLabel="minutes"
        withLegend
        legendProps={{ verticalAlign: 'top' }}
        series={[
          { name: 'before', label: 'Table alone', color: 'stone.5' },
          { name: 'after', label: 'After calibration', color: 'lagoon.7' },
        ]}
        aria-label={measure === 'meanAbsoluteError' ? 'Mean absolute error per cell, before and after calibration' : 'Bias per cell, before and after calibration'}
      />
    </div>
  );
}
