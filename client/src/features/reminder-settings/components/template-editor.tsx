import { Alert, Badge, Box, Button, Group, Loader, Menu, Paper, Stack, Text, Textarea, TextInput, Tooltip, UnstyledButton } from '@mantine/core';
import type { UseFormReturnType } from '@mantine/form';
import type { MessageChannel, ReminderSettings, ReminderSettingsResponse, TemplatePreviewRequest } from '@ostium/shared';
import { IconAlertCircle, IconCircleCheck, IconMail, IconMessage, IconPlus, IconTrash } from '@tabler/icons-react';
import { useMemo, useRef, useState } from 'react';
import { useTemplatePreview } from '../api/reminder-settings';
import { insertAt, newTemplate } from '../reminder-settings.util';

type Form = UseFormReturnType<ReminderSettings>;

const segmentsWord = (n: number) => `${n} ${n === 1 ? 'segment' : 'segments'}`;

/** Templates on the left, the chosen one's words with placeholder chips in the middle, the live preview beside. */
export function TemplateEditor({ form, placeholders }: { form: Form; placeholders: ReminderSettingsResponse['placeholders'] }) {
  const { templates, rules } = form.values;
  const [selectedId, setSelectedId] = useState(templates[0]?.id ?? null);
  const index = Math.max(0, templates.findIndex((t) => t.id === selectedId));
  const t = templates[index];
  const body = useRef<HTMLTextAreaElement>(null);

  const hasError = (i: number) => Object.keys(form.errors).some((k) => k.startsWith(`templates.${i}.`));
  const usedBy = (id: string) => rules.filter((r) => r.templateId === id).map((r) => r.label || r.id);

  const add = (channel: MessageChannel) => {
    const next = newTemplate(form.values, channel);
    form.insertListItem('templates', next);
    setSelectedId(next.id);
  };

  const insert = (name: string) => {
    const el = body.current;
    const text = t!.body;
    const { text: next, cursor } = insertAt(text, el?.selectionStart ?? text.length, el?.selectionEnd ?? text.length, `{${name}}`);
    form.setFieldValue(`templates.${index}.body`, next);
    // After React writes the new value, put the cursor right after the chip's text.
    requestAnimationFrame(() => {
      el?.focus();
      el?.setSelectionRange(cursor, cursor);
    });
  };

  if (!t) {
    return (
      <Group>
        <Text fz="sm" c="dimmed">
          No templates yet.
        </Text>
        <Button size="compact-sm" variant="light" onClick={() => add('sms')}>
          New text template
        </Button>
      </Group>
    );
  }

  return (
    <Group align="flex-start" gap="md" wrap="wrap">
      <Stack gap={4} w={200} role="list" aria-label="Templates">
        {templates.map((x, i) => (
          <UnstyledButton
            key={x.id}
            role="listitem"
            aria-label={x.label || x.id}
            aria-current={i === index ? 'true' : undefined}
            onClick={() => setSelectedId(x.id)}
            px="sm"
            py={6}
            style={{
              borderRadius: 'var(--mantine-radius-md)',
              background: i === index ? 'var(--mantine-color-lagoon-0)' : undefined,
              border: `1px solid ${hasError(i) ? 'var(--mantine-color-red-5)' : i === index ? 'var(--mantine-color-lagoon-2)' : 'transparent'}`,
            }}
          >
            <Group gap={6} wrap="nowrap">
              {x.channel === 'sms' ? <IconMessage size={14} aria-label="text" style={{ flex: 'none' }} /> : <IconMail size={14} aria-label="e-mail" style={{ flex: 'none' }} />}
              <Text fz="sm" fw={i === index ? 700 : 500} truncate>
                {x.label || x.id}
              </Text>
              {hasError(i) && <IconAlertCircle size={14} color="var(--mantine-color-red-6)" aria-label="has a problem" />}
            </Group>
          </UnstyledButton>
        ))}
        <Menu position="bottom-start">
          <Menu.Target>
            <Button size="compact-xs" variant="subtle" leftSection={<IconPlus size={12} />} mt={4}>
              Add template
            </Button>
          </Menu.Target>
          <Menu.Dropdown>
            <Menu.Item leftSection={<IconMessage size={14} />} onClick={() => add('sms')}>
              Text
            </Menu.Item>
            <Menu.Item leftSection={<IconMail size={14} />} onClick={() => add('email')}>
              E-mail
            </Menu.Item>
          </Menu.Dropdown>
        </Menu>
      </Stack>

      <Stack gap="xs" style={{ flex: '1 1 320px', minWidth: 280 }}>
        <Group gap="xs" align="flex-end" wrap="nowrap">
          <TextInput size="sm" label="Template name" style={{ flex: 1 }} {...form.getInputProps(`templates.${index}.label`)} />
          <Badge variant="light" color="stone" mb={6} style={{ textTransform: 'none' }}>
            {t.channel === 'sms' ? 'Text' : 'E-mail'}
          </Badge>
        </Group>
        {t.channel === 'email' && <TextInput size="sm" label="Subject" {...form.getInputProps(`templates.${index}.subject`)} value={t.subject ?? ''} />}
        <div>
          <Text fz="sm" fw={500} mb={4} id="placeholder-chips">
            Insert at the cursor
          </Text>
          <Group gap={6} role="group" aria-labelledby="placeholder-chips">
            {placeholders.map((p) => (
              <Tooltip key={p.name} label={p.meaning} multiline w={240}>
                <Button
                  size="compact-xs"
                  variant="light"
                  color="lagoon"
                  radius="xl"
                  // Keeps the cursor (and any selection) in the text box while the chip is pressed.
                  onMouseDown={(e) => e.preventDefault()}
                  onClick={() => insert(p.name)}
                  styles={{ label: { fontFamily: 'ui-monospace, monospace', fontWeight: 600 } }}
                >
                  {`{${p.name}}`}
                </Button>
              </Tooltip>
            ))}
          </Group>
        </div>
        <Textarea
          ref={body}
          label="Message"
          rows={t.channel === 'sms' ? 4 : 9}
          styles={{ input: { fontFamily: 'ui-monospace, monospace', fontSize: 13 } }}
          {...form.getInputProps(`templates.${index}.body`)}
        />
        <Group justify="space-between">
          <Text fz="xs" c="dimmed">
            {usedBy(t.id).length ? `Used by: ${usedBy(t.id).join(', ')}` : 'Not used by any rule'}
          </Text>
          {usedBy(t.id).length === 0 && (
            <Button
              size="compact-xs"
              variant="subtle"
              color="stone"
              leftSection={<IconTrash size={12} />}
              onClick={() => {
                form.removeListItem('templates', index);
                setSelectedId(templates[index === 0 ? 1 : 0]?.id ?? null);
              }}
            >
              Remove template
            </Button>
          )}
        </Group>
      </Stack>

      <Box style={{ flex: '1 1 280px', minWidth: 260 }}>
        <TemplatePreview channel={t.channel} subject={t.subject} body={t.body} />
      </Box>
    </Group>
  );
}

/** What the patient would get, filled with a sample visit by the server, and whether it may be saved. */
export function TemplatePreview({ channel, subject, body }: { channel: MessageChannel; subject: string | null; body: string }) {
  const req = useMemo<TemplatePreviewRequest | null>(() => (body.trim() ? { channel, subject: channel === 'email' ? subject : null, body } : null), [channel, subject, body]);
  const preview = useTemplatePreview(req);
  const p = preview.data;
  return (
    <Stack gap="xs" role="region" aria-label="Preview">
      <Group justify="space-between">
        <Text fz="sm" fw={700}>
          Preview
        </Text>
        {(preview.isFetching || preview.settling) && req && <Loader size={14} aria-label="Updating the preview" />}
      </Group>
      {!req ? (
        <Text fz="sm" c="dimmed">
          Write the message to see it filled in.
        </Text>
      ) : preview.isError ? (
        <Alert color="red" variant="light" p="xs" role="alert">
          {(preview.error as Error).message}
        </Alert>
      ) : !p ? (
        <Text fz="sm" c="dimmed">
          Filling in a sample visit…
        </Text>
      ) : (
        <>
          {channel === 'sms' ? (
            <Paper bg="stone.1" p="sm" style={{ borderRadius: 14, borderBottomLeftRadius: 4 }}>
              <Text fz="sm" style={{ whiteSpace: 'pre-wrap', overflowWrap: 'anywhere' }} data-testid="preview-text">
                {p.text}
              </Text>
            </Paper>
          ) : (
            <Paper withBorder p="sm">
              <Text fz="sm" fw={700} mb={4} data-testid="preview-subject">
                {p.subject}
              </Text>
              <Text fz="sm" style={{ whiteSpace: 'pre-wrap', overflowWrap: 'anywhere' }} data-testid="preview-text">
                {p.text}
              </Text>
            </Paper>
          )}
          {channel === 'sms' && (
            <Text fz="xs" fw={600} c={p.fitsOneSegment ? 'stone.7' : 'red.8'} data-testid="preview-count">
              {p.characters} / {p.limit} · {p.encoding} · {segmentsWord(p.segments)}
            </Text>
          )}
          {p.problems.length > 0 ? (
            <Stack gap={2} role="list" aria-label="Problems">
              {p.problems.map((m) => (
                <Group key={m} gap={4} wrap="nowrap" role="listitem">
                  <IconAlertCircle size={14} color="var(--mantine-color-red-7)" style={{ flex: 'none' }} />
                  <Text fz="xs" c="red.8">
                    {m}
                  </Text>
                </Group>
              ))}
            </Stack>
          ) : (
            <Group gap={4}>
              <IconCircleCheck size={14} color="var(--mantine-color-lagoon-7)" />
              <Text fz="xs" c="lagoon.8">
                Ready to use
              </Text>
            </Group>
          )}
        </>
      )}
    </Stack>
  );
}
