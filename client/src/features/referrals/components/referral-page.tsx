import { Alert, Anchor, Badge, Button, Card, Center, Group, Image, Loader, Modal, SimpleGrid, Skeleton, Stack, Table, Text, Textarea, Timeline, Title, UnstyledButton } from '@mantine/core';
import { notifications } from '@mantine/notifications';
import { can, toothInfo, type AttachmentSummary, type Referral, type ReferralStatus, type ToothNotation } from '@ostium/shared';
import { IconArrowLeft, IconCheck, IconFileTypePdf, IconMail, IconPhoto, IconX } from '@tabler/icons-react';
import dayjs from 'dayjs';
import { useState, type ReactNode } from 'react';
import { Link, useLocation, useParams } from 'react-router-dom';
import { DifficultyBadge } from '../../../components/difficulty-badge';
import { QueryState } from '../../../components/query-state';
import { toothName } from '../../../components/tooth-picker';
import { useSession } from '../../auth/use-session';
import { usePractice } from '../../practice/api/practice';
import { openAttachment, useAttachmentUrl } from '../api/attachments';
import { useChangeReferralStatus, useReferral } from '../api/referrals';
import { CLOSED_STATUSES, LETTER_KIND_LABELS, LETTER_STATUS_COLORS, PROCEDURE_LABELS, STATUS_LABELS } from '../referral-labels.util';
import { StatusBadge, ToothNumber, UrgencyBadge } from './referral-badges';
import { showPhone } from '../../directory/phone-display.util';

const day = (iso: string) => dayjs(iso).format('D MMM YYYY');
const moment = (iso: string) => dayjs(iso).format('D MMM YYYY, HH:mm');
const CHANNELS = { text: 'text', email: 'e-mail', phone: 'phone call' } as const;
const LETTER_CHANNELS = { email: 'e-mail', post: 'post', fax: 'fax' } as const;

export function ReferralPage() {
  const id = Number(useParams().id);
  const referral = useReferral(id);
  const practice = usePractice();
  const notation: ToothNotation = practice.data?.settings.toothNotation ?? 'fdi';
  return <QueryState query={referral}>{(r) => <ReferralView r={r} notation={notation} />}</QueryState>;
}

function Field({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div>
      <Text fz={11} fw={700} c="stone.6" tt="uppercase" style={{ letterSpacing: '0.05em' }}>
        {label}
      </Text>
      <Text fz="sm" component="div">
        {children || <Text span c="dimmed" fz="sm">—</Text>}
      </Text>
    </div>
  );
}

function ReferralView({ r, notation }: { r: Referral; notation: ToothNotation }) {
  const role = useSession()?.user.role;
  const canOpenCases = can(role, 'cases');
  const back = (useLocation().state as { from?: string } | null)?.from ?? '/referrals';
  const p = r.patientDetail;
  const d = r.referringDentistDetail;
  return (
    <>
      <Anchor component={Link} to={back} fz="sm" mb="xs" display="inline-flex" style={{ alignItems: 'center', gap: 4 }}>
        <IconArrowLeft size={14} /> Referral queue
      </Anchor>
      <Group justify="space-between" align="flex-start" mb="lg" wrap="wrap">
        <Stack gap={4}>
          <Group gap="sm">
            <Title order={2} fz={24}>
              {r.patient.name}
            </Title>
            <StatusBadge status={r.status} size="md" />
            <UrgencyBadge urgency={r.urgency} size="md" />
          </Group>
          <Text c="dimmed" fz="sm">
            Referral #{r.id} · {PROCEDURE_LABELS[r.procedure]} · received {day(r.receivedOn)} at {r.location.name} · waiting {r.waitingDays}{' '}
            {r.waitingDays === 1 ? 'day' : 'days'}
          </Text>
          {r.statusReason && (
            <Text fz="sm">
              <b>{STATUS_LABELS[r.status]}:</b> {r.statusReason}
            </Text>
          )}
        </Stack>
        {can(role, 'referralsWrite') && <StatusActions r={r} />}
      </Group>

      <SimpleGrid cols={{ base: 1, md: 2 }} mb="md">
        <Card aria-label="Patient" component="section">
          <Title order={3} fz="md" mb="sm">
            Patient
          </Title>
          <SimpleGrid cols={2} spacing="xs" verticalSpacing="xs">
            <Field label="Name">
              {p.firstName} {p.lastName}
            </Field>
            <Field label="Date of birth">{day(p.dateOfBirth)}</Field>
            <Field label="Phone">{showPhone(p.phone)}</Field>
            <Field label="E-mail">{p.email}</Field>
            <Field label="Preferred channel">{CHANNELS[p.preferredChannel]}</Field>
            <Field label="Text messages">
              {p.smsConsent ? `agreed${p.smsConsentAt ? ` ${day(p.smsConsentAt)}` : ''}${p.smsConsentSource ? `, ${p.smsConsentSource}` : ''}` : 'no consent on file'}
            </Field>
            <Field label="Time zone">{p.timeZone}</Field>
            {p.notes && <Field label="Notes">{p.notes}</Field>}
          </SimpleGrid>
        </Card>
        <Card aria-label="Referring dentist" component="section">
          <Title order={3} fz="md" mb="sm">
            Referring dentist
          </Title>
          <SimpleGrid cols={2} spacing="xs" verticalSpacing="xs">
            <Field label="Name">{d.name}</Field>
            <Field label="Practice">{d.practiceName}</Field>
            <Field label="E-mail">{d.email}</Field>
            <Field label="Phone">{showPhone(d.phone)}</Field>
            <Field label="Letters by">{LETTER_CHANNELS[d.letterChannel]}</Field>
            <Field label="Referrals sent">{d.referralCount}</Field>
          </SimpleGrid>
        </Card>
      </SimpleGrid>

      <Card mb="md" aria-label="Cases" component="section" p={0}>
        <Group justify="space-between" p="md" pb="xs">
          <Title order={3} fz="md">
            Cases
          </Title>
          <Text fz="xs" c="dimmed">
            One per tooth; each is assessed, estimated and booked on its own.
          </Text>
        </Group>
        <Table fz="sm" aria-label="Cases">
          <Table.Thead>
            <Table.Tr>
              <Table.Th>Tooth</Table.Th>
              <Table.Th>Procedure</Table.Th>
              <Table.Th>Difficulty</Table.Th>
              <Table.Th>Chair-time estimate</Table.Th>
              <Table.Th>Status</Table.Th>
              {canOpenCases && <Table.Th />}
            </Table.Tr>
          </Table.Thead>
          <Table.Tbody>
            {r.cases.map((c) => (
              <Table.Tr key={c.id}>
                <Table.Td>
                  <ToothNumber fdi={c.toothFdi} notation={notation} />
                  <Text fz={11} c="dimmed">
                    {toothName(toothInfo(c.toothFdi))}
                  </Text>
                </Table.Td>
                <Table.Td>{PROCEDURE_LABELS[c.procedure]}</Table.Td>
                <Table.Td>{c.level ? <DifficultyBadge level={c.level} size="xs" /> : <Text fz="xs" c="dimmed">not assessed yet</Text>}</Table.Td>
                <Table.Td>
                  {c.estimatedMinutes !== null ? (
                    `${c.estimatedMinutes} min${c.visitCount ? ` in ${c.visitCount} ${c.visitCount === 1 ? 'visit' : 'visits'}` : ''}`
                  ) : (
                    <Text fz="xs" c="dimmed">
                      after assessment
                    </Text>
                  )}
                </Table.Td>
                <Table.Td>
                  <StatusBadge status={c.status} size="xs" />
                </Table.Td>
                {canOpenCases && (
                  <Table.Td>
                    <Button component={Link} to={`/cases/${c.id}`} size="compact-xs" variant="light" aria-label={`Case sheet for tooth ${c.toothFdi}`}>
                      Case sheet
                    </Button>
                  </Table.Td>
                )}
              </Table.Tr>
            ))}
          </Table.Tbody>
        </Table>
      </Card>

      {(r.reason || r.notes) && (
        <SimpleGrid cols={{ base: 1, md: 2 }} mb="md">
          <Card aria-label="Referrer's reason">
            <Field label="Referrer's reason">{r.reason}</Field>
          </Card>
          <Card aria-label="Notes">
            <Field label="Notes">{r.notes}</Field>
          </Card>
        </SimpleGrid>
      )}

      <Card mb="md" aria-label="Attachments" component="section">
        <Title order={3} fz="md" mb="sm">
          Radiographs and letters
        </Title>
        {r.attachments.length === 0 ? (
          <Text fz="sm" c="dimmed">
            Nothing attached. Radiographs and letters are added at Intake; ask the referring office to send any that are missing.
          </Text>
        ) : (
          <Group gap="sm" align="flex-start">
            {r.attachments.map((a) => (
              <AttachmentTile key={a.id} a={a} />
            ))}
          </Group>
        )}
      </Card>

      <SimpleGrid cols={{ base: 1, md: 2 }}>
        <Card aria-label="Status history" component="section">
          <Title order={3} fz="md" mb="sm">
            Status history
          </Title>
          <Timeline bulletSize={14} lineWidth={2} active={r.history.length - 1}>
            {r.history.map((h, i) => (
              <Timeline.Item key={i} title={<Text fz="sm" fw={700}>{STATUS_LABELS[h.status]}</Text>}>
                <Text fz="xs" c="dimmed">
                  {moment(h.at)} · {h.byName ?? 'Ostium'}
                </Text>
                {h.reason && <Text fz="sm">{h.reason}</Text>}
              </Timeline.Item>
            ))}
          </Timeline>
        </Card>
        <Card aria-label="Letters" component="section" p={0}>
          <Title order={3} fz="md" p="md" pb="xs">
            Letters to the referring dentist
          </Title>
          {r.letters.length === 0 ? (
            <Text fz="sm" c="dimmed" px="md" pb="md">
              No letter yet. The acknowledgement goes out when a referral is saved.
            </Text>
          ) : (
            <Table fz="sm">
              <Table.Tbody>
                {r.letters.map((l) => (
                  <Table.Tr key={l.id}>
                    <Table.Td>
                      <Group gap={6} wrap="nowrap">
                        <IconMail size={14} />
                        <div>
                          <Text fz="sm" fw={600}>
                            {LETTER_KIND_LABELS[l.kind]}
                          </Text>
                          <Text fz={11} c="dimmed">
                            to {l.to} · {moment(l.at)}
                          </Text>
                        </div>
                      </Group>
                    </Table.Td>
                    <Table.Td>
                      <Badge color={LETTER_STATUS_COLORS[l.status]} size="sm" style={{ textTransform: 'none' }}>
                        {l.status}
                      </Badge>
                      {l.detail && (
                        <Text fz={11} c="dimmed">
                          {l.detail}
                        </Text>
                      )}
                    </Table.Td>
                  </Table.Tr>
                ))}
              </Table.Tbody>
            </Table>
          )}
        </Card>
      </SimpleGrid>
    </>
  );
}

function AttachmentTile({ a }: { a: AttachmentSummary }) {
  const image = a.mimeType !== 'application/pdf';
  const { url, error } = useAttachmentUrl(a.id, image);
  const [opening, setOpening] = useState(false);
  const open = async () => {
    setOpening(true);
    try {
      await openAttachment(a.id);
    } catch (e) {
      notifications.show({ color: 'red', title: 'Could not open the file', message: (e as Error).message });
    } finally {
      setOpening(false);
    }
  };
  return (
    <UnstyledButton onClick={open} aria-label={`Open ${a.fileName}`} w={150} style={{ borderRadius: 'var(--mantine-radius-md)' }}>
      <Card p={6} withBorder>
        <Center h={100} bg="stone.1" style={{ borderRadius: 'var(--mantine-radius-sm)', overflow: 'hidden' }}>
          {opening ? (
            <Loader size="sm" aria-label="Opening" />
          ) : !image ? (
            <IconFileTypePdf size={36} color="var(--mantine-color-plum-6)" />
          ) : url ? (
            <Image src={url} alt={`Radiograph ${a.fileName}`} h={100} w="100%" fit="cover" />
          ) : error ? (
            <IconPhoto size={32} color="var(--mantine-color-stone-4)" aria-label={`Preview failed: ${error}`} />
          ) : (
            <Skeleton h={100} w="100%" />
          )}
        </Center>
        <Text fz="xs" fw={600} truncate mt={4}>
          {a.fileName}
        </Text>
        <Text fz={10} c="dimmed">
          {a.kind} · {Math.max(1, Math.round(a.sizeBytes / 1024))} KB
        </Text>
      </Card>
    </UnstyledButton>
  );
}

type Action = { status: ReferralStatus; label: string; needsReason: boolean; color?: string };

function actionsFor(status: ReferralStatus): Action[] {
  if (CLOSED_STATUSES.includes(status)) return [];
  const out: Action[] = [];
  if (status === 'received') out.push({ status: 'triaged', label: 'Mark triaged', needsReason: false });
  out.push({ status: 'declined', label: 'Decline', needsReason: true, color: 'red' });
  out.push({ status: 'cancelled', label: 'Cancel referral', needsReason: true, color: 'stone' });
  return out;
}

function StatusActions({ r }: { r: Referral }) {
  const change = useChangeReferralStatus(r.id);
  const [asking, setAsking] = useState<Action | null>(null);
  const [reason, setReason] = useState('');
  const [missing, setMissing] = useState(false);
  const actions = actionsFor(r.status);
  if (actions.length === 0) return null;

  const run = (a: Action, why?: string) =>
    change.mutate(
      { status: a.status, ...(why ? { reason: why } : {}) },
      {
        onSuccess: () => {
          notifications.show({ color: 'lagoon', message: `Referral #${r.id} is now ${STATUS_LABELS[a.status].toLowerCase()}` });
          setAsking(null);
          setReason('');
        },
        onError: (e) => notifications.show({ color: 'red', title: 'Status not changed', message: (e as Error).message }),
      },
    );

  return (
    <>
      <Group gap="xs">
        {actions.map((a) =>
          a.needsReason ? (
            <Button key={a.status} variant="light" color={a.color} leftSection={<IconX size={14} />} onClick={() => setAsking(a)}>
              {a.label}
            </Button>
          ) : (
            <Button key={a.status} leftSection={<IconCheck size={14} />} onClick={() => run(a)} loading={change.isPending && !asking}>
              {a.label}
            </Button>
          ),
        )}
      </Group>
      <Modal opened={!!asking} onClose={() => setAsking(null)} title={asking ? `${asking.label}: referral #${r.id}` : ''} centered>
        <form
          onSubmit={(e) => {
            e.preventDefault();
            if (!reason.trim()) return setMissing(true);
            if (asking) run(asking, reason.trim());
          }}
        >
          <Stack gap="sm">
            <Textarea
              label="Reason"
              description="Kept in the status history with your name."
              withAsterisk
              rows={4}
              data-autofocus
              value={reason}
              error={missing && !reason.trim() ? 'Give a reason' : undefined}
              onChange={(e) => {
                setReason(e.currentTarget.value);
                setMissing(false);
              }}
            />
            {change.isError && (
              <Alert color="red" variant="light" role="alert">
                {(change.error as Error).message}
              </Alert>
            )}
            <Group justify="flex-end">
              <Button variant="default" onClick={() => setAsking(null)}>
                Keep as is
              </Button>
              <Button type="submit" color={asking?.color} loading={change.isPending}>
                {asking?.label}
              </Button>
            </Group>
          </Stack>
        </form>
      </Modal>
    </>
  );
}
