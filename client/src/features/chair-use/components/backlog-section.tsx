import { BarChart } from '@mantine/charts';
import { Alert, Button, Card, Group, NumberInput, SimpleGrid, Stack, Text, Title } from '@mantine/core';
import type { BacklogReport, BacklogWhatIfResponse, ReportQuery } from '@ostium/shared';
import type { UseQueryResult } from '@tanstack/react-query';
import { IconArrowRight, IconCalculator } from '@tabler/icons-react';
import { useState, type ReactNode } from 'react';
import { useBacklogWhatIf } from '../api/reports';
import { hours, LEVEL_LABELS, NO_OPEN_TIME, NONE, rangeLabel, shownChange, weeks, weeksNumber, WHAT_IF_WEEK_DECIMALS } from '../report-format.util';
import { averageMinutesTable, backlogTable, whatIfTable } from '../report-tables.util';
import { DefinitionLabel } from './definition-label';
import { ReportSection } from './report-section';
import { ReportTable } from './report-table';
import { StatCard } from './stat-card';

const LIMIT_NOTES: Record<BacklogReport['limitedBy'], string | null> = {
  chairs: 'Free chair time is the limit: more chair days shorten the backlog.',
  operators: 'Endodontists’ working time is the limit, below the free chair time: more chair days alone change little.',
  none: null,
};

const backlogWeeks = (r: BacklogReport, decimals = 1) => (r.noOpenTime ? NO_OPEN_TIME : weeks(r.totals.weeksOfBacklog, NO_OPEN_TIME, decimals));
const leadWeeks = (r: BacklogReport, decimals = 1) => (r.noOpenTime ? NO_OPEN_TIME : weeks(r.leadTimeWeeks, NONE, decimals));

/** Chart points: one bar per row of the table (location · level), with the table's rounded weeks. */
const chartRows = (r: BacklogReport) =>
  r.rows
    .filter((row) => row.weeksOfBacklog !== null)
    .map((row) => ({ row: `${row.locationName} · ${LEVEL_LABELS[row.level]}`, weeks: Number(weeksNumber(row.weeksOfBacklog)) }));

/** The Backlog forecast: cases still to book priced in chair time, against the free chair time per week, with a what-if. */
export function BacklogSection({ query, filters, rangePart }: { query: UseQueryResult<BacklogReport>; filters: ReportQuery; rangePart: string }) {
  return (
    <ReportSection
      id="backlog"
      title="Backlog forecast"
      description="Cases planned but not yet booked, and referrals still to triage, against the free chair time of the weeks ahead; the range above sets the past visits each level’s minutes come from."
      query={query}
      cards={4}
    >
      {(r) => {
        const chart = chartRows(r);
        return (
          <Stack gap="lg">
            <SimpleGrid cols={{ base: 1, xs: 2, md: 4 }}>
              <StatCard label="Weeks of backlog" term="backlog" value={backlogWeeks(r)} parts={`${hours(r.totals.minutes)} of chair time to book`} />
              <StatCard label="Lead time for a new case" value={leadWeeks(r)} parts="until its first visit, expected" />
              <StatCard
                label="Capacity per week"
                value={hours(r.capacityMinutesPerWeek)}
                parts={`chair time with an endodontist free to work it, of ${hours(r.openChairMinutesPerWeek)} open`}
              />
              <StatCard label="Cases waiting" value={String(r.totals.cases)} parts="planned but not booked, or still to triage" />
            </SimpleGrid>
            <Text fz="xs" c="dimmed">
              Free time counted over the next {r.horizon.weeks} weeks, {rangeLabel(r.horizon.from, r.horizon.to)}: {hours(r.freeChairMinutesPerWeek)} of chairs and{' '}
              {hours(r.freeOperatorMinutesPerWeek)} of endodontists free per week.
            </Text>
            {r.noOpenTime && (
              <Alert color="amber" variant="light" title="No open time ahead">
                The chairs have no free time with an endodontist in the coming weeks, so the backlog cannot be worked down at all. Add chair days below to see what they would change, or
                set opening hours under Resources.
              </Alert>
            )}
            {LIMIT_NOTES[r.limitedBy] && (
              <Text fz="sm" c="dimmed">
                {LIMIT_NOTES[r.limitedBy]}
              </Text>
            )}
            <WhatIfPanel key={filters.locationId ?? 'all'} report={r} filters={filters} rangePart={rangePart} />
            {r.totals.cases === 0 ? (
              <Text fz="sm">No case is waiting to be booked: the backlog is clear.</Text>
            ) : (
              <>
                {chart.length > 0 && (
                  <div>
                    <Text fz="sm" fw={700} mb={6}>
                      Weeks of backlog by location and difficulty
                    </Text>
                    <BarChart
                      maxBarWidth={56}
                      h={Math.max(140, 48 + chart.length * 40)}
                      data={chart}
                      dataKey="row"
                      orientation="vertical"
                      yAxisProps={{ width: 200 }}
                      xAxisProps={{ tickFormatter: (v: number) => `${v} wk` }}
                      valueFormatter={(v) => `${v.toFixed(1)} weeks`}
                      series={[{ name: 'weeks', label: 'Weeks of backlog', color: 'lagoon.7' }]}
                      aria-label="Weeks of backlog by location and difficulty"
                    />
                  </div>
                )}
                <ReportTable model={backlogTable(r)} rangePart={rangePart} minWidth={620} />
              </>
            )}
            <ReportTable model={averageMinutesTable(r)} rangePart={rangePart} minWidth={420} />
          </Stack>
        );
      }}
    </ReportSection>
  );
}

function Compare({ label, before, after, change }: { label: ReactNode; before: string; after: string; change: string }) {
  return (
    <div>
      <Text fz="xs" c="dimmed" fw={600} tt="uppercase" style={{ letterSpacing: '0.05em' }}>
        {label}
      </Text>
      <Group gap={8} align="baseline" wrap="nowrap">
        <Text fz={18} fw={600} c="stone.7">
          {before}
        </Text>
        <IconArrowRight size={16} aria-label="becomes" />
        <Text fz={22} fw={700}>
          {after}
        </Text>
        <Text fz="sm" c="dimmed">
          ({change})
        </Text>
      </Group>
    </div>
  );
}

const D = WHAT_IF_WEEK_DECIMALS;

function WhatIfPanel({ report, filters, rangePart }: { report: BacklogReport; filters: ReportQuery; rangePart: string }) {
  const locationId = filters.locationId;
  const [chairDays, setChairDays] = useState<number>(1);
  const [operatorDays, setOperatorDays] = useState<number>(0);
  const whatIf = useBacklogWhatIf();
  const result: BacklogWhatIfResponse | undefined = whatIf.data;
  const n = (v: string | number) => (typeof v === 'number' ? v : Number(v) || 0);

  return (
    <Card withBorder bg="stone.0" component="section" aria-labelledby="what-if-heading" className="no-print ostium-report-whatif">
      <Stack gap="sm">
        <div>
          <Title order={4} fz="md" id="what-if-heading">
            What if we add time?
          </Title>
          <Text fz="xs" c="dimmed">
            Chair days (each with an endodontist to work it) and endodontist days in chairs already open, per week, to add — or take away, below zero; the forecast is
            worked out again with them{locationId ? ' for this location' : ''}.
          </Text>
        </div>
        <Group align="flex-end" gap="sm" wrap="wrap">
          <NumberInput label="Chair days per week" w={170} min={-20} max={20} step={1} allowDecimal={false} value={chairDays} onChange={(v) => setChairDays(n(v))} />
          <NumberInput label="Endodontist days per week" w={200} min={-20} max={20} step={1} allowDecimal={false} value={operatorDays} onChange={(v) => setOperatorDays(n(v))} />
          <Button
            leftSection={<IconCalculator size={16} />}
            loading={whatIf.isPending}
            disabled={chairDays === 0 && operatorDays === 0}
            onClick={() => whatIf.mutate({ ...(locationId ? { locationId } : {}), from: filters.from, to: filters.to, chairDaysPerWeek: chairDays, operatorDaysPerWeek: operatorDays })}
          >
            Forecast with this change
          </Button>
        </Group>
        {whatIf.isError && (
          <Alert color="red" variant="light" title="Could not work out the forecast" role="alert">
            {whatIf.error.message}
          </Alert>
        )}
        {result && (
          <Stack gap="sm" component="section" aria-live="polite" aria-label="Forecast with the change">
            <SimpleGrid cols={{ base: 1, sm: 2 }}>
              <Compare
                label={<DefinitionLabel term="backlog">Weeks of backlog</DefinitionLabel>}
                before={backlogWeeks(result.before, D)}
                after={backlogWeeks(result.after, D)}
                change={result.after.noOpenTime || result.before.noOpenTime ? 'no open time' : shownChange(result.before.totals.weeksOfBacklog, result.after.totals.weeksOfBacklog, NONE, D)}
              />
              <Compare
                label="Lead time for a new case"
                before={leadWeeks(result.before, D)}
                after={leadWeeks(result.after, D)}
                change={result.after.noOpenTime || result.before.noOpenTime ? 'no open time' : shownChange(result.before.leadTimeWeeks, result.after.leadTimeWeeks, NONE, D)}
              />
            </SimpleGrid>
            {result.after.noOpenTime && (
              <Alert color="amber" variant="light" title="No open time">
                With this change no free chair time is left in the weeks ahead, so the backlog would only grow.
              </Alert>
            )}
            <Text fz="xs" c="dimmed">
              One chair day stands for {hours(result.assumptions.chairDayMinutes)} of open chair time and one endodontist day for {hours(result.assumptions.operatorDayMinutes)} of working time, over the next {result.assumptions.horizonWeeks} weeks; weeks to two decimals here, so that one day’s change shows.
              {report.limitedBy !== result.after.limitedBy && LIMIT_NOTES[result.after.limitedBy] ? ` ${LIMIT_NOTES[result.after.limitedBy]}` : ''}
            </Text>
            <ReportTable model={whatIfTable(result)} rangePart={rangePart} minWidth={520} />
          </Stack>
        )}
      </Stack>
    </Card>
  );
}
