import { Alert, Badge, Button, Grid, Group, NumberInput, SimpleGrid, Stack, Text } from '@mantine/core';
import { TimeInput } from '@mantine/dates';
import { useForm, type UseFormReturnType } from '@mantine/form';
import { notifications } from '@mantine/notifications';
import type { ReminderSettings, ReminderSettingsResponse } from '@ostium/shared';
import { IconDeviceFloppy, IconRefresh, IconShieldLock } from '@tabler/icons-react';
import { DateTime } from 'luxon';
import { useState } from 'react';
import { PageHeader } from '../../../components/page-header';
import { NotSavedAlert, SettingsSection as Section } from '../../../components/settings-section';
import { QueryState } from '../../../components/query-state';
import { ApiError } from '../../../lib/api-client';
import { useLocations } from '../../practice/api/practice';
import { useReminderSettings, useSaveReminderSettings } from '../api/reminder-settings';
import { isShownPath, serverErrors, validateSettings } from '../reminder-settings.util';
import { RulesTable } from './rules-table';
import { TemplateEditor } from './template-editor';

type Form = UseFormReturnType<ReminderSettings>;

/** Settings → Reminders: the rules, their templates, quiet hours and caps; one version for all of it. */
export function ReminderSettingsPage() {
  const settings = useReminderSettings();
  return (
    <>
      <PageHeader title="Reminders" description="When patients are reminded of their visits, by text or e-mail, and what the messages say." />
      <QueryState query={settings}>{(r) => <SettingsEditor key={r.version} data={r} onReload={() => settings.refetch()} />}</QueryState>
    </>
  );
}


function SettingsEditor({ data, onReload }: { data: ReminderSettingsResponse; onReload: () => void }) {
  const save = useSaveReminderSettings();
  // Times read in the practice's own zone (its first location), never the browser's.
  const zone = useLocations().data?.[0]?.timeZone;
  const [banner, setBanner] = useState<string[]>([]);
  const form = useForm<ReminderSettings>({ initialValues: structuredClone(data.settings), validate: (v) => validateSettings(v) });
  const stale = save.error instanceof ApiError && save.error.status === 409;
  const saveError = save.error as Error | null;

  const submit = form.onSubmit((settings) => {
    setBanner([]);
    save.mutate(
      { settings, version: data.version },
      {
        onSuccess: (next) => notifications.show({ color: 'lagoon', title: `Saved as version ${next.version}`, message: 'Reminders planned from now on follow these rules.' }),
        onError: (e) => {
          if (!(e instanceof ApiError) || e.status === 409) return;
          const byPath = serverErrors(e.errors);
          form.setErrors(byPath);
          setBanner(Object.entries(byPath).filter(([p]) => !isShownPath(p, form.values)).map(([p, m]) => `${p}: ${m}`));
        },
      },
    );
  });

  return (
    <form onSubmit={submit} noValidate>
      <Group justify="space-between" mb="md" wrap="wrap">
        <Group gap="xs">
          <Badge size="lg" variant="light">
            Version {data.version}
          </Badge>
          {data.updatedAt && zone && (
            <Text fz="xs" c="dimmed">
              saved {DateTime.fromISO(data.updatedAt, { zone }).toFormat('d LLL yyyy, HH:mm')}
              {data.updatedBy ? ` by ${data.updatedBy}` : ''}
            </Text>
          )}
        </Group>
        <Group gap="xs">
          <Button variant="subtle" color="stone" onClick={() => form.reset()} disabled={!form.isDirty()}>
            Undo changes
          </Button>
          <Button type="submit" leftSection={<IconDeviceFloppy size={16} />} loading={save.isPending} disabled={!form.isDirty() || stale}>
            Save
          </Button>
        </Group>
      </Group>

      {stale ? (
        <Alert color="amber" variant="light" mb="md" title="Changed by someone else" role="alert">
          <Stack gap="xs" align="flex-start">
            <Text fz="sm">These settings were saved by someone else after you opened them. Reload to see their version; the changes you made here are not saved.</Text>
            <Button size="compact-sm" variant="light" color="amber" leftSection={<IconRefresh size={14} />} onClick={onReload}>
              Reload
            </Button>
          </Stack>
        </Alert>
      ) : (
        saveError && <NotSavedAlert message={saveError.message} details={banner} />
      )}
      {!saveError && Object.keys(form.errors).length > 0 && (
        <Alert color="red" variant="light" mb="md" role="alert">
          Some fields need a look; they are marked below.
        </Alert>
      )}

      <Alert color="lagoon" variant="light" mb="md" icon={<IconShieldLock size={18} />} p="sm">
        <Text fz="sm">
          Texts carry no clinical detail: only the date, time, place, the practice’s name and how to reply. The placeholders offer nothing else, so no tooth,
          procedure or finding can reach a patient’s phone.
        </Text>
      </Alert>

      <Stack gap="md">
        <Section title="Rules" hint="Each rule sends one message per visit. Texts go only to patients who agreed to them.">
          <RulesTable form={form} />
        </Section>
        <Section title="Templates" hint="Click a placeholder to put it where the cursor is. A text must say how to opt out and fit one segment: 160 characters, or 70 when it needs a character outside GSM-7.">
          <TemplateEditor form={form} placeholders={data.placeholders} />
        </Section>
        <Grid gap="md">
          <Grid.Col span={{ base: 12, md: 7 }}>
            <LimitsSection form={form} />
          </Grid.Col>
          <Grid.Col span={{ base: 12, md: 5 }}>
            <Section title="Links and waitlist offers">
              <SimpleGrid cols={{ base: 1, sm: 3 }}>
                <NumberInput size="xs" label="Confirm link valid after the start" rightSection={<Text fz={10} c="dimmed">h</Text>} allowDecimal={false} allowNegative={false} {...form.getInputProps('confirmLinkValidHours')} />
                <NumberInput size="xs" label="Waitlist offer open for" rightSection={<Text fz={10} c="dimmed">min</Text>} allowDecimal={false} allowNegative={false} {...form.getInputProps('waitlistOfferMinutes')} />
                <NumberInput size="xs" label="Patients offered at once" allowDecimal={false} allowNegative={false} {...form.getInputProps('waitlistOfferCount')} />
              </SimpleGrid>
            </Section>
          </Grid.Col>
        </Grid>
      </Stack>
    </form>
  );
}

/** A legal citation as written: Manrope would otherwise draw the "(c)" of "64.1200(c)" as a copyright sign. */
function Cite({ children }: { children: string }) {
  return <span style={{ fontVariantLigatures: 'none', fontFeatureSettings: '"liga" 0, "clig" 0, "calt" 0' }}>{children}</span>;
}

function LimitsSection({ form }: { form: Form }) {
  return (
    <Section
      title="Quiet hours and caps"
      hint={
        <>
          Texts go only inside these hours in the patient’s own time zone, after the US calling-hours rule (<Cite>47 CFR 64.1200(c)(1)</Cite>: not before 8 a.m. or
          after 9 p.m.). A reminder that falls outside moves to the next allowed minute; it is never dropped. The caps keep to the health-care conditions of{' '}
          <Cite>47 CFR 64.1200(a)(9)(iv)</Cite>: one text a day and three a week per patient; a rule that would break one is deferred, and Replies shows why.
        </>
      }
    >
      <SimpleGrid cols={{ base: 2, sm: 4 }}>
        <TimeInput size="xs" label="Texts from" {...form.getInputProps('quietHours.start')} />
        <TimeInput size="xs" label="Texts until" {...form.getInputProps('quietHours.end')} />
        <NumberInput size="xs" label="Texts a day, at most" min={1} allowDecimal={false} allowNegative={false} {...form.getInputProps('caps.perDay')} />
        <NumberInput size="xs" label="Texts a week, at most" min={1} allowDecimal={false} allowNegative={false} {...form.getInputProps('caps.perWeek')} />
      </SimpleGrid>
      {(form.errors.quietHours || form.errors.caps) && (
        <Text fz="xs" c="red.7" mt="xs" role="alert">
          {[form.errors.quietHours, form.errors.caps].filter(Boolean).join('; ')}
        </Text>
      )}
    </Section>
  );
}
