import { Alert, Autocomplete, Button, Checkbox, Group, Input, Loader, Paper, SegmentedControl, SimpleGrid, Stack, Text, TextInput } from '@mantine/core';
import type { UseFormReturnType } from '@mantine/form';
import { useDebouncedValue } from '@mantine/hooks';
import type { Patient, PreferredChannel } from '@ostium/shared';
import { IconAlertTriangle, IconUser } from '@tabler/icons-react';
import { useRef, useState } from 'react';
import { usePatients } from '../../directory/api/patients';
import type { IntakeValues } from '../intake-form.util';
import { SearchOrCreate } from './search-or-create';
import { showPhone } from '../../directory/phone-display.util';

export const CHANNEL_LABELS: Record<PreferredChannel, string> = { text: 'Text', email: 'E-mail', phone: 'Phone call' };
const CONSENT_WAYS = ['intake form', 'verbal at desk', 'by phone', 'referral letter'];

export const patientName = (p: { firstName: string; lastName: string }) => `${p.firstName} ${p.lastName}`;
export const birthDate = (iso: string) => new Date(`${iso}T12:00:00`).toLocaleDateString([], { dateStyle: 'medium' });

/** Splits what was typed in the search into names: "Lark, Ana" or "Ana Lark"; one word is taken as the last name. */
export function namesFrom(q: string): { firstName: string; lastName: string } {
  const t = q.trim().replace(/\s+/g, ' ');
  if (t.includes(',')) {
    const [last, ...rest] = t.split(',');
    return { firstName: rest.join(' ').trim(), lastName: last!.trim() };
  }
  const words = t.split(' ').filter(Boolean);
  if (words.length < 2) return { firstName: '', lastName: words[0] ?? '' };
  return { firstName: words[0]!, lastName: words.slice(1).join(' ') };
}

export interface DuplicateState {
  message: string;
  /** undefined while the matching records load. */
  candidates: Patient[] | undefined;
}

export interface PatientSectionProps {
  form: UseFormReturnType<IntakeValues>;
  picked: Patient | null;
  onPicked: (p: Patient | null) => void;
  duplicate: DuplicateState | null;
  onUseExisting: (p: Patient) => void;
  onConfirmNew: () => void;
  busy: boolean;
}

export function PatientSection({ form, picked, onPicked, duplicate, onUseExisting, onConfirmNew, busy }: PatientSectionProps) {
  const [query, setQuery] = useState('');
  const [q] = useDebouncedValue(query.trim(), 250);
  const search = usePatients({ q, limit: 8 }, q.length >= 2 && !form.values.newPatient);
  const firstField = useRef<HTMLInputElement>(null);
  const searchField = useRef<HTMLInputElement>(null);
  const v = form.values;

  const backToSearch = () => {
    form.setValues({ patientId: null, newPatient: false });
    onPicked(null);
    setTimeout(() => searchField.current?.focus(), 0);
  };

  if (!v.newPatient && picked) {
    return (
      <Paper withBorder p="sm" bg="lagoon.0" aria-label="Chosen patient">
        <Group justify="space-between" wrap="nowrap">
          <Group gap="sm" wrap="nowrap">
            <IconUser size={18} />
            <div>
              <Text fw={700}>{patientName(picked)}</Text>
              <Text fz="xs" c="dimmed">
                Born {birthDate(picked.dateOfBirth)}
                {picked.phone ? ` · ${showPhone(picked.phone)}` : ''}
                {picked.email ? ` · ${picked.email}` : ''} · prefers {CHANNEL_LABELS[picked.preferredChannel].toLowerCase()}
              </Text>
            </div>
          </Group>
          <Button variant="subtle" size="xs" onClick={backToSearch}>
            Change patient
          </Button>
        </Group>
      </Paper>
    );
  }

  if (!v.newPatient) {
    return (
      <SearchOrCreate<Patient>
        label="Patient"
        placeholder="Search by name, e.g. Lark or Ana Lark"
        query={query}
        onQueryChange={setQuery}
        results={search.data}
        loading={search.isFetching}
        idOf={(p) => p.id}
        autoFocus
        inputRef={searchField}
        error={form.errors.patientId}
        renderItem={(p) => (
          <div>
            <Text fz="sm" fw={600}>
              {p.lastName}, {p.firstName}
            </Text>
            <Text fz="xs" c="dimmed">
              born {birthDate(p.dateOfBirth)}
              {p.phone ? ` · ${showPhone(p.phone)}` : ''}
            </Text>
          </div>
        )}
        createLabel={(t) => (t ? `New patient “${t}”` : 'New patient')}
        onPick={(p) => {
          form.setValues({ patientId: p.id, newPatient: false });
          form.clearFieldError('patientId');
          onPicked(p);
        }}
        onCreate={(t) => {
          const names = namesFrom(t);
          form.setValues({ newPatient: true, patientId: null, patient: { ...v.patient, ...names } });
          form.clearFieldError('patientId');
          setTimeout(() => firstField.current?.focus(), 0);
        }}
      />
    );
  }

  return (
    <Stack gap="sm">
      <Group justify="space-between">
        <Text fz="sm" fw={600}>
          New patient
        </Text>
        <Button variant="subtle" size="xs" onClick={backToSearch}>
          Search existing patients instead
        </Button>
      </Group>
      {duplicate && <DuplicateAlert duplicate={duplicate} onUseExisting={onUseExisting} onConfirmNew={onConfirmNew} busy={busy} />}
      <SimpleGrid cols={{ base: 1, sm: 3 }} spacing="sm">
        <TextInput ref={firstField} label="First name" withAsterisk autoComplete="off" {...form.getInputProps('patient.firstName')} />
        <TextInput label="Last name" withAsterisk autoComplete="off" {...form.getInputProps('patient.lastName')} />
        <TextInput label="Date of birth" type="date" withAsterisk {...form.getInputProps('patient.dateOfBirth')} />
        <TextInput label="Phone" type="tel" placeholder="(555) 555-0123" autoComplete="off" {...form.getInputProps('patient.phone')} />
        <TextInput label="E-mail" type="email" placeholder="name@example.com" autoComplete="off" {...form.getInputProps('patient.email')} />
        <Input.Wrapper label="Preferred channel" error={form.errors['patient.preferredChannel']}>
          <SegmentedControl
            fullWidth
            aria-label="Preferred channel"
            data={Object.entries(CHANNEL_LABELS).map(([value, label]) => ({ value, label }))}
            {...form.getInputProps('patient.preferredChannel')}
          />
        </Input.Wrapper>
      </SimpleGrid>
      <Group align="flex-end" gap="md">
        <Checkbox
          label="Agrees to text messages"
          description="Reminders only go out by text with consent."
          {...form.getInputProps('patient.smsConsent', { type: 'checkbox' })}
        />
        {v.patient.smsConsent && (
          <Autocomplete
            label="How consent was given"
            placeholder="e.g. verbal at desk"
            data={CONSENT_WAYS}
            w={240}
            {...form.getInputProps('patient.smsConsentSource')}
          />
        )}
      </Group>
    </Stack>
  );
}

function DuplicateAlert({ duplicate, onUseExisting, onConfirmNew, busy }: { duplicate: DuplicateState; onUseExisting: (p: Patient) => void; onConfirmNew: () => void; busy: boolean }) {
  return (
    <Alert color="amber" variant="light" icon={<IconAlertTriangle size={18} />} title="This patient may already be on file" role="alert">
      <Stack gap="xs">
        <Text fz="sm">{duplicate.message}</Text>
        {duplicate.candidates === undefined ? (
          <Loader size="xs" aria-label="Loading matching patients" />
        ) : (
          duplicate.candidates.map((p) => (
            <Group key={p.id} justify="space-between" wrap="nowrap">
              <Text fz="sm">
                <b>{patientName(p)}</b>, born {birthDate(p.dateOfBirth)}
                {p.phone ? ` · ${showPhone(p.phone)}` : ''}
                {p.email ? ` · ${p.email}` : ''}
              </Text>
              <Button size="xs" onClick={() => onUseExisting(p)} loading={busy} aria-label={`Use ${patientName(p)}, born ${birthDate(p.dateOfBirth)}`}>
                Use this patient
              </Button>
            </Group>
          ))
        )}
        <Group justify="flex-end">
          <Button size="xs" variant="default" onClick={onConfirmNew} loading={busy}>
            A different person: save as new patient
          </Button>
        </Group>
      </Stack>
    </Alert>
  );
}
