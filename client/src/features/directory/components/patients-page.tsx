import { Anchor, Badge, Card, Group, Table, Text } from '@mantine/core';
import { useDebouncedValue } from '@mantine/hooks';
import { can } from '@ostium/shared';
import dayjs from 'dayjs';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import { EmptyState } from '../../../components/empty-state';
import { PageHeader } from '../../../components/page-header';
import { QueryState } from '../../../components/query-state';
import { useSession } from '../../auth/use-session';
import { usePatients } from '../api/patients';
import { showPhone } from '../phone-display.util';
import { SearchField } from '../../../components/search-field';

// The server answers a search with at most 200 rows; past that, narrowing the search beats paging.
const LIMIT = 200;
const CHANNELS = { text: 'Text', email: 'E-mail', phone: 'Phone call' } as const;

export function PatientsPage() {
  const [search, setSearch] = useState('');
  const [q] = useDebouncedValue(search.trim(), 300);
  const patients = usePatients({ q: q || undefined, limit: LIMIT });
  const role = useSession()?.user.role;

  return (
    <>
      <PageHeader title="Patients" description="Everyone referred to the practice. Patients are added at Intake, with the referral that brings them." />
      <Group mb="md">
        <SearchField label="Search patients" placeholder="Search by name, phone or e-mail" value={search} onChange={setSearch} />
      </Group>
      <Card p={0}>
        <QueryState query={patients}>
          {(list) =>
            list.length === 0 ? (
              <EmptyState
                title={q ? `No patient matches “${q}”` : 'No patients yet'}
                hint={
                  q
                    ? 'Check the spelling or search by phone number; a new patient is added with their referral at Intake.'
                    : 'Patients appear here when their first referral is taken at Intake.'
                }
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
                <Table.ScrollContainer minWidth={820}>
                  <Table fz="sm" aria-label="Patients">
                    <Table.Thead>
                      <Table.Tr>
                        <Table.Th>Name</Table.Th>
                        <Table.Th>Date of birth</Table.Th>
                        <Table.Th>Phone</Table.Th>
                        <Table.Th>E-mail</Table.Th>
                        <Table.Th>Prefers</Table.Th>
                        <Table.Th>Texts</Table.Th>
                        <Table.Th>Referrals</Table.Th>
                      </Table.Tr>
                    </Table.Thead>
                    <Table.Tbody>
                      {list.map((p) => (
                        <Table.Tr key={p.id}>
                          <Table.Td fw={700}>
                            {p.lastName}, {p.firstName}
                          </Table.Td>
                          <Table.Td>{dayjs(p.dateOfBirth).format('D MMM YYYY')}</Table.Td>
                          <Table.Td>{showPhone(p.phone) ?? <Text span c="dimmed" fz="sm">—</Text>}</Table.Td>
                          <Table.Td>{p.email ?? <Text span c="dimmed" fz="sm">—</Text>}</Table.Td>
                          <Table.Td>{CHANNELS[p.preferredChannel]}</Table.Td>
                          <Table.Td>
                            {p.smsConsent ? (
                              <Badge size="xs" color="lagoon" title={p.smsConsentSource ?? undefined}>
                                consent
                              </Badge>
                            ) : (
                              <Badge size="xs" color="stone" variant="outline">
                                no consent
                              </Badge>
                            )}
                          </Table.Td>
                          <Table.Td>
                            <Anchor component={Link} to={`/referrals?status=all&q=${encodeURIComponent(p.lastName)}`} fz="sm">
                              In the queue
                            </Anchor>
                          </Table.Td>
                        </Table.Tr>
                      ))}
                    </Table.Tbody>
                  </Table>
                </Table.ScrollContainer>
                <Text fz="sm" c="dimmed" p="sm">
                  {list.length >= LIMIT
                    ? `The first ${LIMIT} patients are shown; search to narrow the list.`
                    : `${list.length} ${list.length === 1 ? 'patient' : 'patients'}`}
                </Text>
              </>
            )
          }
        </QueryState>
      </Card>
    </>
  );
}
