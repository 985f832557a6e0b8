import '@mantine/charts/styles.css';
import './chair-use.css';
import { Anchor, Button, Group, Paper, Stack, Text } from '@mantine/core';
import type { LocationSummary, ReportQuery, UserSummary } from '@ostium/shared';
import { IconPrinter } from '@tabler/icons-react';
import { useQuery } from '@tanstack/react-query';
import { useMemo, useState } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { EmptyState } from '../../../components/empty-state';
import { PageHeader } from '../../../components/page-header';
import { QueryState } from '../../../components/query-state';
import { useLocations, usePractice } from '../../practice/api/practice';
import { usersQuery } from '../../users/api/users';
import { useReport } from '../api/reports';
import { rangeLabel } from '../report-format.util';
import { lastFullWeeks, rangeFilePart, readFilters } from '../report-range.util';
import { AccuracySection } from './accuracy-section';
import { AttendanceSection } from './attendance-section';
import { BacklogSection } from './backlog-section';
import { ChairTimeSection } from './chair-time-section';
import { EndodontistsSection } from './endodontists-section';
import { PrintSummary } from './print-summary';
import { ReferralsSection } from './referrals-section';
import { ReportFilters, type FilterChange } from './report-filters';

const SECTIONS = [
  { id: 'chair-time', label: 'Chair time' },
  { id: 'endodontists', label: 'Endodontists' },
  { id: 'attendance', label: 'Attendance' },
  { id: 'referrals', label: 'Referrals' },
  { id: 'estimate-accuracy', label: 'Estimate accuracy' },
  { id: 'backlog', label: 'Backlog forecast' },
];

/** /reports/chair-use — the manager's reports: chair time, endodontists, attendance, referrals, estimate accuracy, backlog. */
export function ChairUsePage({ now }: { now?: Date }) {
  const locations = useLocations();
  return (
    <QueryState query={locations}>
      {(ls) =>
        ls.length === 0 ? (
          <>
            <PageHeader title="Chair use" />
            <EmptyState title="No locations yet" hint="An administrator adds locations, chairs and opening hours under Resources; the reports fill in as visits are booked." action={<Anchor component={Link} to="/settings/resources">Open Resources</Anchor>} />
          </>
        ) : (
          <Reports locations={ls} now={now} />
        )
      }
    </QueryState>
  );
}

function scopeLabel(q: ReportQuery, locations: LocationSummary[], endodontists: UserSummary[]) {
  const location = locations.find((l) => l.id === q.locationId);
  const chair = locations.flatMap((l) => l.chairs).find((c) => c.id === q.chairId);
  const operator = endodontists.find((o) => o.id === q.operatorId);
  return [chair ? chair.name : location ? `All chairs of ${location.name}` : locations.length > 1 ? 'All locations' : 'All chairs', operator ? operator.name : 'all endodontists'].join(', ');
}

function Reports({ locations, now: fixedNow }: { locations: LocationSummary[]; now?: Date }) {
  const [now] = useState(() => fixedNow ?? new Date());
  const [params, setParams] = useSearchParams();
  const endodontists = useQuery(usersQuery('endodontist')).data ?? [];
  const practice = usePractice().data;

  const requestedLocation = locations.find((l) => l.id === Number(params.get('locationId')));
  // Days are counted on the location's wall clock; every location of a practice is in one zone (America/New_York for the demo).
  const zone = (requestedLocation ?? locations[0]!).timeZone;
  const fallback = useMemo(() => lastFullWeeks(now, zone), [now, zone]);
  const filters = useMemo(() => readFilters(params, fallback), [params, fallback]);
  const rangePart = rangeFilePart(filters);

  const set = (c: FilterChange) =>
    setParams(
      (p) => {
        const q = new URLSearchParams(p);
        for (const [k, v] of Object.entries(c)) {
          if (v === null || v === undefined) q.delete(k);
          else q.set(k, String(v));
        }
        return q;
      },
      { replace: true },
    );
  const isDefault = filters.from === fallback.from && filters.to === fallback.to && !filters.locationId && !filters.chairId && !filters.operatorId;

  const chairUse = useReport('chair-use', filters);
  const operatorUse = useReport('operator-use', filters);
  const attendance = useReport('attendance', filters);
  const referrals = useReport('referrals', filters);
  const accuracy = useReport('estimate-accuracy', filters);
  const backlog = useReport('backlog', filters);

  const range = rangeLabel(filters.from, filters.to);
  const scope = scopeLabel(filters, locations, endodontists);
  const jump = (id: string) => document.getElementById(id)?.scrollIntoView({ behavior: 'smooth', block: 'start' });

  return (
    <>
      <div className="ostium-report-screen">
        <PageHeader
          title="Chair use"
          description={`${range} · ${scope}`}
          actions={
            <Button variant="light" leftSection={<IconPrinter size={16} />} onClick={() => window.print()} className="no-print">
              Print summary
            </Button>
          }
        />
        <Stack gap="md">
          <Paper withBorder p="sm" className="ostium-report-filters no-print">
            <Stack gap={8}>
              <ReportFilters filters={filters} locations={locations} endodontists={endodontists} zone={zone} now={now} onChange={set} onReset={() => setParams(new URLSearchParams(), { replace: true })} isDefault={isDefault} />
              <Group gap="md" component="nav" aria-label="Sections of the report">
                <Text fz="xs" c="dimmed">
                  Jump to
                </Text>
                {SECTIONS.map((s) => (
                  <Anchor
                    key={s.id}
                    href={`#${s.id}`}
                    fz="xs"
                    fw={600}
                    onClick={(e) => {
                      e.preventDefault();
                      jump(s.id);
                    }}
                  >
                    {s.label}
                  </Anchor>
                ))}
              </Group>
            </Stack>
          </Paper>
          <ChairTimeSection query={chairUse} filters={filters} rangePart={rangePart} />
          <EndodontistsSection query={operatorUse} filters={filters} rangePart={rangePart} />
          <AttendanceSection query={attendance} filters={filters} rangePart={rangePart} />
          <ReferralsSection query={referrals} rangePart={rangePart} />
          <AccuracySection query={accuracy} rangePart={rangePart} zone={zone} />
          <BacklogSection query={backlog} filters={filters} rangePart={rangePart} />
        </Stack>
      </div>
      <PrintSummary
        practiceName={practice?.name ?? ''}
        range={range}
        scope={scope}
        now={now}
        zone={zone}
        reports={{ chairUse: chairUse.data, operatorUse: operatorUse.data, attendance: attendance.data, referrals: referrals.data, accuracy: accuracy.data, backlog: backlog.data }}
      />
    </>
  );
}
