import '@mantine/dates/styles.css';
import { Button, Group, Select } from '@mantine/core';
import { DatePickerInput } from '@mantine/dates';
import type { LocationSummary, ReportQuery } from '@ostium/shared';
import { IconCalendar } from '@tabler/icons-react';
import { useEffect, useMemo, useState } from 'react';
import { rangePresets } from '../report-range.util';

export interface FilterChange {
  from?: string;
  to?: string;
  locationId?: number | null;
  chairId?: number | null;
  operatorId?: number | null;
}

type Draft = [string | null, string | null];

/** Date range (with quick ranges), location, chair and endodontist; every change goes to the address. */
export function ReportFilters({
  filters,
  locations,
  endodontists,
  zone,
  now,
  onChange,
  onReset,
  isDefault,
}: {
  filters: ReportQuery;
  locations: LocationSummary[];
  endodontists: { id: number; name: string; active?: boolean }[];
  zone: string;
  now: Date;
  onChange: (c: FilterChange) => void;
  onReset: () => void;
  isDefault: boolean;
}) {
  // The picker holds a half-chosen range until both ends are picked; only a whole range is applied.
  const [draft, setDraft] = useState<Draft>([filters.from, filters.to]);
  useEffect(() => setDraft([filters.from, filters.to]), [filters.from, filters.to]);
  const presets = useMemo(() => rangePresets(now, zone), [now, zone]);

  const location = locations.find((l) => l.id === filters.locationId);
  const chairData = (location ? [location] : locations).map((l) => ({ group: l.name, items: l.chairs.map((c) => ({ value: String(c.id), label: c.name })) }));
  const chairLocation = (chairId: number) => locations.find((l) => l.chairs.some((c) => c.id === chairId));

  return (
    <Group gap="sm" align="flex-end" wrap="wrap" className="no-print" role="search" aria-label="Report filters">
      <DatePickerInput
        type="range"
        label="Dates"
        w={270}
        leftSection={<IconCalendar size={16} />}
        valueFormat="MMM D, YYYY"
        value={draft}
        allowSingleDateInRange
        weekendDays={[]}
        presets={presets}
        onChange={(v) => {
          const next: Draft = [v[0] ? String(v[0]).slice(0, 10) : null, v[1] ? String(v[1]).slice(0, 10) : null];
          setDraft(next);
          if (next[0] && next[1]) onChange({ from: next[0], to: next[1] });
        }}
      />
      {locations.length > 1 && (
        <Select
          label="Location"
          placeholder="All locations"
          w={180}
          clearable
          data={locations.map((l) => ({ value: String(l.id), label: l.name }))}
          value={filters.locationId ? String(filters.locationId) : null}
          onChange={(v) => {
            const locationId = v ? Number(v) : null;
            // A chair of another location would filter everything away.
            const keepChair = filters.chairId !== undefined && (locationId === null || chairLocation(filters.chairId)?.id === locationId);
            onChange({ locationId, ...(keepChair ? {} : { chairId: null }) });
          }}
        />
      )}
      <Select
        label="Chair"
        placeholder="All chairs"
        w={180}
        clearable
        data={chairData}
        value={filters.chairId ? String(filters.chairId) : null}
        onChange={(v) => {
          const chairId = v ? Number(v) : null;
          onChange({ chairId, ...(chairId !== null && locations.length > 1 ? { locationId: chairLocation(chairId)?.id ?? null } : {}) });
        }}
      />
      <Select
        label="Endodontist"
        placeholder="All endodontists"
        w={210}
        clearable
        data={endodontists.map((o) => ({ value: String(o.id), label: o.active === false ? `${o.name} (inactive)` : o.name }))}
        value={filters.operatorId ? String(filters.operatorId) : null}
        onChange={(v) => onChange({ operatorId: v ? Number(v) : null })}
      />
      {!isDefault && (
        <Button variant="subtle" onClick={onReset}>
          Reset filters
        </Button>
      )}
    </Group>
  );
}
