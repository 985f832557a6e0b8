import { Button, Group, Input, Paper, SegmentedControl, SimpleGrid, Stack, Text, TextInput } from '@mantine/core';
import type { UseFormReturnType } from '@mantine/form';
import { useDebouncedValue } from '@mantine/hooks';
import type { LetterChannel, ReferringDentist } from '@ostium/shared';
import { IconStethoscope } from '@tabler/icons-react';
import { useRef, useState } from 'react';
import { useReferringDentists } from '../../directory/api/referring-dentists';
import type { IntakeValues } from '../intake-form.util';
import { SearchOrCreate } from './search-or-create';
import { showPhone } from '../../directory/phone-display.util';

export const LETTER_LABELS: Record<LetterChannel, string> = { email: 'E-mail', post: 'Post', fax: 'Fax' };

export interface ReferrerSectionProps {
  form: UseFormReturnType<IntakeValues>;
  picked: ReferringDentist | null;
  onPicked: (d: ReferringDentist | null) => void;
}

export function ReferrerSection({ form, picked, onPicked }: ReferrerSectionProps) {
  const [query, setQuery] = useState('');
  const [q] = useDebouncedValue(query.trim(), 250);
  const v = form.values;
  const search = useReferringDentists({ q, limit: 8 }, q.length >= 2 && !v.newReferringDentist);
  const nameField = useRef<HTMLInputElement>(null);
  const searchField = useRef<HTMLInputElement>(null);

  const backToSearch = () => {
    form.setValues({ referringDentistId: null, newReferringDentist: false });
    onPicked(null);
    setTimeout(() => searchField.current?.focus(), 0);
  };

  if (!v.newReferringDentist && picked) {
    return (
      <Paper withBorder p="sm" bg="lagoon.0" aria-label="Chosen referring dentist">
        <Group justify="space-between" wrap="nowrap">
          <Group gap="sm" wrap="nowrap">
            <IconStethoscope size={18} />
            <div>
              <Text fw={700}>{picked.name}</Text>
              <Text fz="xs" c="dimmed">
                {[picked.practiceName, picked.email, showPhone(picked.phone)].filter(Boolean).join(' · ')}
                {` · letters by ${LETTER_LABELS[picked.letterChannel].toLowerCase()}`}
              </Text>
            </div>
          </Group>
          <Button variant="subtle" size="xs" onClick={backToSearch}>
            Change referrer
          </Button>
        </Group>
      </Paper>
    );
  }

  if (!v.newReferringDentist) {
    return (
      <SearchOrCreate<ReferringDentist>
        label="Referring dentist"
        placeholder="Search by dentist or practice name"
        query={query}
        onQueryChange={setQuery}
        results={search.data}
        loading={search.isFetching}
        idOf={(d) => d.id}
        inputRef={searchField}
        error={form.errors.referringDentistId}
        renderItem={(d) => (
          <div>
            <Text fz="sm" fw={600}>
              {d.name}
            </Text>
            <Text fz="xs" c="dimmed">
              {[d.practiceName, showPhone(d.phone)].filter(Boolean).join(' · ') || 'no practice on file'} · {d.referralCount} referrals
            </Text>
          </div>
        )}
        createLabel={(t) => (t ? `New referring dentist “${t}”` : 'New referring dentist')}
        onPick={(d) => {
          form.setValues({ referringDentistId: d.id, newReferringDentist: false });
          form.clearFieldError('referringDentistId');
          onPicked(d);
        }}
        onCreate={(t) => {
          form.setValues({ newReferringDentist: true, referringDentistId: null, referringDentist: { ...v.referringDentist, name: t } });
          form.clearFieldError('referringDentistId');
          setTimeout(() => nameField.current?.focus(), 0);
        }}
      />
    );
  }

  return (
    <Stack gap="sm">
      <Group justify="space-between">
        <Text fz="sm" fw={600}>
          New referring dentist
        </Text>
        <Button variant="subtle" size="xs" onClick={backToSearch}>
          Search existing dentists instead
        </Button>
      </Group>
      <SimpleGrid cols={{ base: 1, sm: 3 }} spacing="sm">
        <TextInput ref={nameField} label="Dentist's name" withAsterisk autoComplete="off" {...form.getInputProps('referringDentist.name')} />
        <TextInput label="Practice name" autoComplete="off" {...form.getInputProps('referringDentist.practiceName')} />
        <Input.Wrapper label="Letters by" error={form.errors['referringDentist.letterChannel']}>
          <SegmentedControl
            fullWidth
            aria-label="Letters by"
            data={Object.entries(LETTER_LABELS).map(([value, label]) => ({ value, label }))}
            {...form.getInputProps('referringDentist.letterChannel')}
          />
        </Input.Wrapper>
        <TextInput label="Dentist's e-mail" type="email" placeholder="office@example.com" autoComplete="off" {...form.getInputProps('referringDentist.email')} />
        <TextInput label="Dentist's phone" type="tel" autoComplete="off" {...form.getInputProps('referringDentist.phone')} />
      </SimpleGrid>
    </Stack>
  );
}
