import { BarChart } from '@mantine/charts';
import { SimpleGrid, Stack, Text } from '@mantine/core';
import type { ReferralsReport } from '@ostium/shared';
import type { UseQueryResult } from '@tanstack/react-query';
import { daysNumber } from '../report-format.util';
import { dentistTable, levelShareTable, monthChartData, waitingTable } from '../report-tables.util';
import { ReportSection } from './report-section';
import { ReportTable } from './report-table';
import { StatCard } from './stat-card';

const days = (n: number | null) => (n === null ? '—' : `${daysNumber(n)} days`);
export const referralsReceived = (r: ReferralsReport) => r.byDentist.reduce((s, d) => s + d.total, 0);

/** Where referrals come from, how difficult they are, how soon they are seen, and who is still waiting. */
export function ReferralsSection({ query, rangePart }: { query: UseQueryResult<ReferralsReport>; rangePart: string }) {
  return (
    <ReportSection
      id="referrals"
      title="Referrals"
      description="Referrals received in the range by referring dentist and difficulty, the wait for a first visit, and who is still waiting today."
      query={query}
      empty={(r) =>
        referralsReceived(r) === 0 && r.waiting.count === 0
          ? { title: 'No referrals in this range', hint: 'Widen the dates or pick another location; referrals come in through Intake.' }
          : null
      }
    >
      {(r) => (
        <Stack gap="lg">
          <SimpleGrid cols={{ base: 1, sm: 3 }}>
            <StatCard label="Referrals received" value={String(referralsReceived(r))} parts={`from ${r.byDentist.length} referring dentist${r.byDentist.length === 1 ? '' : 's'}`} />
            <StatCard
              label="Lead time, median"
              term="leadTime"
              value={days(r.leadTime.medianDays)}
              parts={r.leadTime.referrals === 0 ? 'no referral of the range has a first visit yet' : `90th percentile ${days(r.leadTime.p90Days)}, over ${r.leadTime.referrals} referrals`}
            />
            <StatCard
              label="Waiting today"
              value={String(r.waiting.count)}
              parts={r.waiting.count === 0 ? 'every referral is booked' : `median wait ${days(r.waiting.medianDays)}, longest ${days(r.waiting.oldestDays)}`}
            />
          </SimpleGrid>
          {r.months.length > 1 && (
            <div>
              <Text fz="sm" fw={700} mb={6}>
                Referrals received by month
              </Text>
              <BarChart
                maxBarWidth={56}
                h={200}
                data={monthChartData(r)}
                dataKey="month"
                yAxisProps={{ allowDecimals: false, width: 40 }}
                series={[{ name: 'referrals', label: 'Referrals', color: 'lagoon.7' }]}
                aria-label="Referrals received by month"
              />
            </div>
          )}
          <ReportTable model={dentistTable(r)} rangePart={rangePart} minWidth={480 + r.months.length * 70} empty="No referrals received in this range." />
          <SimpleGrid cols={{ base: 1, md: 2 }} spacing="lg">
            <ReportTable model={levelShareTable(r)} rangePart={rangePart} minWidth={360} empty="No referrals received in this range." note="Each tooth of a referral is a case with its own difficulty." />
            <ReportTable model={waitingTable(r)} rangePart={rangePart} minWidth={300} empty="Nobody is waiting to be booked." />
          </SimpleGrid>
        </Stack>
      )}
    </ReportSection>
  );
}
