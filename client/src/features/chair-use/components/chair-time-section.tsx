import { BarChart } from '@mantine/charts';
import { SimpleGrid, Stack, Text } from '@mantine/core';
import type { ChairUseReport, ReportQuery } from '@ostium/shared';
import type { UseQueryResult } from '@tanstack/react-query';
import { hours, percent } from '../report-format.util';
import { chairTable, locationTable, weekChartData, weekTable } from '../report-tables.util';
import { HeatMap } from './heat-map';
import { ReportSection, type SectionEmpty } from './report-section';
import { ReportTable } from './report-table';
import { StatCard } from './stat-card';

export function chairUseEmpty(r: ChairUseReport, q: ReportQuery): SectionEmpty | null {
  if (r.totals.openMinutes === 0)
    return {
      title: 'No open chair time in this range',
      hint: 'The chairs had no opening hours on these days. Widen the dates or pick another location; opening hours and closures are set under Resources.',
    };
  if (r.totals.bookedMinutes === 0 && r.totals.actualMinutes === 0)
    return {
      title: 'No visits in this range',
      hint: q.operatorId ? 'Widen the dates, or pick another chair or endodontist.' : 'Widen the dates or pick another chair.',
    };
  return null;
}

/** Booked and actual share of open chair time: totals, by week, by chair, by weekday and hour. */
export function ChairTimeSection({ query, filters, rangePart }: { query: UseQueryResult<ChairUseReport>; filters: ReportQuery; rangePart: string }) {
  return (
    <ReportSection id="chair-time" title="Chair time" description="How much of the chairs’ open time was booked, and how much of it was really used." query={query} empty={(r) => chairUseEmpty(r, filters)}>
      {(r) => {
        const t = r.totals;
        const unbooked = Math.max(0, t.openMinutes - t.bookedMinutes);
        return (
          <Stack gap="lg">
            <SimpleGrid cols={{ base: 1, sm: 3 }}>
              <StatCard label="Booked share" term="chairUse" value={percent(t.share)} parts={`${hours(t.bookedMinutes)} booked of ${hours(t.openMinutes)} open`} />
              <StatCard
                label="Actual share"
                term="actualChairUse"
                value={percent(t.actualShare, 'no done days yet')}
                parts={`${hours(t.actualMinutes)} used of ${hours(t.actualOpenMinutes)} open, on days whose visits are done`}
              />
              <StatCard label="Open but not booked" value={hours(unbooked)} parts={`across ${r.byChair.length} chair${r.byChair.length === 1 ? '' : 's'}`} />
            </SimpleGrid>
            <div>
              <Text fz="sm" fw={700} mb={6}>
                Share of open time by week
              </Text>
              <BarChart
                maxBarWidth={56}
                h={240}
                data={weekChartData(r)}
                dataKey="week"
                yAxisProps={{ domain: [0, 100], width: 56, tickFormatter: (v: number) => `${v} %` }}
                valueFormatter={(v) => `${v.toFixed(1)} %`}
                withLegend
                legendProps={{ verticalAlign: 'top', height: 36 }}
                series={[
                  { name: 'booked', label: 'Booked share', color: 'lagoon.4' },
                  { name: 'actual', label: 'Actual share', color: 'lagoon.8' },
                ]}
                aria-label="Booked and actual share of open chair time by week"
              />
            </div>
            <ReportTable model={weekTable(r)} rangePart={rangePart} />
            <ReportTable model={chairTable(r)} rangePart={rangePart} minWidth={820} />
            {r.byLocation.length > 1 && <ReportTable model={locationTable(r)} rangePart={rangePart} minWidth={720} />}
            <HeatMap report={r} rangePart={rangePart} />
          </Stack>
        );
      }}
    </ReportSection>
  );
}
