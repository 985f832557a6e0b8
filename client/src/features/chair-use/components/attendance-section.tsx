import { SimpleGrid, Stack } from '@mantine/core';
import type { AttendanceReport, ReportQuery } from '@ostium/shared';
import type { UseQueryResult } from '@tanstack/react-query';
import { percent } from '../report-format.util';
import { channelTable, outcomeTable, remindersTable } from '../report-tables.util';
import { ReportSection } from './report-section';
import { ReportTable } from './report-table';
import { StatCard } from './stat-card';

/** No-shows, late cancellations, same-day fills, and how visits got confirmed. */
export function AttendanceSection({ query, filters, rangePart }: { query: UseQueryResult<AttendanceReport>; filters: ReportQuery; rangePart: string }) {
  return (
    <ReportSection
      id="attendance"
      title="Attendance"
      description="Who came, who did not, who cancelled late, and how visits were confirmed."
      query={query}
      cards={4}
      empty={(r) =>
        r.totals.visits === 0 && r.totals.earlyCancellations === 0
          ? { title: 'No visits in this range', hint: filters.operatorId ? 'Widen the dates, or pick another chair or endodontist.' : 'Widen the dates or pick another chair.' }
          : null
      }
    >
      {(r) => {
        const t = r.totals;
        return (
          <Stack gap="lg">
            <SimpleGrid cols={{ base: 1, xs: 2, md: 4 }}>
              <StatCard label="No-shows" term="noShow" value={String(t.noShows)} parts={`${percent(t.noShowShare, '—')} of ${t.visits} visits`} />
              <StatCard
                label="Late cancellations"
                term="lateCancellation"
                value={String(t.lateCancellations)}
                parts={`${percent(t.lateCancellationShare, '—')} of visits; under ${r.lateCancelNoticeHours} h notice (${t.earlyCancellations} cancelled earlier, not counted)`}
              />
              <StatCard label="Same-day fills" term="sameDayFill" value={String(t.sameDayFills)} parts="freed time booked again the same day" />
              <StatCard label="Confirmation rate" term="confirmationRate" value={percent(r.confirmationRate, '—')} parts="of visits that took place or were missed" />
            </SimpleGrid>
            <ReportTable
              model={outcomeTable(r)}
              rangePart={rangePart}
              note={`Attended, no-shows and late cancellations make up every counted visit, so their shares add to 100 %.${t.open > 0 ? ` ${t.open} visit${t.open === 1 ? '' : 's'} still booked or confirmed, with no outcome yet, ${t.open === 1 ? 'is' : 'are'} not counted.` : ''}`}
            />
            <SimpleGrid cols={{ base: 1, md: 2 }} spacing="lg">
              <ReportTable model={channelTable(r)} rangePart={rangePart} minWidth={360} note="Over the visits that took place or were missed; the four channels together make the confirmation rate." />
              <ReportTable model={remindersTable(r)} rangePart={rangePart} minWidth={360} />
            </SimpleGrid>
          </Stack>
        );
      }}
    </ReportSection>
  );
}
