import { Anchor, Button, Group, Select, Text, TextInput } from '@mantine/core';
import { formatTooth, type ChairsideChair, type ChairsideDay, type LocationSummary, type ToothNotation } from '@ostium/shared';
import { IconMicroscope, IconPrinter } from '@tabler/icons-react';
import { Link, useSearchParams } from 'react-router-dom';
import { DifficultyBadge } from '../../../components/difficulty-badge';
import { EmptyState } from '../../../components/empty-state';
import { PageHeader } from '../../../components/page-header';
import { QueryState } from '../../../components/query-state';
import { PROCEDURE_LABELS } from '../../case-sheet/case-sheet.util';
import { localDay, localTime, STATE_LABELS, todayIn } from '../../chair-board/board.util';
import { useLocations, usePractice } from '../../practice/api/practice';
import { useChairside } from '../api/chairside';
import { TrayList } from './tray-list';
import './chairside.css';

/** /chairside — per chair, the day's visits in order with the tray to prepare; prints one chair per sheet. */
export function ChairsidePage() {
  const locations = useLocations();
  return (
    <QueryState query={locations}>
      {(ls) =>
        ls.length === 0 ? (
          <EmptyState title="No locations yet" hint="An administrator adds locations and chairs under Resources." />
        ) : (
          <Chairside locations={ls} />
        )
      }
    </QueryState>
  );
}

function Chairside({ locations }: { locations: LocationSummary[] }) {
  const [params, setParams] = useSearchParams();
  const location = locations.find((l) => l.id === Number(params.get('locationId'))) ?? locations[0]!;
  const zone = location.timeZone;
  const date = params.get('date') ?? todayIn(zone);
  const notation = usePractice().data?.settings.toothNotation ?? 'fdi';
  const day = useChairside(date, location.id);
  const set = (k: string, v: string) =>
    setParams(
      (p) => {
        const q = new URLSearchParams(p);
        q.set(k, v);
        return q;
      },
      { replace: true },
    );

  return (
    <div className="chairside-sheet">
      <div className="no-print">
        <PageHeader
          title="Chairside list"
          description="Each chair's visits in order, with the tray to prepare. Prints one chair per page."
          actions={
            <Button leftSection={<IconPrinter size={16} />} variant="light" onClick={() => window.print()}>
              Print
            </Button>
          }
        />
        <Group gap="xs" mb="md">
          <TextInput size="xs" type="date" aria-label="Date" value={date} onChange={(e) => e.currentTarget.value && set('date', e.currentTarget.value)} />
          <Select size="xs" aria-label="Location" data={locations.map((l) => ({ value: String(l.id), label: l.name }))} value={String(location.id)} onChange={(v) => v && set('locationId', v)} allowDeselect={false} w={200} />
          <Anchor component={Link} to={`/board?date=${date}&locationId=${location.id}`} fz="sm">
            Chair board for this day
          </Anchor>
        </Group>
      </div>
      <QueryState query={day}>{(d) => <ChairsideSheets day={d} location={location} notation={notation} />}</QueryState>
    </div>
  );
}

function ChairsideSheets({ day, location, notation }: { day: ChairsideDay; location: LocationSummary; notation: ToothNotation }) {
  const visits = day.chairs.reduce((n, c) => n + c.visits.length, 0);
  if (visits === 0) return <EmptyState title="No visits on this day" hint="Pick another day, or book visits from a case sheet with Find times." />;
  return (
    <>
      {day.chairs.map((c) => (
        <ChairSheet key={c.chairId} chair={c} location={location} date={day.date} notation={notation} />
      ))}
    </>
  );
}

function ChairSheet({ chair, location, date, notation }: { chair: ChairsideChair; location: LocationSummary; date: string; notation: ToothNotation }) {
  const zone = location.timeZone;
  const microscopes = new Map(location.microscopes.map((m) => [m.id, m.name]));
  const tooth = (fdi: string) => {
    try {
      return formatTooth(fdi, notation);
    } catch {
      return fdi;
    }
  };
  return (
    <section className="chairside-chair" aria-label={chair.chairName}>
      <h3>
        {chair.chairName}
        <span className="chairside-print-inline">
          {' '}
          · {localDay(date, zone)} · {location.name}
        </span>
      </h3>
      {chair.visits.length === 0 ? (
        <Text fz="sm" c="dimmed">
          No visits in this chair.
        </Text>
      ) : (
        chair.visits.map((v) => (
          <article key={v.id} className="chairside-visit" aria-label={`${localTime(v.start, zone)} ${v.patient.name}`}>
            <div>
              <div className="chairside-time">
                {localTime(v.start, zone)}–{localTime(v.end, zone)}
              </div>
              <Text fz="xs" c="dimmed">
                {v.minutes} min
              </Text>
            </div>
            <div>
              <div className="chairside-meta">
                <b>{v.patient.name}</b>
                <span>Tooth {tooth(v.toothFdi)}</span>
                <span>{PROCEDURE_LABELS[v.procedure]}</span>
                {v.level && <DifficultyBadge level={v.level} size="xs" />}
                {v.needsMicroscope || v.microscopeId !== null ? (
                  <span>
                    <IconMicroscope size={14} aria-hidden="true" style={{ verticalAlign: '-2px' }} /> {v.microscopeId !== null ? (microscopes.get(v.microscopeId) ?? 'Microscope') : 'Microscope needed'}
                  </span>
                ) : null}
                <span className="chairside-taper">{STATE_LABELS[v.state]}</span>
              </div>
              <TrayList items={v.trayList} label={`Tray list for ${v.patient.name}`} />
            </div>
          </article>
        ))
      )}
    </section>
  );
}
