import { ActionIcon, Anchor, Button, Group, Loader, SegmentedControl, Select, Text, TextInput, Tooltip } from '@mantine/core';
import type { Appointment, AppointmentQuery, LocationSummary } from '@ostium/shared';
import { IconChevronLeft, IconChevronRight, IconMicroscope } from '@tabler/icons-react';
import { useQuery } from '@tanstack/react-query';
import { useMemo, useRef, useState } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { EmptyState } from '../../../components/empty-state';
import { PageHeader } from '../../../components/page-header';
import { QueryState } from '../../../components/query-state';
import { useLocations, usePractice } from '../../practice/api/practice';
import { usersQuery } from '../../users/api/users';
import { useAppointments } from '../api/appointments';
import { dayWindow, isShownOnBoard, localDay, makeLookup, shiftDate, todayIn, weekWindow } from '../board.util';
import { useBoardChange, type BoardChange } from '../use-board-change';
import { AppointmentDrawer } from './appointment-drawer';
import { BoardCalendar, type LeaveReverts } from './board-calendar';
import { ChangeProblemAlert } from './change-problem-alert';
import { WaitlistFits } from './waitlist-fits';

/** /board — the Chair board: a day with one time grid per chair side by side, or a filtered week. */
export function BoardPage() {
  const locations = useLocations();
  return (
    <>
      <PageHeader title="Chair board" description="Drag a visit to move it, drag its end to change its length, click it for details." />
      <QueryState query={locations}>
        {(ls) =>
          ls.length === 0 ? (
            <EmptyState title="No locations yet" hint="An administrator adds locations and chairs under Resources." action={<Anchor component={Link} to="/settings/resources">Open Resources</Anchor>} />
          ) : (
            <Board locations={ls} />
          )
        }
      </QueryState>
    </>
  );
}

function Board({ locations }: { locations: LocationSummary[] }) {
  const [params, setParams] = useSearchParams();
  const location = locations.find((l) => l.id === Number(params.get('locationId'))) ?? locations[0]!;
  const zone = location.timeZone;
  const date = params.get('date') ?? todayIn(zone);
  const view = params.get('view') === 'week' ? 'week' : 'day';
  const filter = params.get('show') ?? 'all';
  const practice = usePractice().data;
  const operators = useQuery(usersQuery('endodontist')).data ?? [];
  const gridMinutes = practice?.settings.bookingGridMinutes ?? 5;

  const set = (next: Record<string, string | null>) =>
    setParams(
      (p) => {
        const q = new URLSearchParams(p);
        for (const [k, v] of Object.entries(next)) if (v === null) q.delete(k);
        else q.set(k, v);
        return q;
      },
      { replace: true },
    );

  const query: AppointmentQuery = useMemo(() => {
    const w = view === 'day' ? dayWindow(date, zone) : weekWindow(date, zone);
    const [kind, id] = filter.split(':');
    return {
      from: w.from,
      to: w.to,
      locationId: location.id,
      ...(view === 'week' && kind === 'chair' ? { chairId: Number(id) } : {}),
      ...(view === 'week' && kind === 'operator' ? { operatorId: Number(id) } : {}),
    };
  }, [view, date, zone, filter, location.id]);
  const appointments = useAppointments(query);

  const lookup = useMemo(
    () => makeLookup({ notation: practice?.settings.toothNotation ?? 'fdi', locations, operators, appointments: appointments.data, timeZone: zone }),
    [practice, locations, operators, appointments.data, zone],
  );
  const shown = useMemo(() => (appointments.data ?? []).filter(isShownOnBoard), [appointments.data]);
  // One query feeds every column; each chair's list keeps its identity until the data changes, so a drag is not reset.
  const byChair = useMemo(() => {
    const m = new Map<number, Appointment[]>(location.chairs.map((c) => [c.id, []]));
    shown.forEach((a) => m.get(a.chairId)?.push(a));
    return m;
  }, [shown, location.chairs]);

  const change = useBoardChange(lookup);
  const leaveReverts = useRef<LeaveReverts>(new Map());
  const [selectedId, setSelectedId] = useState<number | null>(null);
  const selected = selectedId === null ? null : ((appointments.data ?? []).find((a) => a.id === selectedId) ?? null);
  const [freed, setFreed] = useState<Appointment | null>(null);
  const apply = async (c: BoardChange) => {
    const next = await change.apply(c);
    // A cancellation frees time: show who on the waitlist could take it.
    if (next?.state === 'cancelled') {
      setFreed(next);
      setSelectedId(null);
    }
    return next;
  };

  const step = view === 'day' ? 1 : 7;
  const filterOptions = [
    { group: 'Location', items: [{ value: 'all', label: `All of ${location.name}` }] },
    { group: 'Chair', items: location.chairs.map((c) => ({ value: `chair:${c.id}`, label: c.name })) },
    { group: 'Endodontist', items: operators.map((o) => ({ value: `operator:${o.id}`, label: o.name })) },
  ];

  return (
    <>
      <Group justify="space-between" mb="sm" wrap="wrap" gap="sm" className="no-print">
        <Group gap="xs">
          <SegmentedControl
            size="xs"
            aria-label="View"
            value={view}
            onChange={(v) => set({ view: v === 'week' ? 'week' : null })}
            data={[
              { value: 'day', label: 'Day' },
              { value: 'week', label: 'Week' },
            ]}
          />
          <ActionIcon variant="default" aria-label={view === 'day' ? 'Previous day' : 'Previous week'} onClick={() => set({ date: shiftDate(date, -step) })}>
            <IconChevronLeft size={16} />
          </ActionIcon>
          <Button size="xs" variant="default" onClick={() => set({ date: todayIn(zone) })}>
            Today
          </Button>
          <ActionIcon variant="default" aria-label={view === 'day' ? 'Next day' : 'Next week'} onClick={() => set({ date: shiftDate(date, step) })}>
            <IconChevronRight size={16} />
          </ActionIcon>
          <TextInput size="xs" type="date" aria-label="Date" value={date} onChange={(e) => e.currentTarget.value && set({ date: e.currentTarget.value })} />
          {appointments.isFetching && <Loader size="xs" aria-label="Refreshing" />}
        </Group>
        <Group gap="xs">
          {view === 'week' && <Select size="xs" aria-label="Show" data={filterOptions} value={filter} onChange={(v) => set({ show: v && v !== 'all' ? v : null })} allowDeselect={false} w={220} />}
          <Select
            size="xs"
            aria-label="Location"
            data={locations.map((l) => ({ value: String(l.id), label: l.name }))}
            value={String(location.id)}
            onChange={(v) => v && set({ locationId: v, show: null })}
            allowDeselect={false}
            w={200}
          />
        </Group>
      </Group>
      <Text fz="sm" fw={600} mb="xs" aria-live="polite">
        {view === 'day' ? localDay(date, zone) : `Week of ${localDay(weekWindow(date, zone).monday, zone)}`} · {location.name} ({zone})
      </Text>

      {freed && <WaitlistFits freed={freed} lookup={lookup} onClose={() => setFreed(null)} />}
      <div style={{ marginBottom: 8 }}>
        <ChangeProblemAlert problem={selected ? null : change.problem} onClose={change.clearProblem} />
      </div>

      {location.chairs.length === 0 ? (
        <EmptyState title="This location has no chairs" hint="Add chairs under Resources, then book visits from a case sheet." action={<Anchor component={Link} to="/settings/resources">Open Resources</Anchor>} />
      ) : (
        <QueryState query={appointments}>
          {() =>
            view === 'day' ? (
              <div className="ostium-board-columns" role="group" aria-label="Chairs">
                {location.chairs.map((c) => (
                  <BoardCalendar
                    key={c.id}
                    view="timeGridDay"
                    date={date}
                    chairId={c.id}
                    appointments={byChair.get(c.id) ?? []}
                    lookup={lookup}
                    openingHours={location.openingHours}
                    gridMinutes={gridMinutes}
                    leaveReverts={leaveReverts.current}
                    header={
                      <Group gap={4} wrap="nowrap" justify="center">
                        <Text fz="sm" fw={700}>
                          {c.name}
                        </Text>
                        {c.fixedMicroscopeId !== null && (
                          <Tooltip label={`Microscope ${lookup.microscopes.get(c.fixedMicroscopeId)?.name ?? ''} fixed here`}>
                            <IconMicroscope size={14} aria-label="Fixed microscope" />
                          </Tooltip>
                        )}
                      </Group>
                    }
                    onChange={apply}
                    onOpen={(a) => setSelectedId(a.id)}
                  />
                ))}
              </div>
            ) : (
              <BoardCalendar view="timeGridWeek" date={date} appointments={shown} lookup={lookup} openingHours={location.openingHours} gridMinutes={gridMinutes} onChange={apply} onOpen={(a) => setSelectedId(a.id)} />
            )
          }
        </QueryState>
      )}

      <AppointmentDrawer
        appointment={selected}
        lookup={lookup}
        chairs={location.chairs}
        gridMinutes={gridMinutes}
        problem={change.problem}
        pending={change.pending}
        onApply={apply}
        onClose={() => {
          setSelectedId(null);
          change.clearProblem();
        }}
      />
    </>
  );
}
