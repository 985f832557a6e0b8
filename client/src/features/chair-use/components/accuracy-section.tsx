import { BarChart, LineChart } from '@mantine/charts';
import { SimpleGrid, Stack, Text } from '@mantine/core';
import type { EstimateAccuracyReport } from '@ostium/shared';
import type { UseQueryResult } from '@tanstack/react-query';
import { minutesNumber, shownChange } from '../report-format.util';
import { accuracyChartData, accuracyLevelTable, accuracyMonthChartData, accuracyMonthTable, accuracyOperatorTable, overrunTable } from '../report-tables.util';
import { ReportSection } from './report-section';
import { ReportTable } from './report-table';
import { StatCard } from './stat-card';

const min = (n: number | null) => (n === null ? '—' : `${minutesNumber(n)} min`);

/** How far estimates were from actual visits, before and after calibration, and the days that ran over. */
export function AccuracySection({ query, rangePart, zone }: { query: UseQueryResult<EstimateAccuracyReport>; rangePart: string; zone: string }) {
  return (
    <ReportSection
      id="estimate-accuracy"
      title="Estimate accuracy"
      description="The error of the estimate table alone beside the error after calibration from completed visits, and the chair days that ran past closing."
      query={query}
      empty={(r) =>
        r.totals.visits === 0 && r.overrunDays.length === 0
          ? { title: 'No completed visits in this range', hint: 'Widen the dates; the figures fill in as seated and dismissed times are recorded in the chairside list.' }
          : null
      }
    >
      {(r) => {
        const t = r.totals;
        return (
          <Stack gap="lg">
            <SimpleGrid cols={{ base: 1, sm: 3 }}>
              <StatCard label="Error, table alone" term="estimateError" value={min(t.beforeMae)} parts={`mean over ${t.visits} visits`} />
              <StatCard label="Error, after calibration" term="estimateError" value={min(t.afterMae)} parts={t.beforeMae === null || t.afterMae === null ? 'no visits to compare' : `${shownChange(t.beforeMae, t.afterMae)} min against the table alone`} />
              <StatCard label="Overrun days" term="overrunDay" value={String(r.overrunDays.length)} parts="chair days that ended after closing" />
            </SimpleGrid>
            {r.byLevel.length > 0 && (
              <div>
                <Text fz="sm" fw={700} mb={6}>
                  Error by difficulty, before and after calibration
                </Text>
                <BarChart
                  maxBarWidth={56}
                  h={220}
                  data={accuracyChartData(r)}
                  dataKey="level"
                  yAxisProps={{ width: 64, tickFormatter: (v: number) => `${v} min` }}
                  valueFormatter={(v) => `${v.toFixed(1)} min`}
                  withLegend
                  legendProps={{ verticalAlign: 'top', height: 36 }}
                  series={[
                    { name: 'before', label: 'Table alone', color: 'stone.5' },
                    { name: 'after', label: 'After calibration', color: 'lagoon.7' },
                  ]}
                  aria-label="Mean absolute estimate error by difficulty, before and after calibration"
                />
              </div>
            )}
            {r.byMonth.length > 1 && (
              <div>
                <Text fz="sm" fw={700} mb={6}>
                  Error by month of the visit
                </Text>
                <LineChart
                  h={220}
                  data={accuracyMonthChartData(r)}
                  dataKey="month"
                  yAxisProps={{ width: 64, tickFormatter: (v: number) => `${v} min` }}
                  valueFormatter={(v) => `${v.toFixed(1)} min`}
                  withLegend
                  legendProps={{ verticalAlign: 'top', height: 36 }}
                  curveType="linear"
                  connectNulls
                  series={[
                    { name: 'before', label: 'Table alone', color: 'stone.5' },
                    { name: 'after', label: 'After calibration', color: 'lagoon.7' },
                  ]}
                  aria-label="Mean absolute estimate error by month, before and after calibration"
                />
              </div>
            )}
            {r.byMonth.length > 0 && <ReportTable model={accuracyMonthTable(r)} rangePart={rangePart} minWidth={460} />}
            <SimpleGrid cols={{ base: 1, lg: 2 }} spacing="lg">
              <ReportTable model={accuracyLevelTable(r)} rangePart={rangePart} minWidth={460} empty="No completed visits in this range." />
              <ReportTable model={accuracyOperatorTable(r)} rangePart={rangePart} minWidth={460} empty="No completed visits in this range." />
            </SimpleGrid>
            <ReportTable model={overrunTable(r, zone)} rangePart={rangePart} maxHeight={420} empty="No chair day ran past closing in this range." />
          </Stack>
        );
      }}
    </ReportSection>
  );
}
