import { Alert, Badge, Box, Button, Card, Divider, Group, Paper, Spoiler, Stack, Text, Title } from '@mantine/core';
import { notifications } from '@mantine/notifications';
import type { DeskTask, ReplyThread, ThreadItem } from '@ostium/shared';
import { IconCalendarEvent, IconCheck, IconInfoCircle, IconLink, IconMail, IconMessage } from '@tabler/icons-react';
import { useEffect, useRef } from 'react';
import { STATE_LABELS } from '../../chair-board/board.util';
import { showPhone } from '../../directory/phone-display.util';
import { useMarkTaskDone, useMarkThreadRead, useRetryMessage } from '../api/replies';
import { consentWords, messageTime, PURPOSE_LABELS, REPLY_KIND_LABELS, TASK_KIND_LABELS, visitTime } from '../replies.util';
import { DeliveryLine } from './delivery-line';
import { ReplyBox } from './reply-box';

/** Both panes fill the window below the page header, each scrolling on its own. */
export const PANE_HEIGHT = 'calc(100dvh - 200px)';

type OutItem = Extract<ThreadItem, { direction: 'out' }>;
type InItem = Extract<ThreadItem, { direction: 'in' }>;

/** When an item belongs in the conversation: what we sent at its send (or due) time, what they sent on arrival. */
const itemTime = (i: ThreadItem) => (i.direction === 'in' ? i.receivedAt : (i.sentAt ?? i.failedAt ?? i.dueAt));

export function orderItems(items: ThreadItem[]): ThreadItem[] {
  return [...items].sort((a, b) => Date.parse(itemTime(a)) - Date.parse(itemTime(b)));
}

function ChannelIcon({ channel }: { channel: 'sms' | 'email' | 'link' }) {
  const Icon = channel === 'email' ? IconMail : channel === 'link' ? IconLink : IconMessage;
  return <Icon size={12} aria-label={channel === 'email' ? 'e-mail' : channel === 'link' ? 'visit link' : 'text'} />;
}

function Outgoing({ m, zone }: { m: OutItem; zone: string }) {
  const retry = useRetryMessage();
  return (
    <Box style={{ alignSelf: 'flex-end', maxWidth: '78%' }} aria-label={`We sent, ${PURPOSE_LABELS[m.purpose].toLowerCase()}`} role="article">
      <Group gap={6} justify="flex-end" mb={2}>
        <ChannelIcon channel={m.channel} />
        <Text fz={11} c="dimmed">
          {PURPOSE_LABELS[m.purpose]} · {messageTime(m.sentAt ?? m.dueAt, zone)}
        </Text>
      </Group>
      <Paper bg="lagoon.0" px="sm" py={8} style={{ borderTopRightRadius: 4, border: '1px solid var(--mantine-color-lagoon-1)' }}>
        {m.subject && (
          <Text fz="sm" fw={700} mb={2}>
            {m.subject}
          </Text>
        )}
        {m.body === null ? (
          <Text fz="sm" c="dimmed" fs="italic">
            {m.status === 'pending' || m.status === 'sending' ? 'Written from its template when it goes out.' : 'Not written: nothing was sent.'}
          </Text>
        ) : (
          <Spoiler maxHeight={m.channel === 'email' ? 110 : 400} showLabel="Show the whole e-mail" hideLabel="Show less" styles={{ control: { fontSize: 12 } }}>
            <Text fz="sm" style={{ whiteSpace: 'pre-wrap', overflowWrap: 'anywhere' }}>
              {m.body}
            </Text>
          </Spoiler>
        )}
      </Paper>
      <Box mt={4}>
        <DeliveryLine
          message={m}
          zone={zone}
          retrying={retry.isPending}
          onRetry={() =>
            retry.mutate(m.id, {
              onSuccess: () => notifications.show({ color: 'lagoon', message: 'Queued again; it goes with the next run.' }),
              onError: (e) => notifications.show({ color: 'red', title: 'Not retried', message: (e as Error).message }),
            })
          }
        />
      </Box>
    </Box>
  );
}

function Incoming({ m, zone }: { m: InItem; zone: string }) {
  const kind = REPLY_KIND_LABELS[m.kind];
  if (m.channel === 'link') {
    return (
      <Group gap={6} justify="center" role="note" aria-label="Through the visit link">
        <IconLink size={14} color="var(--mantine-color-stone-6)" />
        <Text fz="xs" c="stone.7">
          {m.effect ?? m.body} · through the visit link · {messageTime(m.receivedAt, zone)}
        </Text>
      </Group>
    );
  }
  return (
    <Box style={{ alignSelf: 'flex-start', maxWidth: '78%' }} aria-label="They sent" role="article">
      <Group gap={6} mb={2}>
        <ChannelIcon channel={m.channel} />
        <Text fz={11} c="dimmed">
          {messageTime(m.receivedAt, zone)}
        </Text>
        {kind && (
          <Badge size="xs" color="stone" variant="outline" style={{ textTransform: 'none' }}>
            {kind}
          </Badge>
        )}
        {m.readAt === null && (
          <Badge size="xs" color="lagoon" variant="filled" style={{ textTransform: 'none' }}>
            new
          </Badge>
        )}
      </Group>
      <Paper bg="white" px="sm" py={8} withBorder style={{ borderTopLeftRadius: 4 }}>
        <Text fz="sm" style={{ whiteSpace: 'pre-wrap', overflowWrap: 'anywhere' }}>
          {m.body}
        </Text>
      </Paper>
      {m.effect && (
        <Group gap={4} mt={4} wrap="nowrap" role="note">
          <IconInfoCircle size={13} color="var(--mantine-color-lagoon-7)" style={{ flex: 'none' }} />
          <Text fz="xs" c="lagoon.8" fs="italic">
            {m.effect}
          </Text>
        </Group>
      )}
    </Box>
  );
}

function TaskRow({ t, zone }: { t: DeskTask; zone: string }) {
  const done = useMarkTaskDone();
  return (
    <Group justify="space-between" wrap="nowrap" gap="sm" role="listitem" aria-label={TASK_KIND_LABELS[t.kind]}>
      <div>
        <Text fz="sm" fw={600}>
          {TASK_KIND_LABELS[t.kind]}
        </Text>
        <Text fz="xs" c="dimmed">
          {t.detail} · {messageTime(t.createdAt, zone)}
        </Text>
      </div>
      <Button
        size="compact-xs"
        variant="light"
        leftSection={<IconCheck size={12} />}
        loading={done.isPending}
        onClick={() => done.mutate(t.id, { onError: (e) => notifications.show({ color: 'red', title: 'Task not closed', message: (e as Error).message }) })}
      >
        Mark done
      </Button>
    </Group>
  );
}

/** Right pane: one patient's messages as a conversation, the next visit, open tasks and the reply box. */
export function ThreadView({ threadRef, thread, zone }: { threadRef: string; thread: ReplyThread; zone: string }) {
  const markRead = useMarkThreadRead();
  const items = orderItems(thread.items);
  const unreadIds = items
    .filter((i): i is InItem => i.direction === 'in' && i.readAt === null)
    .map((i) => i.id)
    .join(',');
  const marked = useRef<string>('');
  const log = useRef<HTMLDivElement>(null);

  // Open means read; a text that lands while the thread is open is read too.
  useEffect(() => {
    if (unreadIds === '' || marked.current === `${threadRef}:${unreadIds}`) return;
    marked.current = `${threadRef}:${unreadIds}`;
    markRead.mutate(threadRef);
  }, [threadRef, unreadIds]);

  // The latest message in view, inside the log only (scrolling the page would hide the list).
  useEffect(() => {
    const toEnd = () => {
      const el = log.current;
      if (el) el.scrollTop = el.scrollHeight;
    };
    toEnd();
    // Long e-mails fold and fonts settle a moment after the first paint; follow them once.
    const t = setTimeout(toEnd, 150);
    return () => clearTimeout(t);
  }, [threadRef, items.length]);

  const consent = consentWords(thread.smsConsent);
  const openTasks = thread.tasks.filter((t) => t.status === 'open');
  const next = thread.nextAppointment;

  return (
    <Card p={0} h={PANE_HEIGHT} mih={560} style={{ display: 'flex', flexDirection: 'column' }} component="section" aria-label={`Thread with ${thread.patientName ?? thread.phone ?? 'unknown sender'}`}>
      <Group justify="space-between" p="md" pb="sm" wrap="wrap" gap="xs">
        <div>
          <Title order={3} fz="lg">
            {thread.patientName ?? showPhone(thread.phone) ?? 'Unknown sender'}
          </Title>
          <Text fz="xs" c="dimmed">
            {[showPhone(thread.phone), thread.email].filter(Boolean).join(' · ') || 'no contact details'}
          </Text>
        </div>
        <Badge color={consent.color} variant="light" style={{ textTransform: 'none' }}>
          {consent.label}
        </Badge>
      </Group>
      <Group px="md" pb="sm" gap="xs" wrap="nowrap" aria-label="Next visit" role="group">
        <IconCalendarEvent size={16} color="var(--mantine-color-stone-6)" style={{ flex: 'none' }} />
        {next ? (
          <Text fz="sm">
            Next visit <b>{visitTime(next.start, zone)}</b> · {next.locationName} ·{' '}
            <Text span fz="sm" fw={600} c={next.state === 'confirmed' ? 'lagoon.8' : 'amber.9'}>
              {STATE_LABELS[next.state as keyof typeof STATE_LABELS] ?? next.state}
            </Text>
          </Text>
        ) : (
          <Text fz="sm" c="dimmed">
            No visit booked.
          </Text>
        )}
      </Group>
      {openTasks.length > 0 && (
        <Box px="md" pb="sm">
          <Alert color="amber" variant="light" p="xs" title={`${openTasks.length} open ${openTasks.length === 1 ? 'task' : 'tasks'}`}>
            <Stack gap={6} role="list" aria-label="Open tasks">
              {openTasks.map((t) => (
                <TaskRow key={t.id} t={t} zone={zone} />
              ))}
            </Stack>
          </Alert>
        </Box>
      )}
      <Divider />
      <Stack ref={log} gap="md" p="md" bg="stone.0" style={{ flex: 1, overflowY: 'auto', minHeight: 160 }} role="log" aria-label="Messages">
        {items.length === 0 && (
          <Text fz="sm" c="dimmed" ta="center">
            No messages yet.
          </Text>
        )}
        {items.map((i) => (i.direction === 'out' ? <Outgoing key={`o${i.id}`} m={i} zone={zone} /> : <Incoming key={`i${i.id}`} m={i} zone={zone} />))}
      </Stack>
      <Divider />
      <Box p="md">
        {thread.patientId !== null ? (
          <ReplyBox key={thread.patientId} patientId={thread.patientId} phone={thread.phone} email={thread.email} smsConsent={thread.smsConsent} />
        ) : (
          <Text fz="sm" c="dimmed">
            This number matches no patient. Add it to the patient's record and their later replies land in their own thread; call back to answer now.
          </Text>
        )}
      </Box>
    </Card>
  );
}
