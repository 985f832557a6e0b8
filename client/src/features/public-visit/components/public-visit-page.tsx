import { Alert, Anchor, Box, Button, Center, Container, Loader, Paper, Stack, Text, ThemeIcon, Title } from '@mantine/core';
import type { PublicVisitView } from '@ostium/shared';
import { IconCalendarCheck, IconCalendarOff, IconCalendarQuestion, IconCalendarTime, IconClockExclamation, IconLinkOff, IconMapPin, IconPhone } from '@tabler/icons-react';
import { useState, type ReactNode } from 'react';
import { useParams } from 'react-router-dom';
import { Brand } from '../../../components/brand';
import { showPhone } from '../../directory/phone-display.util';
import { linkProblem, usePublicVisit, useVisitAction } from '../api/public-visit';

/** /v/:token — opened from a text, no sign-in: the visit's time and place, and two buttons. Nothing else about the patient. */
export function PublicVisitPage() {
  const token = useParams().token ?? '';
  const visit = usePublicVisit(token);
  const problem = linkProblem(visit.error);
  return (
    <Box mih="100dvh" bg="stone.0" py="lg" px="md">
      <Container size={440} p={0}>
        <Center mb="lg">
          <Brand />
        </Center>
        {visit.isPending ? (
          <Center py="xl">
            <Loader aria-label="Loading" />
          </Center>
        ) : visit.isError ? (
          <Paper p="lg" withBorder>
            {problem === 'expired' ? (
              <Outcome icon={<IconClockExclamation size={26} />} color="amber" title="This link has expired">
                Links in reminders work until the visit. Please call the practice to confirm or change it.
              </Outcome>
            ) : problem === 'invalid' ? (
              <Outcome icon={<IconLinkOff size={26} />} color="stone" title="This link does not work">
                It may be incomplete; open it again from the text, or call the practice.
              </Outcome>
            ) : (
              <Outcome icon={<IconLinkOff size={26} />} color="red" title="Could not load your visit">
                {(visit.error as Error).message}. Please try again in a moment.
              </Outcome>
            )}
          </Paper>
        ) : (
          <VisitCard token={token} v={visit.data} />
        )}
        <Text fz="xs" c="dimmed" ta="center" mt="lg">
          This page shows only the time and place of one visit.
        </Text>
      </Container>
    </Box>
  );
}

function Outcome({ icon, color, title, children }: { icon: ReactNode; color: string; title: string; children?: ReactNode }) {
  return (
    <Stack align="center" gap={6} ta="center" role="status">
      <ThemeIcon size={52} radius="xl" variant="light" color={color}>
        {icon}
      </ThemeIcon>
      <Title order={2} fz={20}>
        {title}
      </Title>
      {children && (
        <Text fz="sm" c="stone.7">
          {children}
        </Text>
      )}
    </Stack>
  );
}

function VisitCard({ token, v }: { token: string; v: PublicVisitView }) {
  const action = useVisitAction(token);
  // What this visitor did here, so "confirmed" can read as a thank-you rather than "already".
  const [done, setDone] = useState<'confirm' | 'reschedule' | null>(null);
  const act = (a: 'confirm' | 'reschedule') => action.mutate({ action: a }, { onSuccess: () => setDone(a) });
  const phone = showPhone(v.practicePhone);
  const call = phone && (
    // The server may send the number formatted for reading; a tel: link wants the digits.
    <Anchor href={`tel:${v.practicePhone!.replace(/[^\d+]/g, '')}`} fw={700}>
      {phone}
    </Anchor>
  );

  return (
    <Paper p="lg" withBorder>
      <Stack gap="md">
        <div>
          <Text fz="sm" c="dimmed" fw={600}>
            Your visit at {v.practiceName}
          </Text>
          <Title order={1} fz={24} lh={1.25} mt={4}>
            {v.when}
          </Title>
          <Text fz="md" mt={6} style={{ display: 'flex', alignItems: 'center', gap: 6 }}>
            <IconMapPin size={16} color="var(--mantine-color-lagoon-7)" aria-hidden="true" />
            {v.locationName}
          </Text>
        </div>

        {v.state === 'confirmed' && (
          <Outcome icon={<IconCalendarCheck size={26} />} color="lagoon" title={done === 'confirm' ? 'Thank you, your visit is confirmed' : 'Your visit is already confirmed'}>
            We look forward to seeing you.
          </Outcome>
        )}
        {v.state === 'reschedule_requested' && (
          <Outcome icon={<IconCalendarQuestion size={26} />} color="amber" title={done === 'reschedule' ? 'Thank you, we will be in touch' : 'You asked for another time'}>
            The practice will contact you to find a time that suits you{phone ? <> — or call {call}</> : null}.
          </Outcome>
        )}
        {v.state === 'cancelled' && (
          <Outcome icon={<IconCalendarOff size={26} />} color="red" title="This visit was cancelled">
            {phone ? <>To book again, call {call}.</> : 'To book again, please call the practice.'}
          </Outcome>
        )}
        {v.state === 'past' && (
          <Outcome icon={<IconCalendarTime size={26} />} color="stone" title="This visit has already passed">
            {phone ? <>For anything else, call {call}.</> : null}
          </Outcome>
        )}

        {action.isError && (
          <Alert color="red" variant="light" role="alert">
            {(action.error as Error).message}
          </Alert>
        )}

        {(v.canConfirm || v.canAskToReschedule) && (
          <Stack gap="sm">
            {v.canConfirm && (
              <Button size="lg" fullWidth leftSection={<IconCalendarCheck size={20} />} onClick={() => act('confirm')} loading={action.isPending && action.variables?.action === 'confirm'} disabled={action.isPending}>
                Confirm
              </Button>
            )}
            {v.canAskToReschedule && (
              <Button size="lg" fullWidth variant="default" onClick={() => act('reschedule')} loading={action.isPending && action.variables?.action === 'reschedule'} disabled={action.isPending}>
                I need another time
              </Button>
            )}
          </Stack>
        )}

        {phone && v.state === 'booked' && (
          <Text fz="sm" c="dimmed" style={{ display: 'flex', alignItems: 'center', gap: 6 }}>
            <IconPhone size={14} aria-hidden="true" />
            <span>Questions? Call {call}</span>
          </Text>
        )}
      </Stack>
    </Paper>
  );
}
