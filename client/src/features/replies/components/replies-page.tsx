import { Badge, Box, Card, Center, Grid, Group, Loader, SegmentedControl, Stack, Text, Tooltip, UnstyledButton } from '@mantine/core';
import type { LocationSummary, ReplyThreadSummary } from '@ostium/shared';
import { IconAlertTriangle, IconChecklist, IconMessageOff } from '@tabler/icons-react';
import { useSearchParams } from 'react-router-dom';
import { EmptyState } from '../../../components/empty-state';
import { PageHeader } from '../../../components/page-header';
import { QueryState } from '../../../components/query-state';
import { useLocations } from '../../practice/api/practice';
import { THREAD_FILTERS, threadRef, useOpenTasks, useThread, useThreadList, type ThreadFilter } from '../api/replies';
import { messageTime, sortThreads, threadName } from '../replies.util';
import { PANE_HEIGHT, ThreadView } from './thread-view';

const FILTER_LABELS: Record<ThreadFilter, string> = { all: 'All', unread: 'Unread', tasks: 'Tasks', failed: 'Failed' };

const EMPTY_HINTS: Record<ThreadFilter, string> = {
  all: 'Nothing sent or received yet. Reminders appear here once visits are booked, and patients’ answers as they arrive.',
  unread: 'Every reply has been read. New ones show here within seconds.',
  tasks: 'No open tasks: no one is waiting for another time, and every message went through.',
  failed: 'No failed messages.',
};

/** The practice's own zone for message times: where the patient's next visit is, else the first location. */
const zoneOf = (locations: LocationSummary[], locationName?: string) =>
  (locations.find((l) => l.name === locationName) ?? locations[0])?.timeZone ?? 'UTC';

/** /replies — the front desk's inbox: threads on the left, one patient's conversation on the right. */
export function RepliesPage() {
  const [params, setParams] = useSearchParams();
  const filter = (THREAD_FILTERS as readonly string[]).includes(params.get('filter') ?? '') ? (params.get('filter') as ThreadFilter) : 'all';
  // A patient's id, or unmatched:<number> for a sender no patient gave; kept in the address for reloads and links.
  const selected = params.get('thread');
  const list = useThreadList(filter);
  const tasks = useOpenTasks();
  const locations = useLocations();

  const select = (t: ReplyThreadSummary) => {
    const next = new URLSearchParams(params);
    next.set('thread', threadRef(t));
    setParams(next, { replace: true });
  };

  const openTaskCount = tasks.data?.length ?? 0;

  return (
    <>
      <PageHeader
        title="Replies"
        description="Every text and e-mail with patients: what went out, how it went, and what they answered. Updates every 10 seconds."
        actions={
          openTaskCount > 0 && (
            <Badge color="amber" variant="light" size="lg" leftSection={<IconChecklist size={14} />} style={{ textTransform: 'none' }}>
              {openTaskCount} open {openTaskCount === 1 ? 'task' : 'tasks'}
            </Badge>
          )
        }
      />
      <Grid gap="md" align="stretch">
        <Grid.Col span={{ base: 12, md: 5, lg: 4 }}>
          <Card p={0} component="section" aria-label="Threads">
            <Box p="sm">
              <SegmentedControl
                fullWidth
                size="xs"
                aria-label="Show"
                value={filter}
                onChange={(v) => {
                  const next = new URLSearchParams(params);
                  if (v === 'all') next.delete('filter');
                  else next.set('filter', v);
                  setParams(next, { replace: true });
                }}
                data={THREAD_FILTERS.map((f) => ({ value: f, label: f === 'tasks' && openTaskCount > 0 ? `${FILTER_LABELS[f]} · ${openTaskCount}` : FILTER_LABELS[f] }))}
              />
            </Box>
            <QueryState query={list}>
              {(threads) =>
                threads.length === 0 ? (
                  <EmptyState title={filter === 'all' ? 'No messages yet' : `Nothing under “${FILTER_LABELS[filter]}”`} hint={EMPTY_HINTS[filter]} />
                ) : (
                  <Stack gap={0} role="list" aria-label="Thread list" style={{ maxHeight: `calc(${PANE_HEIGHT} - 52px)`, overflowY: 'auto' }}>
                    {sortThreads(threads).map((t) => (
                      <ThreadRow key={threadRef(t)} t={t} active={selected === threadRef(t)} zone={zoneOf(locations.data ?? [])} onSelect={() => select(t)} />
                    ))}
                  </Stack>
                )
              }
            </QueryState>
          </Card>
        </Grid.Col>
        <Grid.Col span={{ base: 12, md: 7, lg: 8 }}>
          {selected === null ? (
            <Card>
              <EmptyState title="Choose a thread" hint="Pick a patient on the left to read the conversation, see how each message went and answer." />
            </Card>
          ) : (
            <SelectedThread key={selected} threadRef={selected} locations={locations.data} />
          )}
        </Grid.Col>
      </Grid>
    </>
  );
}

function ThreadRow({ t, active, zone, onSelect }: { t: ReplyThreadSummary; active: boolean; zone: string; onSelect: () => void }) {
  const name = threadName(t);
  const unread = t.unread > 0;
  return (
    <UnstyledButton
      role="listitem"
      aria-label={name}
      aria-current={active ? 'true' : undefined}
      data-unread={unread || undefined}
      onClick={onSelect}
      px="sm"
      py={10}
      style={{
        borderTop: '1px solid var(--mantine-color-stone-1)',
        background: active ? 'var(--mantine-color-lagoon-0)' : undefined,
        boxShadow: active ? 'inset 3px 0 0 var(--mantine-color-lagoon-7)' : undefined,
      }}
    >
      <Group justify="space-between" wrap="nowrap" gap="xs">
        <Text fz="sm" fw={unread ? 800 : 600} truncate>
          {name}
        </Text>
        <Text fz={11} c="dimmed" style={{ flex: 'none' }}>
          {messageTime(t.lastAt, zone)}
        </Text>
      </Group>
      <Group justify="space-between" wrap="nowrap" gap="xs" mt={2}>
        <Text fz="xs" c={unread ? 'stone.9' : 'dimmed'} truncate style={{ flex: 1 }}>
          {t.lastPreview}
        </Text>
        <Group gap={4} wrap="nowrap" style={{ flex: 'none' }}>
          {t.smsConsent === false && (
            <Tooltip label="No text consent">
              <IconMessageOff size={14} color="var(--mantine-color-stone-6)" aria-label="No text consent" role="img" />
            </Tooltip>
          )}
          {t.patientId === null && (
            <Badge size="xs" color="stone" variant="outline" style={{ textTransform: 'none' }}>
              unmatched
            </Badge>
          )}
          {t.failed > 0 && (
            <Badge size="xs" color="red" variant="light" leftSection={<IconAlertTriangle size={10} />} style={{ textTransform: 'none' }} aria-label={`${t.failed} failed`}>
              {t.failed} failed
            </Badge>
          )}
          {t.openTasks > 0 && (
            <Badge size="xs" color="amber" variant="light" leftSection={<IconChecklist size={10} />} style={{ textTransform: 'none' }} aria-label={`${t.openTasks} open ${t.openTasks === 1 ? 'task' : 'tasks'}`}>
              {t.openTasks}
            </Badge>
          )}
          {unread && (
            <Badge size="sm" circle color="lagoon" variant="filled" aria-label={`${t.unread} unread`}>
              {t.unread}
            </Badge>
          )}
        </Group>
      </Group>
    </UnstyledButton>
  );
}

function SelectedThread({ threadRef: ref, locations }: { threadRef: string; locations: LocationSummary[] | undefined }) {
  const thread = useThread(ref);
  if (!locations)
    return (
      <Center py="xl">
        <Loader size="sm" aria-label="Loading" />
      </Center>
    );
  return <QueryState query={thread}>{(t) => <ThreadView threadRef={ref} thread={t} zone={zoneOf(locations, t.nextAppointment?.locationName)} />}</QueryState>;
}
