import { Badge, Card, Group, SimpleGrid, Stack, Text, Title } from '@mantine/core';
import { ROLE_LABELS } from '@ostium/shared';
import { IconArmchair, IconMicroscope } from '@tabler/icons-react';
import { DateTime } from 'luxon';
import { PageHeader } from '../../../components/page-header';
import { QueryState } from '../../../components/query-state';
import { useSession } from '../../auth/use-session';
import { CalendarFeedCard } from '../../calendar-feed/components/calendar-feed-card';
import { useLocations, usePractice } from '../../practice/api/practice';

const WEEKDAYS = ['', 'Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'];

export function TodayPage() {
  const session = useSession()!;
  const practice = usePractice();
  const locations = useLocations();
  const first = session.user.name.replace(/^Dr\.?\s+/i, 'Dr. ').split(' ').slice(0, 2).join(' ');
  return (
    <>
      <PageHeader
        title={`Good ${greeting()}, ${first}`}
        description={`${ROLE_LABELS[session.user.role]} · ${practice.data?.name ?? ''}`}
      />
      <QueryState query={locations}>
        {(list) => (
          <SimpleGrid cols={{ base: 1, md: 2 }}>
            {list.map((l) => {
              const now = DateTime.now().setZone(l.timeZone);
              const today = l.openingHours.find((h) => h.weekday === now.weekday);
              return (
                <Card key={l.id}>
                  <Group justify="space-between" mb="xs">
                    <Title order={3} fz="lg">
                      {l.name}
                    </Title>
                    <Badge color={today ? 'lagoon' : 'stone'}>{today ? `Open today ${today.open}–${today.close}` : 'Closed today'}</Badge>
                  </Group>
                  <Text fz="sm" c="dimmed">
                    {l.address} · local time {now.toFormat('HH:mm')} ({l.timeZone})
                  </Text>
                  <Stack gap={4} mt="sm">
                    <Group gap={6}>
                      <IconArmchair size={16} />
                      <Text fz="sm">{l.chairs.map((c) => c.name + (c.fixedMicroscopeId ? ' (microscope)' : '')).join(', ')}</Text>
                    </Group>
                    <Group gap={6}>
                      <IconMicroscope size={16} />
                      <Text fz="sm">{l.microscopes.map((m) => `${m.name}${m.mobile ? ', mobile' : ''}`).join('; ') || 'No microscope'}</Text>
                    </Group>
                    <Text fz="xs" c="dimmed">
                      Hours: {l.openingHours.map((h) => `${WEEKDAYS[h.weekday]} ${h.open}–${h.close}`).join(' · ')}
                    </Text>
                  </Stack>
                </Card>
              );
            })}
          </SimpleGrid>
        )}
      </QueryState>
      {session.user.role === 'endodontist' && (
        <SimpleGrid cols={{ base: 1, md: 2 }} mt="md">
          <CalendarFeedCard operatorId={session.user.id} />
        </SimpleGrid>
      )}
    </>
  );
}

function greeting() {
  const h = new Date().getHours();
  return h < 12 ? 'morning' : h < 18 ? 'afternoon' : 'evening';
}
