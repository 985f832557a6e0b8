import { Alert, Anchor, Button, Card, Checkbox, Chip, Group, Select, SegmentedControl, Stack, Text, TextInput, Title } from '@mantine/core';
import { notifications } from '@mantine/notifications';
import { formatTooth, type Appointment, type CaseSheet, type LocationSummary, type TimeProposal } from '@ostium/shared';
import { IconCalendarCheck, IconMicroscope } from '@tabler/icons-react';
import { useQuery } from '@tanstack/react-query';
import { useMemo, useRef, useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { DifficultyBadge } from '../../../components/difficulty-badge';
import { EmptyState } from '../../../components/empty-state';
import { PageHeader } from '../../../components/page-header';
import { QueryState } from '../../../components/query-state';
import { useCaseSheet } from '../../case-sheet/api/case-sheet';
import { PROCEDURE_LABELS } from '../../case-sheet/case-sheet.util';
import { localDate, localDay, localTime, makeLookup, problemFrom, type ChangeProblem } from '../../chair-board/board.util';
import { ChangeProblemAlert } from '../../chair-board/components/change-problem-alert';
import { useLocations, usePractice } from '../../practice/api/practice';
import { usersQuery } from '../../users/api/users';
import { useAddToWaitlist, useBookProposal, useTimeFinder } from '../api/time-finder';
import { IdempotencyKeys, searchRequest, WEEKDAY_CHOICES, type SearchForm } from '../time-finder.util';
import { ProposalCard } from './proposal-card';

/** /cases/:id/find-times — the time finder's proposals for one case; one click books a whole series. */
export function FindTimesPage() {
  const caseId = Number(useParams().id);
  if (!Number.isInteger(caseId) || caseId <= 0) return <EmptyState title="No such case" hint="Open Find times from a case sheet." />;
  return <Loader caseId={caseId} />;
}

function Loader({ caseId }: { caseId: number }) {
  const sheet = useCaseSheet(caseId);
  const locations = useLocations();
  return <QueryState query={sheet}>{(s) => <QueryState query={locations}>{(ls) => <FindTimes sheet={s} locations={ls} />}</QueryState>}</QueryState>;
}

function FindTimes({ sheet, locations }: { sheet: CaseSheet; locations: LocationSummary[] }) {
  const notation = usePractice().data?.settings.toothNotation ?? 'fdi';
  const operators = useQuery(usersQuery('endodontist')).data ?? [];
  const [form, setForm] = useState<SearchForm>(() => ({
    weekdays: [],
    partOfDay: 'any',
    locationId: sheet.referral.locationId ?? null,
    operatorId: sheet.operatorId,
    earliest: '',
    urgent: sheet.referral.urgency === 'urgent',
  }));
  const location = locations.find((l) => l.id === form.locationId) ?? locations[0];
  const zone = location?.timeZone ?? 'UTC';
  const request = useMemo(() => searchRequest(sheet.id, form, zone), [sheet.id, form, zone]);
  const search = useTimeFinder(request);
  const book = useBookProposal();
  const waitlist = useAddToWaitlist();
  const keys = useRef(new IdempotencyKeys());
  const [bookingIndex, setBookingIndex] = useState<number | null>(null);
  const [booked, setBooked] = useState<Appointment[] | null>(null);
  const [problem, setProblem] = useState<ChangeProblem | null>(null);
  const lookup = useMemo(() => makeLookup({ notation, locations, operators, timeZone: zone }), [notation, locations, operators, zone]);

  const tooth = (() => {
    try {
      return formatTooth(sheet.toothFdi, notation);
    } catch {
      return sheet.toothFdi;
    }
  })();
  const minutes = sheet.bookedMinutesPerVisit ?? sheet.estimate?.visits.map((v) => v.minutes) ?? [];
  const patch = (p: Partial<SearchForm>) => {
    setProblem(null);
    setForm((f) => ({ ...f, ...p }));
  };

  const onBook = async (p: TimeProposal, index: number) => {
    setProblem(null);
    setBookingIndex(index);
    try {
      const res = await book.mutateAsync({ body: { caseId: sheet.id, visits: p.visits }, idempotencyKey: keys.current.for(p) });
      setBooked(res.appointments);
      const first = res.appointments[0];
      notifications.show({
        color: 'lagoon',
        title: 'Booked',
        message: `${sheet.patient.name}: ${res.appointments.length === 1 ? 'one visit' : `${res.appointments.length} visits`}${first ? `, first on ${localDay(first.start, zone)} at ${localTime(first.start, zone)}` : ''}.`,
      });
    } catch (e) {
      setProblem(problemFrom(e, lookup));
    } finally {
      setBookingIndex(null);
    }
  };

  const first = booked?.[0];
  return (
    <>
      <PageHeader
        title={`Find times · ${sheet.patient.name} · tooth ${tooth}`}
        description={
          <>
            {PROCEDURE_LABELS[sheet.procedure]} · <Anchor component={Link} to={`/cases/${sheet.id}`} fz="sm">Case sheet</Anchor>
          </>
        }
      />
      <Stack gap="md">
        <Card padding="md">
          <Group gap="lg" align="flex-start" wrap="wrap">
            <Stack gap={4}>
              <Text fz="xs" c="dimmed" fw={600} tt="uppercase">
                Visit plan
              </Text>
              <Group gap="xs">
                {sheet.estimate && <DifficultyBadge level={sheet.estimate.level} />}
                {minutes.length === 0 ? (
                  <Text fz="sm" c="plum.8">
                    No chair-time estimate yet: save the case sheet first.
                  </Text>
                ) : (
                  minutes.map((m, i) => {
                    const v = sheet.estimate?.visits[i];
                    return (
                      <Text key={i} fz="sm">
                        Visit {i + 1}: {m} min
                        {v?.needsMicroscope && <IconMicroscope size={14} aria-label="needs a microscope" style={{ verticalAlign: '-2px', marginLeft: 4 }} />}
                        {i > 0 && v?.earliestDaysAfterPrevious !== undefined && ` (${v.earliestDaysAfterPrevious}–${v.latestDaysAfterPrevious ?? '…'} days later)`}
                      </Text>
                    );
                  })
                )}
              </Group>
            </Stack>
          </Group>
          <Group gap="md" mt="md" align="flex-end" wrap="wrap" role="group" aria-label="Patient preferences">
            <div>
              <Text fz="sm" fw={500} mb={4} id="weekday-label">
                Days
              </Text>
              <Chip.Group multiple value={form.weekdays.map(String)} onChange={(v) => patch({ weekdays: v.map(Number) })}>
                <Group gap={4} role="group" aria-labelledby="weekday-label">
                  {WEEKDAY_CHOICES.slice(0, 6).map((d) => (
                    <Chip key={d.value} value={String(d.value)} size="xs" aria-label={d.long}>
                      {d.short}
                    </Chip>
                  ))}
                </Group>
              </Chip.Group>
            </div>
            <SegmentedControl
              size="xs"
              aria-label="Part of day"
              value={form.partOfDay}
              onChange={(v) => patch({ partOfDay: v as SearchForm['partOfDay'] })}
              data={[
                { value: 'any', label: 'Any time' },
                { value: 'morning', label: 'Morning' },
                { value: 'afternoon', label: 'Afternoon' },
              ]}
            />
            <Select size="xs" label="Location" data={locations.map((l) => ({ value: String(l.id), label: l.name }))} value={form.locationId ? String(form.locationId) : null} onChange={(v) => patch({ locationId: v ? Number(v) : null })} placeholder="Any" clearable w={180} />
            <Select size="xs" label="Endodontist" data={operators.map((o) => ({ value: String(o.id), label: o.name }))} value={form.operatorId ? String(form.operatorId) : null} onChange={(v) => patch({ operatorId: v ? Number(v) : null })} placeholder="Any" clearable w={200} />
            <TextInput size="xs" type="date" label="Not before" value={form.earliest} onChange={(e) => patch({ earliest: e.currentTarget.value })} />
            <Checkbox size="xs" label="Urgent (may take emergency holds)" checked={form.urgent} onChange={(e) => patch({ urgent: e.currentTarget.checked })} />
          </Group>
        </Card>

        {booked && first && (
          <Alert color="lagoon" variant="light" icon={<IconCalendarCheck size={18} />} title="Booked" role="status">
            <Stack gap={4}>
              {booked.map((a, i) => (
                <Text key={a.id} fz="sm">
                  Visit {i + 1}: {localDay(a.start, zone)}, {localTime(a.start, zone)}–{localTime(a.end, zone)} · {lookup.chairs.get(a.chairId)?.name ?? ''}
                </Text>
              ))}
              <Group gap="sm">
                <Anchor component={Link} to={`/board?date=${localDate(first.start, zone)}&locationId=${first.locationId}`} fz="sm" fw={600}>
                  Open the Chair board on {localDay(first.start, zone)}
                </Anchor>
                <Button
                  size="compact-xs"
                  variant="subtle"
                  loading={waitlist.isPending}
                  disabled={waitlist.isSuccess}
                  onClick={() => waitlist.mutate({ caseId: sheet.id })}
                >
                  {waitlist.isSuccess ? 'On the waitlist' : 'Wants an earlier time: add to waitlist'}
                </Button>
              </Group>
            </Stack>
          </Alert>
        )}

        <ChangeProblemAlert problem={problem} onClose={() => setProblem(null)} />

        <section aria-label="Proposals">
          <Title order={3} fz="md" mb="xs">
            Proposals
          </Title>
          <QueryState query={search}>
            {(r) =>
              r.proposals.length === 0 ? (
                <Alert color="amber" variant="light" title="No time found" role="alert">
                  <Text fz="sm">{r.unplaceable?.reason ? `${r.unplaceable.reason.charAt(0).toUpperCase()}${r.unplaceable.reason.slice(1)}.` : 'Nothing fits inside the search horizon.'}</Text>
                  <Text fz="xs" c="dimmed" mt={4}>
                    Widen the days or the part of day, choose any endodontist or another location, or add the patient to the waitlist.
                  </Text>
                </Alert>
              ) : (
                <Stack gap="sm">
                  {r.proposals.map((p, i) => (
                    <ProposalCard
                      key={i}
                      proposal={p}
                      rank={i + 1}
                      lookup={lookup}
                      booking={bookingIndex === i}
                      disabled={booked !== null || (bookingIndex !== null && bookingIndex !== i)}
                      onBook={() => void onBook(p, i)}
                    />
                  ))}
                </Stack>
              )
            }
          </QueryState>
        </section>
      </Stack>
    </>
  );
}
