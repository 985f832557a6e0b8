import { Alert, Button, Checkbox, Group, Select, Stack, Table, Text, TextInput, Title } from '@mantine/core';
import type { LocationResource } from '@ostium/shared';
import { useMemo, useState } from 'react';
import { useAddClosure, useDeleteClosure, useSaveLocation } from '../api/resources';
import { errorOf, hoursFromRows, hoursRows, timeZoneNames, WEEKDAY_LONG, type DayHours } from '../resources.util';
import { RemoveButton } from './remove-button';

/** Locations: name, time zone, weekly opening hours, and closures with their reasons. */
export function LocationsPanel({ locations }: { locations: LocationResource[] }) {
  const [selected, setSelected] = useState<string>(locations[0] ? String(locations[0].id) : 'new');
  const location = locations.find((l) => String(l.id) === selected) ?? null;
  return (
    <Stack gap="md">
      <Select
        label="Location"
        w={280}
        data={[...locations.map((l) => ({ value: String(l.id), label: l.name })), { value: 'new', label: '+ New location' }]}
        value={selected}
        onChange={(v) => v && setSelected(v)}
        allowDeselect={false}
      />
      <LocationForm key={location?.id ?? 'new'} location={location} onCreated={(id) => setSelected(String(id))} />
      {location && <Closures location={location} />}
    </Stack>
  );
}

function LocationForm({ location, onCreated }: { location: LocationResource | null; onCreated: (id: number) => void }) {
  const save = useSaveLocation();
  const zones = useMemo(timeZoneNames, []);
  const [name, setName] = useState(location?.name ?? '');
  const [address, setAddress] = useState(location?.address ?? '');
  const [phone, setPhone] = useState(location?.phone ?? '');
  const [timeZone, setTimeZone] = useState(location?.timeZone ?? Intl.DateTimeFormat().resolvedOptions().timeZone);
  const [rows, setRows] = useState<DayHours[]>(() => hoursRows(location?.openingHours ?? []));
  const err = errorOf(save.error);
  const setRow = (i: number, p: Partial<DayHours>) => setRows((rs) => rs.map((r, j) => (j === i ? { ...r, ...p } : r)));

  return (
    <form
      aria-label="Location details"
      onSubmit={(e) => {
        e.preventDefault();
        save.mutate(
          { id: location?.id, body: { name, address: address || null, phone: phone || null, timeZone, openingHours: hoursFromRows(rows) } },
          { onSuccess: (l) => !location && onCreated(l.id) },
        );
      }}
    >
      <Stack gap="sm">
        <Group grow align="flex-start">
          <TextInput label="Name" required value={name} onChange={(e) => setName(e.currentTarget.value)} error={err.field('name')} />
          <Select label="Time zone" searchable data={zones} value={timeZone} onChange={(v) => v && setTimeZone(v)} error={err.field('timeZone')} allowDeselect={false} />
        </Group>
        <Group grow align="flex-start">
          <TextInput label="Address" value={address} onChange={(e) => setAddress(e.currentTarget.value)} />
          <TextInput label="Phone" value={phone} onChange={(e) => setPhone(e.currentTarget.value)} placeholder="555-0100" />
        </Group>
        <Table aria-label="Opening hours" maw={460}>
          <Table.Thead>
            <Table.Tr>
              <Table.Th>Day</Table.Th>
              <Table.Th>Open</Table.Th>
              <Table.Th>From</Table.Th>
              <Table.Th>To</Table.Th>
            </Table.Tr>
          </Table.Thead>
          <Table.Tbody>
            {rows.map((r, i) => (
              <Table.Tr key={r.weekday}>
                <Table.Td>{WEEKDAY_LONG[r.weekday]}</Table.Td>
                <Table.Td>
                  <Checkbox aria-label={`Open on ${WEEKDAY_LONG[r.weekday]}`} checked={r.open} onChange={(e) => setRow(i, { open: e.currentTarget.checked })} />
                </Table.Td>
                <Table.Td>
                  <TextInput size="xs" type="time" aria-label={`${WEEKDAY_LONG[r.weekday]} opens`} value={r.from} disabled={!r.open} onChange={(e) => setRow(i, { from: e.currentTarget.value })} />
                </Table.Td>
                <Table.Td>
                  <TextInput size="xs" type="time" aria-label={`${WEEKDAY_LONG[r.weekday]} closes`} value={r.to} disabled={!r.open} onChange={(e) => setRow(i, { to: e.currentTarget.value })} error={err.field(`openingHours.${i}.close`)} />
                </Table.Td>
              </Table.Tr>
            ))}
          </Table.Tbody>
        </Table>
        {err.message && (
          <Alert color="red" variant="light" role="alert" p="xs">
            {err.message}
          </Alert>
        )}
        <Group>
          <Button type="submit" loading={save.isPending}>
            {location ? 'Save location' : 'Add location'}
          </Button>
          {save.isSuccess && (
            <Text fz="sm" c="lagoon.8" role="status">
              Saved
            </Text>
          )}
        </Group>
      </Stack>
    </form>
  );
}

function Closures({ location }: { location: LocationResource }) {
  const add = useAddClosure();
  const remove = useDeleteClosure();
  const [date, setDate] = useState('');
  const [reason, setReason] = useState('');
  const err = errorOf(add.error ?? remove.error);
  return (
    <section aria-label="Closures">
      <Title order={4} fz="sm" mb={4}>
        Closures
      </Title>
      <Text fz="xs" c="dimmed" mb="xs">
        Days the location is shut (holidays, maintenance); the time finder offers nothing on them.
      </Text>
      <Table maw={560}>
        <Table.Tbody>
          {location.closures.length === 0 && (
            <Table.Tr>
              <Table.Td colSpan={3} c="dimmed">
                No closures.
              </Table.Td>
            </Table.Tr>
          )}
          {location.closures.map((c) => (
            <Table.Tr key={c.id}>
              <Table.Td w={120}>{c.date}</Table.Td>
              <Table.Td>{c.reason}</Table.Td>
              <Table.Td w={40}>
                <RemoveButton label={`Remove closure on ${c.date}`} onClick={() => remove.mutate(c.id)} />
              </Table.Td>
            </Table.Tr>
          ))}
        </Table.Tbody>
      </Table>
      <Group
        component="form"
        gap="xs"
        mt="xs"
        align="flex-end"
        aria-label="Add a closure"
        onSubmit={(e) => {
          e.preventDefault();
          add.mutate({ locationId: location.id, body: { date, reason } }, { onSuccess: () => (setDate(''), setReason('')) });
        }}
      >
        <TextInput size="xs" type="date" label="Date" required value={date} onChange={(e) => setDate(e.currentTarget.value)} error={err.field('date')} />
        <TextInput size="xs" label="Reason" required value={reason} onChange={(e) => setReason(e.currentTarget.value)} error={err.field('reason')} w={260} />
        <Button size="xs" type="submit" loading={add.isPending} variant="light">
          Add closure
        </Button>
      </Group>
      {err.message && !err.field('date') && !err.field('reason') && (
        <Text fz="xs" c="red.7" mt={4} role="alert">
          {err.message}
        </Text>
      )}
    </section>
  );
}
