import { Alert, Anchor, Button, Card, Group, Modal, Select, Stack, Table, Text } from '@mantine/core';
import { useDebouncedValue } from '@mantine/hooks';
import { notifications } from '@mantine/notifications';
import { can, type ReferringDentist } from '@ostium/shared';
import { IconArrowMerge } from '@tabler/icons-react';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import { EmptyState } from '../../../components/empty-state';
import { PageHeader } from '../../../components/page-header';
import { QueryState } from '../../../components/query-state';
import { useSession } from '../../auth/use-session';
import { useMergeReferringDentists, useReferringDentists } from '../api/referring-dentists';
import { showPhone } from '../phone-display.util';
import { SearchField } from '../../../components/search-field';

// The server answers a search with at most 200 rows; past that, narrowing the search beats paging.
const LIMIT = 200;
const LETTERS = { email: 'E-mail', post: 'Post', fax: 'Fax' } as const;
const dash = <Text span c="dimmed" fz="sm">—</Text>;

export function ReferringDentistsPage() {
  const [search, setSearch] = useState('');
  const [q] = useDebouncedValue(search.trim(), 300);
  const dentists = useReferringDentists({ q: q || undefined, limit: LIMIT });
  const role = useSession()?.user.role;
  const [merging, setMerging] = useState<ReferringDentist | null>(null);

  return (
    <>
      <PageHeader
        title="Referring dentists"
        description="The dentists who send patients, and how each wants letters. New ones are added at Intake; two records of the same dentist can be merged."
      />
      <Group mb="md">
        <SearchField label="Search referring dentists" placeholder="Search by name, practice or e-mail" value={search} onChange={setSearch} />
      </Group>
      <Card p={0}>
        <QueryState query={dentists}>
          {(list) =>
            list.length === 0 ? (
              <EmptyState
                title={q ? `No referring dentist matches “${q}”` : 'No referring dentists yet'}
                hint={q ? 'Try the practice name or part of the e-mail address.' : 'A referring dentist is added with the first referral they send, at Intake.'}
                action={
                  can(role, 'referralsWrite') && (
                    <Anchor component={Link} to="/intake" fz="sm">
                      Go to Intake
                    </Anchor>
                  )
                }
              />
            ) : (
              <>
                <Table.ScrollContainer minWidth={860}>
                  <Table fz="sm" aria-label="Referring dentists">
                    <Table.Thead>
                      <Table.Tr>
                        <Table.Th>Name</Table.Th>
                        <Table.Th>Practice</Table.Th>
                        <Table.Th>E-mail</Table.Th>
                        <Table.Th>Phone</Table.Th>
                        <Table.Th>Letters by</Table.Th>
                        <Table.Th ta="right">Referrals</Table.Th>
                        {can(role, 'referralsWrite') && <Table.Th w={150} />}
                      </Table.Tr>
                    </Table.Thead>
                    <Table.Tbody>
                      {list.map((d) => (
                        <Table.Tr key={d.id}>
                          <Table.Td fw={700}>{d.name}</Table.Td>
                          <Table.Td>{d.practiceName ?? dash}</Table.Td>
                          <Table.Td>{d.email ?? dash}</Table.Td>
                          <Table.Td>{showPhone(d.phone) ?? dash}</Table.Td>
                          <Table.Td>{LETTERS[d.letterChannel]}</Table.Td>
                          <Table.Td ta="right">
                            <Anchor component={Link} to={`/referrals?status=all&referringDentistId=${d.id}`} fz="sm" aria-label={`${d.referralCount} referrals from ${d.name}`}>
                              {d.referralCount}
                            </Anchor>
                          </Table.Td>
                          {can(role, 'referralsWrite') && (
                            <Table.Td>
                              <Button size="compact-xs" variant="subtle" style={{ whiteSpace: 'nowrap' }} leftSection={<IconArrowMerge size={13} />} onClick={() => setMerging(d)} aria-label={`Merge ${d.name} into another record`}>
                                Merge into…
                              </Button>
                            </Table.Td>
                          )}
                        </Table.Tr>
                      ))}
                    </Table.Tbody>
                  </Table>
                </Table.ScrollContainer>
                <Text fz="sm" c="dimmed" p="sm">
                  {list.length >= LIMIT
                    ? `The first ${LIMIT} referring dentists are shown; search to narrow the list.`
                    : `${list.length} ${list.length === 1 ? 'referring dentist' : 'referring dentists'}`}
                </Text>
              </>
            )
          }
        </QueryState>
      </Card>
      <Modal opened={!!merging} onClose={() => setMerging(null)} title={merging ? `Merge ${merging.name} into…` : ''} centered size="lg">
        {merging && <MergeForm other={merging} onDone={() => setMerging(null)} />}
      </Modal>
    </>
  );
}

/** Picks the record to keep; `other` moves its referrals there and goes. */
function MergeForm({ other, onDone }: { other: ReferringDentist; onDone: () => void }) {
  const [search, setSearch] = useState('');
  const [q] = useDebouncedValue(search.trim(), 250);
  const candidates = useReferringDentists({ q: q || undefined, limit: 20 });
  const [keepId, setKeepId] = useState<string | null>(null);
  const merge = useMergeReferringDentists();
  const data = (candidates.data ?? [])
    .filter((d) => d.id !== other.id)
    .map((d) => ({ value: String(d.id), label: `${d.name}${d.practiceName ? ` · ${d.practiceName}` : ''}${d.email ? ` · ${d.email}` : ''}` }));
  const keep = candidates.data?.find((d) => String(d.id) === keepId);

  return (
    <Stack gap="sm">
      <Text fz="sm">
        Use this when two records are the same dentist. The {other.referralCount === 1 ? 'referral' : `${other.referralCount} referrals`} of{' '}
        <b>{other.name}</b>
        {other.practiceName ? ` (${other.practiceName})` : ''} move to the record you keep, and this record is removed.
      </Text>
      <Select
        label="Record to keep"
        placeholder="Search by name or practice"
        searchable
        data-autofocus
        filter={({ options }) => options}
        nothingFoundMessage={candidates.isFetching ? 'Searching…' : 'No other dentist by that name'}
        data={data}
        value={keepId}
        onChange={setKeepId}
        searchValue={search}
        onSearchChange={setSearch}
      />
      {merge.isError && (
        <Alert color="red" variant="light" role="alert">
          {(merge.error as Error).message}
        </Alert>
      )}
      <Group justify="flex-end">
        <Button variant="default" onClick={onDone}>
          Keep both
        </Button>
        <Button
          disabled={!keepId}
          loading={merge.isPending}
          onClick={() =>
            merge.mutate(
              { keepId: Number(keepId), otherId: other.id },
              {
                onSuccess: (kept) => {
                  notifications.show({ color: 'lagoon', message: `${other.name} merged into ${kept.name}` });
                  onDone();
                },
              },
            )
          }
        >
          {keep ? `Merge into ${keep.name}` : 'Merge'}
        </Button>
      </Group>
    </Stack>
  );
}
