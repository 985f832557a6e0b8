import { Button, Group, Select, Stack, Table, Text, TextInput, Title } from '@mantine/core';
import type { Hold, LocationResource, OperatorSchedule, WorkingRule } from '@ostium/shared';
import { IconDeviceFloppy } from '@tabler/icons-react';
import { useState } from 'react';
import { useAddHold, useAddTimeOff, useDeleteHold, useDeleteTimeOff, useDeleteWorkingRule, useSaveWorkingRule } from '../api/resources';
import { errorOf, instantFromLocal, localFromInstant } from '../resources.util';
import { describeRule, weekdaysOf, withWeekdays, type RruleDay } from '../rrule.util';
import { SaveError } from './equipment-panel';
import { WeekdayPicker } from './weekday-picker';
import { RemoveButton } from './remove-button';

/** Each endodontist's working rules (weekly days, hours, lunch), time off and emergency holds. */
export function SchedulesPanel({ locations, operators }: { locations: LocationResource[]; operators: OperatorSchedule[] }) {
  const [operatorId, setOperatorId] = useState<number | null>(null);
  const schedule = operators.find((o) => o.operatorId === operatorId) ?? operators[0];
  if (!schedule) return <Text c="dimmed">No endodontists yet: add users with the endodontist role first.</Text>;
  return (
    <Stack gap="md">
      <Select
        label="Endodontist"
        w={280}
        data={operators.map((o) => ({ value: String(o.operatorId), label: o.name }))}
        value={String(schedule.operatorId)}
        onChange={(v) => v && setOperatorId(Number(v))}
        allowDeselect={false}
      />
      <Stack gap="lg" key={schedule.operatorId}>
        <WorkingRules schedule={schedule} locations={locations} />
        <TimeOffList schedule={schedule} locations={locations} />
        <Holds schedule={schedule} locations={locations} />
      </Stack>
    </Stack>
  );
}

const locationOptions = (ls: LocationResource[]) => ls.map((l) => ({ value: String(l.id), label: l.name }));
const zoneOf = (s: OperatorSchedule, ls: LocationResource[]) => ls.find((l) => l.id === s.workingRules[0]?.locationId)?.timeZone ?? ls[0]?.timeZone ?? 'UTC';

function WorkingRules({ schedule, locations }: { schedule: OperatorSchedule; locations: LocationResource[] }) {
  return (
    <section aria-label="Working hours">
      <Title order={4} fz="sm" mb={4}>
        Working hours
      </Title>
      <Text fz="xs" c="dimmed" mb="xs">
        Weekly rules per location, with an optional lunch break; the time finder books only inside them.
      </Text>
      <Stack gap="xs">
        {schedule.workingRules.map((r) => (
          <WorkingRuleForm key={`${r.id}-${r.rrule}-${r.start}-${r.end}`} rule={r} operatorId={schedule.operatorId} locations={locations} />
        ))}
        <WorkingRuleForm key={`new-${schedule.workingRules.length}`} operatorId={schedule.operatorId} locations={locations} />
      </Stack>
    </section>
  );
}

export function WorkingRuleForm({ rule, operatorId, locations }: { rule?: WorkingRule; operatorId: number; locations: LocationResource[] }) {
  const save = useSaveWorkingRule();
  const remove = useDeleteWorkingRule();
  const [rrule, setRrule] = useState(rule?.rrule ?? 'FREQ=WEEKLY');
  const [locationId, setLocationId] = useState(String(rule?.locationId ?? locations[0]?.id ?? ''));
  const [start, setStart] = useState(rule?.start ?? '08:00');
  const [end, setEnd] = useState(rule?.end ?? '16:30');
  const [lunchFrom, setLunchFrom] = useState(rule?.breaks?.[0]?.start ?? '');
  const [lunchTo, setLunchTo] = useState(rule?.breaks?.[0]?.end ?? '');
  const days = weekdaysOf(rrule);
  const err = errorOf(save.error ?? remove.error);
  const name = rule ? `working rule ${describeRule(rule.rrule)}` : 'new working rule';

  const submit = () => {
    const breaks = lunchFrom && lunchTo ? [{ start: lunchFrom, end: lunchTo }, ...(rule?.breaks?.slice(1) ?? [])] : (rule?.breaks?.slice(1) ?? []);
    save.mutate(
      { id: rule?.id, operatorId, body: { locationId: Number(locationId), rrule, start, end, breaks } },
      { onSuccess: () => !rule && (setRrule('FREQ=WEEKLY'), setLunchFrom(''), setLunchTo('')) },
    );
  };

  return (
    <form aria-label={name} onSubmit={(e) => (e.preventDefault(), submit())}>
      <Group gap="sm" align="flex-end" wrap="wrap" p={6} style={{ border: '1px solid var(--mantine-color-stone-2)', borderRadius: 8, background: rule ? undefined : 'var(--mantine-color-stone-0)' }}>
        {days ? (
          <WeekdayPicker value={days} onChange={(d: RruleDay[]) => setRrule(withWeekdays(d, rrule))} error={err.field('rrule')} />
        ) : (
          <TextInput size="xs" label="Rule (RRULE)" value={rrule} onChange={(e) => setRrule(e.currentTarget.value)} error={err.field('rrule')} w={260} />
        )}
        <Select size="xs" label="Location" data={locationOptions(locations)} value={locationId} onChange={(v) => v && setLocationId(v)} allowDeselect={false} w={160} error={err.field('locationId')} />
        <TextInput size="xs" type="time" label="From" value={start} onChange={(e) => setStart(e.currentTarget.value)} error={err.field('start')} />
        <TextInput size="xs" type="time" label="To" value={end} onChange={(e) => setEnd(e.currentTarget.value)} error={err.field('end')} />
        <TextInput size="xs" type="time" label="Lunch from" value={lunchFrom} onChange={(e) => setLunchFrom(e.currentTarget.value)} error={err.field('breaks.0')} />
        <TextInput size="xs" type="time" label="Lunch to" value={lunchTo} onChange={(e) => setLunchTo(e.currentTarget.value)} />
        <Button size="xs" type="submit" variant="light" loading={save.isPending} disabled={days?.length === 0} leftSection={<IconDeviceFloppy size={14} />}>
          {rule ? 'Save' : 'Add rule'}
        </Button>
        {rule && (
          <RemoveButton label={`Remove ${name}`} onClick={() => remove.mutate(rule.id)} loading={remove.isPending} />
        )}
        <Text fz="xs" c="dimmed" ff="monospace" aria-label="Rule as saved">
          {rrule}
        </Text>
      </Group>
      {err.message && !err.field('rrule') && !err.field('end') && !err.field('start') && <SaveError error={save.error ?? remove.error} />}
    </form>
  );
}

function TimeOffList({ schedule, locations }: { schedule: OperatorSchedule; locations: LocationResource[] }) {
  const add = useAddTimeOff();
  const remove = useDeleteTimeOff();
  const zone = zoneOf(schedule, locations);
  const [from, setFrom] = useState('');
  const [to, setTo] = useState('');
  const [reason, setReason] = useState('');
  const err = errorOf(add.error);
  return (
    <section aria-label="Time off">
      <Title order={4} fz="sm" mb={4}>
        Time off
      </Title>
      <Table maw={640}>
        <Table.Tbody>
          {schedule.timeOff.length === 0 && (
            <Table.Tr>
              <Table.Td c="dimmed">No time off.</Table.Td>
            </Table.Tr>
          )}
          {schedule.timeOff.map((t) => (
            <Table.Tr key={t.id}>
              <Table.Td>
                {localFromInstant(t.start, zone)} – {localFromInstant(t.end, zone)}
              </Table.Td>
              <Table.Td>{t.reason ?? ''}</Table.Td>
              <Table.Td w={40}>
                <RemoveButton label="Remove time off" onClick={() => remove.mutate(t.id)} />
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
        aria-label="Add time off"
        onSubmit={(e) => {
          e.preventDefault();
          const start = instantFromLocal(from, zone);
          const end = instantFromLocal(to, zone);
          if (start && end) add.mutate({ operatorId: schedule.operatorId, body: { start, end, ...(reason ? { reason } : {}) } }, { onSuccess: () => (setFrom(''), setTo(''), setReason('')) });
        }}
      >
        <TextInput size="xs" type="datetime-local" label={`From (${zone})`} required value={from} onChange={(e) => setFrom(e.currentTarget.value)} />
        <TextInput size="xs" type="datetime-local" label="To" required value={to} onChange={(e) => setTo(e.currentTarget.value)} error={err.field('end')} />
        <TextInput size="xs" label="Reason" value={reason} onChange={(e) => setReason(e.currentTarget.value)} />
        <Button size="xs" type="submit" variant="light" loading={add.isPending}>
          Add time off
        </Button>
      </Group>
      {err.message && !err.field('end') && (
        <Text fz="xs" c="red.7" role="alert">
          {err.message}
        </Text>
      )}
    </section>
  );
}

function Holds({ schedule, locations }: { schedule: OperatorSchedule; locations: LocationResource[] }) {
  const add = useAddHold();
  const remove = useDeleteHold();
  const [days, setDays] = useState<RruleDay[]>(['MO', 'TU', 'WE', 'TH', 'FR']);
  const [locationId, setLocationId] = useState(String(locations[0]?.id ?? ''));
  const [start, setStart] = useState('15:30');
  const [end, setEnd] = useState('16:00');
  const [opens, setOpens] = useState('18:00');
  const err = errorOf(add.error);
  const locName = (h: Hold) => locations.find((l) => l.id === h.locationId)?.name ?? `#${h.locationId}`;
  return (
    <section aria-label="Emergency holds">
      <Title order={4} fz="sm" mb={4}>
        Emergency holds
      </Title>
      <Text fz="xs" c="dimmed" mb="xs">
        Time kept free for urgent cases; an unused hold opens to everyone at the set time the evening before.
      </Text>
      <Table maw={640}>
        <Table.Tbody>
          {schedule.holds.length === 0 && (
            <Table.Tr>
              <Table.Td c="dimmed">No holds.</Table.Td>
            </Table.Tr>
          )}
          {schedule.holds.map((h) => (
            <Table.Tr key={h.id}>
              <Table.Td>{describeRule(h.rrule)}</Table.Td>
              <Table.Td>
                {h.start}–{h.end}
              </Table.Td>
              <Table.Td>{locName(h)}</Table.Td>
              <Table.Td>opens {h.opensEveningBeforeAt ?? '18:00'} the day before</Table.Td>
              <Table.Td w={40}>
                <RemoveButton label={`Remove hold ${describeRule(h.rrule)} ${h.start}`} onClick={() => remove.mutate(h.id)} />
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
        wrap="wrap"
        aria-label="Add a hold"
        onSubmit={(e) => {
          e.preventDefault();
          add.mutate({ operatorId: schedule.operatorId, locationId: Number(locationId), rrule: withWeekdays(days), start, end, opensEveningBeforeAt: opens });
        }}
      >
        <WeekdayPicker value={days} onChange={setDays} error={err.field('rrule')} />
        <Select size="xs" label="Location" data={locationOptions(locations)} value={locationId} onChange={(v) => v && setLocationId(v)} allowDeselect={false} w={160} />
        <TextInput size="xs" type="time" label="From" value={start} onChange={(e) => setStart(e.currentTarget.value)} />
        <TextInput size="xs" type="time" label="To" value={end} onChange={(e) => setEnd(e.currentTarget.value)} error={err.field('end')} />
        <TextInput size="xs" type="time" label="Opens the evening before at" value={opens} onChange={(e) => setOpens(e.currentTarget.value)} />
        <Button size="xs" type="submit" variant="light" loading={add.isPending} disabled={days.length === 0}>
          Add hold
        </Button>
      </Group>
      {err.message && !err.field('end') && !err.field('rrule') && (
        <Text fz="xs" c="red.7" role="alert">
          {err.message}
        </Text>
      )}
    </section>
  );
}
