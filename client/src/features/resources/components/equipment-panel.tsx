import { ActionIcon, Alert, Button, Group, SegmentedControl, Select, Stack, Table, Text, TextInput, Title } from '@mantine/core';
import type { ChairSummary, LocationResource, MicroscopeSummary } from '@ostium/shared';
import { IconDeviceFloppy } from '@tabler/icons-react';
import { useState } from 'react';
import { useDeleteChair, useDeleteMicroscope, useSaveChair, useSaveMicroscope } from '../api/resources';
import { errorOf } from '../resources.util';
import { RemoveButton } from './remove-button';

/** Chairs (each may have a microscope fixed to it) and microscopes (fixed to a chair or mobile within the location). */
export function EquipmentPanel({ locations }: { locations: LocationResource[] }) {
  const [selected, setSelected] = useState(String(locations[0]?.id ?? ''));
  const location = locations.find((l) => String(l.id) === selected);
  if (!location) return <Text c="dimmed">Add a location first.</Text>;
  return (
    <Stack gap="md">
      <Select label="Location" w={280} data={locations.map((l) => ({ value: String(l.id), label: l.name }))} value={selected} onChange={(v) => v && setSelected(v)} allowDeselect={false} />
      <Chairs location={location} />
      <Microscopes location={location} />
    </Stack>
  );
}

function Chairs({ location }: { location: LocationResource }) {
  const fixedScopes = location.microscopes.filter((m) => !m.mobile);
  return (
    <section aria-label="Chairs">
      <Title order={4} fz="sm" mb={4}>
        Chairs
      </Title>
      <Table maw={640}>
        <Table.Thead>
          <Table.Tr>
            <Table.Th>Name</Table.Th>
            <Table.Th>Fixed microscope</Table.Th>
            <Table.Th w={80} />
          </Table.Tr>
        </Table.Thead>
        <Table.Tbody>
          {location.chairs.map((c) => (
            <ChairRow key={`${c.id}-${c.name}-${c.fixedMicroscopeId}`} chair={c} locationId={location.id} scopes={fixedScopes} />
          ))}
          <ChairRow key={`new-${location.chairs.length}`} locationId={location.id} scopes={fixedScopes} />
        </Table.Tbody>
      </Table>
    </section>
  );
}

function ChairRow({ chair, locationId, scopes }: { chair?: ChairSummary; locationId: number; scopes: MicroscopeSummary[] }) {
  const save = useSaveChair();
  const remove = useDeleteChair();
  const [name, setName] = useState(chair?.name ?? '');
  const [scope, setScope] = useState<string | null>(chair?.fixedMicroscopeId ? String(chair.fixedMicroscopeId) : null);
  const err = errorOf(save.error ?? remove.error);
  const label = chair ? chair.name : 'new chair';
  return (
    <Table.Tr>
      <Table.Td>
        <TextInput size="xs" aria-label={`Name of ${label}`} placeholder={chair ? undefined : 'New chair name'} value={name} onChange={(e) => setName(e.currentTarget.value)} error={err.field('name') ?? (err.field('fixedMicroscopeId') ? undefined : err.message)} />
      </Table.Td>
      <Table.Td>
        <Select
          size="xs"
          aria-label={`Fixed microscope of ${label}`}
          placeholder="None"
          clearable
          data={scopes.map((m) => ({ value: String(m.id), label: m.name }))}
          value={scope}
          onChange={setScope}
          error={err.field('fixedMicroscopeId')}
        />
      </Table.Td>
      <Table.Td>
        <Group gap={4} wrap="nowrap">
          <ActionIcon
            variant="light"
            aria-label={chair ? `Save ${label}` : 'Add chair'}
            loading={save.isPending}
            disabled={!name.trim()}
            onClick={() => save.mutate({ id: chair?.id, locationId, body: { name: name.trim(), fixedMicroscopeId: scope ? Number(scope) : null } }, { onSuccess: () => !chair && (setName(''), setScope(null)) })}
          >
            <IconDeviceFloppy size={16} />
          </ActionIcon>
          {chair && (
            <RemoveButton label={`Remove ${label}`} onClick={() => remove.mutate(chair.id)} loading={remove.isPending} />
          )}
        </Group>
      </Table.Td>
    </Table.Tr>
  );
}

function Microscopes({ location }: { location: LocationResource }) {
  const fixedTo = new Map(location.chairs.filter((c) => c.fixedMicroscopeId !== null).map((c) => [c.fixedMicroscopeId!, c.name]));
  return (
    <section aria-label="Microscopes">
      <Title order={4} fz="sm" mb={4}>
        Microscopes
      </Title>
      <Text fz="xs" c="dimmed" mb="xs">
        A fixed microscope belongs to one chair (set it on the chair); a mobile one moves between the chairs of this location.
      </Text>
      <Table maw={640}>
        <Table.Thead>
          <Table.Tr>
            <Table.Th>Name</Table.Th>
            <Table.Th>Kind</Table.Th>
            <Table.Th>Chair</Table.Th>
            <Table.Th w={80} />
          </Table.Tr>
        </Table.Thead>
        <Table.Tbody>
          {location.microscopes.map((m) => (
            <MicroscopeRow key={`${m.id}-${m.name}-${m.mobile}`} scope={m} locationId={location.id} chairName={fixedTo.get(m.id)} />
          ))}
          <MicroscopeRow key={`new-${location.microscopes.length}`} locationId={location.id} />
        </Table.Tbody>
      </Table>
    </section>
  );
}

function MicroscopeRow({ scope, locationId, chairName }: { scope?: MicroscopeSummary; locationId: number; chairName?: string }) {
  const save = useSaveMicroscope();
  const remove = useDeleteMicroscope();
  const [name, setName] = useState(scope?.name ?? '');
  const [mobile, setMobile] = useState(scope?.mobile ?? false);
  const err = errorOf(save.error ?? remove.error);
  const label = scope ? scope.name : 'new microscope';
  return (
    <Table.Tr>
      <Table.Td>
        <TextInput size="xs" aria-label={`Name of ${label}`} placeholder={scope ? undefined : 'New microscope name'} value={name} onChange={(e) => setName(e.currentTarget.value)} error={err.field('name') ?? err.message} />
      </Table.Td>
      <Table.Td>
        <SegmentedControl
          size="xs"
          aria-label={`Kind of ${label}`}
          value={mobile ? 'mobile' : 'fixed'}
          onChange={(v) => setMobile(v === 'mobile')}
          data={[
            { value: 'fixed', label: 'Fixed' },
            { value: 'mobile', label: 'Mobile' },
          ]}
        />
      </Table.Td>
      <Table.Td>
        <Text fz="xs" c="dimmed">
          {scope ? (mobile ? 'any chair' : (chairName ?? 'not yet on a chair')) : ''}
        </Text>
      </Table.Td>
      <Table.Td>
        <Group gap={4} wrap="nowrap">
          <ActionIcon
            variant="light"
            aria-label={scope ? `Save ${label}` : 'Add microscope'}
            loading={save.isPending}
            disabled={!name.trim()}
            onClick={() => save.mutate({ id: scope?.id, locationId, body: { name: name.trim(), mobile } }, { onSuccess: () => !scope && (setName(''), setMobile(false)) })}
          >
            <IconDeviceFloppy size={16} />
          </ActionIcon>
          {scope && (
            <RemoveButton label={`Remove ${label}`} onClick={() => remove.mutate(scope.id)} loading={remove.isPending} />
          )}
        </Group>
      </Table.Td>
    </Table.Tr>
  );
}

export function SaveError({ error }: { error: unknown }) {
  const { message } = errorOf(error);
  return message ? (
    <Alert color="red" variant="light" role="alert" p="xs">
      {message}
    </Alert>
  ) : null;
}
