import { ActionIcon, Button, Checkbox, Group, NumberInput, Select, Stack, Switch, Table, Text, TextInput } from '@mantine/core';
import type { UseFormReturnType } from '@mantine/form';
import type { MessageChannel, ReminderRule, ReminderSettings, ReminderTrigger } from '@ostium/shared';
import { IconPlus, IconTrash } from '@tabler/icons-react';
import { newRule } from '../reminder-settings.util';

type Form = UseFormReturnType<ReminderSettings>;

const CHANNEL_OPTIONS = [
  { value: 'sms', label: 'Text' },
  { value: 'email', label: 'E-mail' },
];
const TRIGGER_OPTIONS = [
  { value: 'on_booking', label: 'When booked' },
  { value: 'before_visit', label: 'Before the visit' },
];

/**
 * One row per rule: its name, what it sends (channel and template), when it fires, and its conditions.
 * Channel and template share a cell, as do the two conditions, so the names have room.
 */
export function RulesTable({ form }: { form: Form }) {
  const { rules, templates } = form.values;
  const templatesFor = (channel: MessageChannel) => templates.filter((t) => t.channel === channel).map((t) => ({ value: t.id, label: t.label || t.id }));
  const setRule = (i: number, next: ReminderRule) => form.setFieldValue(`rules.${i}`, next);

  return (
    <>
      <Table.ScrollContainer minWidth={880}>
        <Table aria-label="Reminder rules" verticalSpacing={8} horizontalSpacing="xs">
          <Table.Thead>
            <Table.Tr>
              <Table.Th w={52}>On</Table.Th>
              <Table.Th>Rule</Table.Th>
              <Table.Th w={210}>Sends</Table.Th>
              <Table.Th w={236}>When</Table.Th>
              <Table.Th w={170}>Conditions</Table.Th>
              <Table.Th w={36} />
            </Table.Tr>
          </Table.Thead>
          <Table.Tbody>
            {rules.map((r, i) => {
              const name = r.label || r.id;
              return (
                <Table.Tr key={r.id} data-rule={r.id} style={{ verticalAlign: 'top' }}>
                  <Table.Td pt={12}>
                    <Switch aria-label={`${name}: on`} {...form.getInputProps(`rules.${i}.enabled`, { type: 'checkbox' })} />
                  </Table.Td>
                  <Table.Td>
                    <TextInput size="xs" aria-label={`${name}: name`} {...form.getInputProps(`rules.${i}.label`)} />
                    <Text fz={10} c="dimmed" mt={2}>
                      id {r.id}
                    </Text>
                  </Table.Td>
                  <Table.Td>
                    <Stack gap={4}>
                      <Select
                        size="xs"
                        aria-label={`${name}: channel`}
                        data={CHANNEL_OPTIONS}
                        allowDeselect={false}
                        value={r.channel}
                        error={form.errors[`rules.${i}.channel`]}
                        onChange={(v) => {
                          if (!v || v === r.channel) return;
                          const channel = v as MessageChannel;
                          const fits = templates.find((t) => t.id === r.templateId)?.channel === channel;
                          setRule(i, {
                            ...r,
                            channel,
                            templateId: fits ? r.templateId : (templates.find((t) => t.channel === channel)?.id ?? ''),
                            attachCalendar: channel === 'email' ? r.attachCalendar : false,
                          });
                        }}
                      />
                      <Select
                        size="xs"
                        aria-label={`${name}: template`}
                        data={templatesFor(r.channel)}
                        allowDeselect={false}
                        value={r.templateId || null}
                        onChange={(v) => v && form.setFieldValue(`rules.${i}.templateId`, v)}
                        error={form.errors[`rules.${i}.templateId`]}
                      />
                    </Stack>
                  </Table.Td>
                  <Table.Td>
                    <Group gap={6} wrap="nowrap" align="flex-start">
                      <Select
                        size="xs"
                        w={132}
                        aria-label={`${name}: when`}
                        data={TRIGGER_OPTIONS}
                        allowDeselect={false}
                        value={r.trigger}
                        error={form.errors[`rules.${i}.trigger`]}
                        onChange={(v) => {
                          if (!v || v === r.trigger) return;
                          const trigger = v as ReminderTrigger;
                          setRule(i, { ...r, trigger, hoursBefore: trigger === 'on_booking' ? null : (r.hoursBefore ?? 24) });
                        }}
                      />
                      {r.trigger === 'before_visit' && (
                        <NumberInput
                          size="xs"
                          w={92}
                          aria-label={`${name}: hours before`}
                          min={1}
                          max={336}
                          allowDecimal={false}
                          allowNegative={false}
                          hideControls
                          rightSection={
                            <Text fz={10} c="dimmed">
                              h before
                            </Text>
                          }
                          rightSectionWidth={50}
                          value={r.hoursBefore ?? ''}
                          onChange={(v) => form.setFieldValue(`rules.${i}.hoursBefore`, typeof v === 'number' ? v : null)}
                          error={form.errors[`rules.${i}.hoursBefore`]}
                        />
                      )}
                    </Group>
                  </Table.Td>
                  <Table.Td>
                    <Stack gap={6} pt={2}>
                      <Checkbox size="xs" label="Only if unconfirmed" aria-label={`${name}: only if unconfirmed`} {...form.getInputProps(`rules.${i}.onlyIfUnconfirmed`, { type: 'checkbox' })} />
                      <Checkbox
                        size="xs"
                        label="Calendar file (.ics)"
                        aria-label={`${name}: calendar file`}
                        title={r.channel === 'email' ? undefined : 'Only an e-mail can carry a calendar file'}
                        disabled={r.channel !== 'email'}
                        {...form.getInputProps(`rules.${i}.attachCalendar`, { type: 'checkbox' })}
                        error={form.errors[`rules.${i}.attachCalendar`]}
                      />
                    </Stack>
                  </Table.Td>
                  <Table.Td pt={10}>
                    <ActionIcon variant="subtle" color="stone" aria-label={`Remove ${name}`} onClick={() => form.removeListItem('rules', i)}>
                      <IconTrash size={14} />
                    </ActionIcon>
                  </Table.Td>
                </Table.Tr>
              );
            })}
          </Table.Tbody>
        </Table>
      </Table.ScrollContainer>
      <Group justify="space-between" mt="xs">
        <Text fz="xs" c="dimmed">
          A rule sends once per visit; a booking made inside its lead time sends at once or shows why it was skipped.
        </Text>
        <Button size="compact-sm" variant="light" leftSection={<IconPlus size={14} />} onClick={() => form.insertListItem('rules', newRule(form.values))}>
          Add rule
        </Button>
      </Group>
    </>
  );
}
