import { Anchor, Button, Card, Chip, Group, Pagination, Select, Stack, Table, Text, TextInput, UnstyledButton } from '@mantine/core';
import { useDebouncedValue } from '@mantine/hooks';
import { can, REFERRAL_STATUSES, URGENCIES, type ReferralQuery, type ReferralStatus, type ToothNotation, type Urgency } from '@ostium/shared';
import { IconArrowDown, IconArrowUp, IconArrowsSort, IconFilePlus, IconSearch } from '@tabler/icons-react';
import dayjs from 'dayjs';
import { useEffect, useMemo, useState, type ReactNode } from 'react';
import { Link, useNavigate, useSearchParams } from 'react-router-dom';
import { EmptyState } from '../../../components/empty-state';
import { PageHeader } from '../../../components/page-header';
import { QueryState } from '../../../components/query-state';
import { sortTeeth } from '../../../components/tooth-picker';
import { useSession } from '../../auth/use-session';
import { useReferringDentists } from '../../directory/api/referring-dentists';
import { useLocations, usePractice } from '../../practice/api/practice';
import { useReferralQueue } from '../api/referrals';
import { OPEN_STATUSES, PROCEDURE_LABELS, STATUS_LABELS, URGENCY_LABELS } from '../referral-labels.util';
import { StatusBadge, ToothNumber, UrgencyBadge } from './referral-badges';

export const PAGE_SIZE = 25;
type Sort = NonNullable<ReferralQuery['sort']>;
// The order a column starts in when first clicked, the server's defaults: the most pressing first. For
// `waiting` the server orders by the date received, so ascending puts the longest wait at the top.
const FIRST_ORDER: Record<Sort, 'asc' | 'desc'> = { waiting: 'asc', received: 'desc', urgency: 'desc', patient: 'asc' };

/**
 * The queue's filters live in the address bar, so a referral opened from the queue comes back to the
 * same view and a filtered queue can be shared. No `status` means the open statuses; `status=all` means any.
 */
export function queryFromParams(p: URLSearchParams): ReferralQuery {
  const raw = p.get('status');
  const status =
    raw === null ? OPEN_STATUSES : raw === 'all' ? undefined : raw.split(',').filter((s): s is ReferralStatus => (REFERRAL_STATUSES as readonly string[]).includes(s));
  const num = (k: string) => (p.get(k) ? Number(p.get(k)) : undefined);
  const sort = (p.get('sort') as Sort | null) ?? 'waiting';
  return {
    status,
    urgency: (p.get('urgency') as Urgency | null) ?? undefined,
    referringDentistId: num('referringDentistId'),
    locationId: num('locationId'),
    from: p.get('from') ?? undefined,
    to: p.get('to') ?? undefined,
    q: p.get('q') ?? undefined,
    sort,
    order: (p.get('order') as 'asc' | 'desc' | null) ?? FIRST_ORDER[sort],
    page: num('page') ?? 1,
    pageSize: PAGE_SIZE,
  };
}

export function ReferralQueuePage() {
  const [params, setParams] = useSearchParams();
  const query = useMemo(() => queryFromParams(params), [params]);
  const queue = useReferralQueue(query);
  const practice = usePractice();
  const notation: ToothNotation = practice.data?.settings.toothNotation ?? 'fdi';
  const role = useSession()?.user.role;
  const navigate = useNavigate();
  // The referral page's back link returns to this exact view.
  const from = { from: `/referrals${params.size ? `?${params}` : ''}` };

  /** Changes some filters; any change but paging goes back to page 1. */
  const update = (changes: Record<string, string | null | undefined>) => {
    setParams(
      (prev) => {
        const next = new URLSearchParams(prev);
        for (const [k, v] of Object.entries(changes)) {
          if (v === null || v === undefined || v === '') next.delete(k);
          else next.set(k, v);
        }
        if (!('page' in changes)) next.delete('page');
        return next;
      },
      { replace: true },
    );
  };

  const [search, setSearch] = useState(query.q ?? '');
  const [debounced] = useDebouncedValue(search.trim(), 300);
  useEffect(() => {
    if ((query.q ?? '') !== debounced) update({ q: debounced });
    // Keyed on the settled text only; `update` and `query` change on every render.
  }, [debounced]);

  const statusList = query.status === undefined ? [] : Array.isArray(query.status) ? query.status : [query.status];
  const filtered = params.toString().replace(/(^|&)(sort|order|page)=[^&]*/g, '') !== '';
  const counts = queue.data?.countsByStatus;

  const sortHeader = (key: Sort, label: string, w?: number) => {
    const active = query.sort === key;
    // What the reader sees: for Waiting, the number of days, which runs against the date received.
    const shown = key === 'waiting' ? (query.order === 'asc' ? 'desc' : 'asc') : query.order;
    const Icon = !active ? IconArrowsSort : shown === 'asc' ? IconArrowUp : IconArrowDown;
    return (
      <Table.Th w={w} aria-sort={active ? (shown === 'asc' ? 'ascending' : 'descending') : 'none'}>
        <UnstyledButton
          onClick={() => update({ sort: key, order: active ? (query.order === 'asc' ? 'desc' : 'asc') : FIRST_ORDER[key] })}
          fz="sm"
          fw={700}
        >
          <Group gap={4} wrap="nowrap">
            {label}
            <Icon size={13} stroke={1.8} color={active ? 'var(--mantine-color-lagoon-8)' : 'var(--mantine-color-stone-4)'} />
          </Group>
        </UnstyledButton>
      </Table.Th>
    );
  };

  return (
    <>
      <PageHeader
        title="Referral queue"
        description="Every referral and where it stands; the longest-waiting first."
        actions={
          can(role, 'referralsWrite') && (
            <Button component={Link} to="/intake" leftSection={<IconFilePlus size={16} />}>
              New referral
            </Button>
          )
        }
      />
      <Stack gap="sm" mb="md">
        <Group gap="xs" role="group" aria-label="Status">
          <Chip.Group multiple value={statusList} onChange={(v) => update({ status: v.length ? v.join(',') : 'all' })}>
            {REFERRAL_STATUSES.map((s) => (
              <Chip key={s} value={s} size="xs" variant="outline">
                {STATUS_LABELS[s]}
                {counts && ' '}
                {counts && (
                  <Text span fz={11} fw={700} ml={6} c="dimmed">
                    {counts[s] ?? 0}
                  </Text>
                )}
              </Chip>
            ))}
          </Chip.Group>
          <Button size="compact-xs" variant="subtle" onClick={() => update({ status: null })}>
            Not yet completed
          </Button>
          <Button size="compact-xs" variant="subtle" onClick={() => update({ status: 'all' })}>
            Any status
          </Button>
        </Group>
        <Group gap="sm" align="flex-end">
          <TextInput
            label="Patient"
            placeholder="Name"
            leftSection={<IconSearch size={14} />}
            w={200}
            value={search}
            onChange={(e) => setSearch(e.currentTarget.value)}
          />
          <Select
            label="Urgency"
            placeholder="Any"
            clearable
            w={130}
            data={URGENCIES.map((u) => ({ value: u, label: URGENCY_LABELS[u] }))}
            value={query.urgency ?? null}
            onChange={(v) => update({ urgency: v })}
          />
          <ReferrerFilter value={query.referringDentistId} onChange={(id) => update({ referringDentistId: id ? String(id) : null })} />
          <LocationFilter value={query.locationId} onChange={(id) => update({ locationId: id ? String(id) : null })} />
          <TextInput label="Received from" type="date" w={150} value={query.from ?? ''} onChange={(e) => update({ from: e.currentTarget.value })} />
          <TextInput label="Received until" type="date" w={150} value={query.to ?? ''} onChange={(e) => update({ to: e.currentTarget.value })} />
          {filtered && (
            <Button
              variant="subtle"
              color="stone"
              onClick={() => {
                setSearch('');
                setParams(new URLSearchParams(), { replace: true });
              }}
            >
              Reset filters
            </Button>
          )}
        </Group>
      </Stack>
      <Card p={0}>
        <QueryState query={queue}>
          {(res) =>
            res.items.length === 0 ? (
              <EmptyState
                title={filtered ? 'No referral matches these filters' : 'No referrals are waiting'}
                hint={
                  filtered
                    ? 'Widen the dates, pick more statuses or reset the filters.'
                    : 'New referrals appear here the moment they are saved in Intake and stay until treatment is completed, declined or cancelled.'
                }
                action={
                  filtered ? (
                    <Button variant="light" onClick={() => setParams(new URLSearchParams(), { replace: true })}>
                      Reset filters
                    </Button>
                  ) : (
                    can(role, 'referralsWrite') && (
                      <Button component={Link} to="/intake" variant="light">
                        Take a referral
                      </Button>
                    )
                  )
                }
              />
            ) : (
              <>
                <Table.ScrollContainer minWidth={1040}>
                  <Table fz="sm" verticalSpacing={5} aria-label="Referrals">
                    <Table.Thead>
                      <Table.Tr>
                        {sortHeader('waiting', 'Waiting', 92)}
                        {sortHeader('patient', 'Patient')}
                        <Table.Th>Teeth</Table.Th>
                        <Table.Th>Procedure</Table.Th>
                        {sortHeader('urgency', 'Urgency', 100)}
                        <Table.Th>Referring dentist</Table.Th>
                        <Table.Th>Location</Table.Th>
                        {sortHeader('received', 'Received', 110)}
                        <Table.Th w={110}>Status</Table.Th>
                      </Table.Tr>
                    </Table.Thead>
                    <Table.Tbody>
                      {res.items.map((r) => (
                        <Table.Tr key={r.id} style={{ cursor: 'pointer' }} onClick={() => navigate(`/referrals/${r.id}`, { state: from })}>
                          <Table.Td>
                            <Waiting days={r.waitingDays} />
                          </Table.Td>
                          <Table.Td>
                            <Anchor component={Link} to={`/referrals/${r.id}`} state={from} fw={700} fz="sm" onClick={(e) => e.stopPropagation()}>
                              {r.patient.name}
                            </Anchor>
                            <Text fz={11} c="dimmed">
                              born {r.patient.dateOfBirth}
                            </Text>
                          </Table.Td>
                          <Table.Td>
                            <Group gap={8}>
                              {sortTeeth(r.teeth).map((t) => (
                                <ToothNumber key={t} fdi={t} notation={notation} />
                              ))}
                            </Group>
                          </Table.Td>
                          <Table.Td>{PROCEDURE_LABELS[r.procedure]}</Table.Td>
                          <Table.Td>
                            <UrgencyBadge urgency={r.urgency} />
                          </Table.Td>
                          <Table.Td>
                            {r.referringDentist.name}
                            {r.referringDentist.practiceName && (
                              <Text fz={11} c="dimmed">
                                {r.referringDentist.practiceName}
                              </Text>
                            )}
                          </Table.Td>
                          <Table.Td>{r.location.name}</Table.Td>
                          <Table.Td>{dayjs(r.receivedOn).format('D MMM YYYY')}</Table.Td>
                          <Table.Td>
                            <StatusBadge status={r.status} />
                          </Table.Td>
                        </Table.Tr>
                      ))}
                    </Table.Tbody>
                  </Table>
                </Table.ScrollContainer>
                <Group justify="space-between" p="sm">
                  <Text fz="sm" c="dimmed">
                    {(res.page - 1) * res.pageSize + 1}–{Math.min(res.total, res.page * res.pageSize)} of {res.total}
                  </Text>
                  <Pagination
                    size="sm"
                    total={Math.max(1, Math.ceil(res.total / res.pageSize))}
                    value={res.page}
                    onChange={(p) => update({ page: String(p) })}
                    getItemProps={(n) => ({ 'aria-label': `Page ${n}` })}
                  />
                </Group>
              </>
            )
          }
        </QueryState>
      </Card>
    </>
  );
}

function Waiting({ days }: { days: number }): ReactNode {
  // Past two weeks the wait deserves a second look; past four it is overdue (common practice, no source).
  const c = days > 28 ? 'red.8' : days > 14 ? 'amber.8' : undefined;
  return (
    <Text fz="sm" fw={700} c={c} aria-label={`waiting ${days} ${days === 1 ? 'day' : 'days'}`}>
      {days} d
    </Text>
  );
}

function LocationFilter({ value, onChange }: { value?: number; onChange: (id: number | null) => void }) {
  const locations = useLocations();
  const data = (locations.data ?? []).map((l) => ({ value: String(l.id), label: l.name }));
  if (data.length <= 1 && !value) return null;
  return <Select label="Location" placeholder="All" clearable w={160} data={data} value={value ? String(value) : null} onChange={(v) => onChange(v ? Number(v) : null)} />;
}

/** Searches referring dentists on the server as the user types; keeps the chosen one listed. */
function ReferrerFilter({ value, onChange }: { value?: number; onChange: (id: number | null) => void }) {
  const [search, setSearch] = useState('');
  const [q] = useDebouncedValue(search.trim(), 250);
  const [chosen, setChosen] = useState<{ value: string; label: string } | null>(null);
  const list = useReferringDentists({ q: q || undefined, limit: 20 });
  const data = (list.data ?? []).map((d) => ({ value: String(d.id), label: d.name }));
  if (chosen && !data.some((d) => d.value === chosen.value)) data.unshift(chosen);
  if (value && !data.some((d) => d.value === String(value))) data.unshift({ value: String(value), label: `Dentist #${value}` });
  return (
    <Select
      label="Referring dentist"
      placeholder="Anyone"
      searchable
      clearable
      w={210}
      filter={({ options }) => options}
      nothingFoundMessage={list.isFetching ? 'Searching…' : 'No dentist by that name'}
      data={data}
      value={value ? String(value) : null}
      searchValue={search}
      onSearchChange={setSearch}
      onChange={(v, option) => {
        setChosen(v && option ? { value: v, label: option.label } : null);
        onChange(v ? Number(v) : null);
      }}
    />
  );
}
