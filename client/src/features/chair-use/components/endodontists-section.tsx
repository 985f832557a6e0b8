import { BarChart } from '@mantine/charts';
import { SimpleGrid, Stack, Text } from '@mantine/core';
import type { OperatorUseReport, ReportQuery } from '@ostium/shared';
import type { UseQueryResult } from '@tanstack/react-query';
import { hours, percent } from '../report-format.util';
import { operatorChartData, operatorTable } from '../report-tables.util';
import { ReportSection } from './report-section';
import { ReportTable } from './report-table';
import { StatCard } from './stat-card';

/** Clinical minutes of each endodontist against their working time. */
export function EndodontistsSection({ query, filters, rangePart }: { query: UseQueryResult<OperatorUseReport>; filters: ReportQuery; rangePart: string }) {
  return (
    <ReportSection
      id="endodontists"
      title="Endodontists"
      description="How much of each endodontist’s working time went to visits."
      query={query}
      cards={2}
      empty={(r) =>
        r.byOperator.length === 0 || r.totals.workingMinutes === 0
          ? {
              title: 'No working time in this range',
              hint: filters.operatorId
                ? 'This endodontist had no working hours on these days. Widen the dates or pick another endodontist.'
                : 'No endodontist had working hours on these days. Widen the dates; working hours are set under Resources.',
            }
          : null
      }
    >
      {(r) => {
        const data = operatorChartData(r);
        return (
          <Stack gap="lg">
            <SimpleGrid cols={{ base: 1, sm: 2 }}>
              <StatCard label="Clinical share" term="operatorUse" value={percent(r.totals.share, 'no working time')} parts={`${hours(r.totals.clinicalMinutes)} in visits of ${hours(r.totals.workingMinutes)} working`} />
              <StatCard label="Endodontists" value={String(r.byOperator.length)} parts="with working time in the range" />
            </SimpleGrid>
            {data.length > 0 && (
              <div>
                <Text fz="sm" fw={700} mb={6}>
                  Clinical share by endodontist
                </Text>
                <BarChart
                  maxBarWidth={56}
                  h={Math.max(140, 48 + data.length * 40)}
                  data={data}
                  dataKey="endodontist"
                  orientation="vertical"
                  xAxisProps={{ domain: [0, 100], tickFormatter: (v: number) => `${v} %` }}
                  yAxisProps={{ width: 170 }}
                  valueFormatter={(v) => `${v.toFixed(1)} %`}
                  series={[{ name: 'share', label: 'Clinical share', color: 'lagoon.7' }]}
                  aria-label="Clinical share of working time by endodontist"
                />
              </div>
            )}
            <ReportTable model={operatorTable(r)} rangePart={rangePart} />
          </Stack>
        );
      }}
    </ReportSection>
  );
}
