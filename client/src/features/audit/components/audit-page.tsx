import { Badge, Card, Code, Group, Pagination, Select, Table, Text, TextInput } from '@mantine/core';
import { useDebouncedValue } from '@mantine/hooks';
import { Fragment, useState } from 'react';
import { EmptyState } from '../../../components/empty-state';
import { PageHeader } from '../../../components/page-header';
import { QueryState } from '../../../components/query-state';
import { useUsers } from '../../users/api/users';
import { useAudit } from '../api/audit';

const ACTION_COLOR = { create: 'lagoon', update: 'amber', delete: 'plum' } as const;

function changes(before: Record<string, unknown> | null, after: Record<string, unknown> | null) {
  const keys = [...new Set([...Object.keys(before ?? {}), ...Object.keys(after ?? {})])].filter((k) => k !== 'updatedAt' && k !== 'createdAt');
  return keys.map((k) => ({ k, b: before?.[k], a: after?.[k] }));
}
const show = (v: unknown) => (v === undefined ? '—' : typeof v === 'string' ? v : JSON.stringify(v));

export function AuditPage() {
  const [userId, setUserId] = useState<string | null>(null);
  const [entity, setEntity] = useState('');
  const [from, setFrom] = useState('');
  const [to, setTo] = useState('');
  const [page, setPage] = useState(1);
  const [entityQ] = useDebouncedValue(entity.trim(), 300);
  const users = useUsers();
  const audit = useAudit({
    userId: userId ? Number(userId) : undefined,
    entity: entityQ || undefined,
    from: from ? new Date(from).toISOString() : undefined,
    to: to ? new Date(to).toISOString() : undefined,
    page,
  });
  const reset = <T,>(set: (v: T) => void) => (v: T) => {
    set(v);
    setPage(1);
  };

  return (
    <>
      <PageHeader title="Audit log" description="Every create, change and delete made through Ostium: who, when, and the values before and after." />
      <Group mb="md" align="flex-end" gap="sm">
        <Select
          label="By user"
          placeholder="Anyone"
          clearable
          w={220}
          value={userId}
          onChange={reset(setUserId)}
          data={(users.data ?? []).map((u) => ({ value: String(u.id), label: u.name }))}
        />
        <TextInput label="Record type" placeholder="e.g. users" w={180} value={entity} onChange={(e) => reset(setEntity)(e.currentTarget.value)} />
        <TextInput label="From" type="datetime-local" w={210} value={from} onChange={(e) => reset(setFrom)(e.currentTarget.value)} />
        <TextInput label="Until" type="datetime-local" w={210} value={to} onChange={(e) => reset(setTo)(e.currentTarget.value)} />
      </Group>
      <Card p={0}>
        <QueryState query={audit}>
          {(res) =>
            res.items.length === 0 ? (
              <EmptyState title="Nothing recorded for these filters" hint="Widen the dates or clear a filter; changes appear here as soon as they are saved." />
            ) : (
              <>
                <Table.ScrollContainer minWidth={820}>
                  <Table>
                    <Table.Thead>
                      <Table.Tr>
                        <Table.Th w={170}>When</Table.Th>
                        <Table.Th w={220}>Who</Table.Th>
                        <Table.Th w={90}>Action</Table.Th>
                        <Table.Th w={140}>Record</Table.Th>
                        <Table.Th>Changes</Table.Th>
                      </Table.Tr>
                    </Table.Thead>
                    <Table.Tbody>
                      {res.items.map((e) => (
                        <Table.Tr key={e.id}>
                          <Table.Td fz="sm">{new Date(e.at).toLocaleString([], { dateStyle: 'medium', timeStyle: 'medium' })}</Table.Td>
                          <Table.Td fz="sm">{e.userEmail ?? <Text c="dimmed" fz="sm">system</Text>}</Table.Td>
                          <Table.Td>
                            <Badge color={ACTION_COLOR[e.action]}>{e.action}</Badge>
                          </Table.Td>
                          <Table.Td fz="sm">
                            {e.entity} #{e.entityId}
                          </Table.Td>
                          <Table.Td>
                            <Text fz="xs" component="div">
                              {changes(e.before, e.after).slice(0, 8).map(({ k, a, b }) => (
                                <Fragment key={k}>
                                  <Code>{k}</Code> {e.action === 'update' ? `${show(b)} → ${show(a)}` : show(a ?? b)}
                                  <br />
                                </Fragment>
                              ))}
                            </Text>
                          </Table.Td>
                        </Table.Tr>
                      ))}
                    </Table.Tbody>
                  </Table>
                </Table.ScrollContainer>
                <Group justify="space-between" p="sm">
                  <Text fz="sm" c="dimmed">
                    {res.total} entries
                  </Text>
                  <Pagination size="sm" total={Math.max(1, Math.ceil(res.total / res.pageSize))} value={page} onChange={setPage} />
                </Group>
              </>
            )
          }
        </QueryState>
      </Card>
    </>
  );
}
