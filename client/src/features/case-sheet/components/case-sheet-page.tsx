import { Alert, Anchor, Badge, Button, Card, Center, Grid, Group, Loader, NumberInput, Select, Stack, Text, Timeline, Title } from '@mantine/core';
import { notifications } from '@mantine/notifications';
import { can, formatTooth, PROCEDURES, type CaseSheet, type FactorDefinition, type Procedure } from '@ostium/shared';
import { IconAdjustments, IconDeviceFloppy } from '@tabler/icons-react';
import { useQuery } from '@tanstack/react-query';
import { useMemo, useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { EmptyState } from '../../../components/empty-state';
import { QueryState } from '../../../components/query-state';
import { ApiError } from '../../../lib/api-client';
import { useSession } from '../../auth/use-session';
import { usePractice } from '../../practice/api/practice';
import { usersQuery } from '../../users/api/users';
import { useCaseSheet, useUpdateCaseSheet } from '../api/case-sheet';
import { useEstimatePreview, useFactors } from '../api/estimates';
import { draftErrors, draftFromCase, patchBody, previewRequest, PROCEDURE_LABELS, toothName, type SheetDraft } from '../case-sheet.util';
import { AssessmentPanel } from './assessment-panel';
import { CompletionCard } from './completion-card';
import { EstimateCard } from './estimate-card';
import { OverrideEditor } from './override-editor';
import { FindTimesButton } from '../../time-finder/components/find-times-button';

/** A sheet is saved as planned only before booking; closed cases are read-only (the server refuses changes). */
const BEFORE_BOOKING: string[] = ['received', 'triaged', 'planned'];
const CLOSED_STATUSES: string[] = ['completed', 'report_sent', 'declined', 'cancelled'];

const procedureOptions = PROCEDURES.map((p) => ({ value: p, label: PROCEDURE_LABELS[p] }));
const date = (iso: string) => new Date(iso.length === 10 ? `${iso}T00:00:00` : iso).toLocaleDateString([], { dateStyle: 'medium' });
const when = (iso: string) => new Date(iso).toLocaleString([], { dateStyle: 'medium', timeStyle: 'short' });

/** /cases/:id — one tooth's assessment and its chair-time estimate, previewed live as the assessment changes. */
export function CaseSheetPage() {
  const { id } = useParams();
  const caseId = Number(id);
  if (!Number.isInteger(caseId) || caseId <= 0) {
    return <EmptyState title="No such case" hint="Open the case sheet from a referral in the referral queue." />;
  }
  return <CaseSheetLoader caseId={caseId} />;
}

function CaseSheetLoader({ caseId }: { caseId: number }) {
  const sheet = useCaseSheet(caseId);
  const factors = useFactors();
  return (
    <QueryState query={sheet}>
      {(s) => <QueryState query={factors}>{(f) => <CaseSheetEditor key={s.id} sheet={s} factors={f} />}</QueryState>}
    </QueryState>
  );
}

function fieldErrors(e: unknown): Record<string, string> {
  return e instanceof ApiError ? Object.fromEntries(e.errors.map((x) => [x.field, x.message])) : {};
}

function CaseSheetEditor({ sheet, factors }: { sheet: CaseSheet; factors: FactorDefinition[] }) {
  const role = useSession()?.user.role;
  const mayAdjust = can(role, 'casesAdjust');
  const mayComplete = can(role, 'completionReport');
  // Once visits are under way, finishing is what the endodontist came for: the card goes first.
  const finishing = ['booked', 'in_treatment', 'completed', 'report_sent'].includes(sheet.status);
  const notation = usePractice().data?.settings.toothNotation ?? 'fdi';
  const operators = useQuery({ ...usersQuery('endodontist'), enabled: can(role, 'cases') });
  const save = useUpdateCaseSheet(sheet.id);

  const [draft, setDraftState] = useState<SheetDraft>(() => draftFromCase(sheet));
  const [editing, setEditing] = useState(false);
  // A change answers the last failed save, so its field errors go.
  const setDraft = (next: SheetDraft | ((d: SheetDraft) => SheetDraft)) => {
    if (save.isError) save.reset();
    setDraftState(next);
  };
  const update = (patch: Partial<SheetDraft>) => setDraft((d) => ({ ...d, ...patch }));

  const shownTooth = formatTooth(sheet.toothFdi, notation);
  const name = toothName(sheet.toothFdi);
  const usualCanals = sheet.estimate?.canalsAssumed ? sheet.estimate.canals : undefined;
  const localErrors = draftErrors(draft, draft.canals ?? usualCanals);
  const valid = Object.keys(localErrors).length === 0;

  // Memoised on the draft so the debounce timer only restarts when an input really changed.
  const request = useMemo(() => (valid ? previewRequest(sheet.toothFdi, draft) : null), [valid, sheet.toothFdi, draft]);
  const preview = useEstimatePreview(request);
  const result = preview.data ?? sheet.estimate;
  const errors = { ...fieldErrors(preview.error), ...fieldErrors(save.error), ...localErrors };

  const booked =
    draft.override !== undefined
      ? draft.override
      : sheet.override
        ? { minutesPerVisit: sheet.override.minutesPerVisit, reason: sheet.override.reason, saved: { byName: sheet.override.byName, at: sheet.override.at } }
        : null;

  const dirty = JSON.stringify(patchBody(draft, mayAdjust)) !== JSON.stringify(patchBody(draftFromCase(sheet), mayAdjust));

  const onSave = () =>
    save.mutate(patchBody(draft, mayAdjust), {
      onSuccess: (s) => {
        setDraftState(draftFromCase(s));
        setEditing(false);
        const total = s.bookedMinutesPerVisit?.reduce((a, b) => a + b, 0);
        notifications.show({
          color: 'lagoon',
          title: 'Case planned',
          message: s.bookedMinutesPerVisit ? `${s.bookedMinutesPerVisit.length} visit${s.bookedMinutesPerVisit.length === 1 ? '' : 's'}, ${total} min booked` : 'The assessment is saved.',
        });
      },
    });

  const saveError = save.error instanceof ApiError ? save.error : (save.error as Error | null);

  return (
    <>
      <Group justify="space-between" align="flex-end" mb="md" wrap="wrap">
        <Stack gap={2}>
          <Text fz="xs" c="dimmed" fw={600} tt="uppercase" style={{ letterSpacing: '0.06em' }}>
            Case sheet
          </Text>
          <Title order={2} fz={24}>
            {sheet.patient.name} · tooth {shownTooth}
            {notation !== 'fdi' && (
              <Text span fz="sm" c="dimmed" fw={500} ml={8}>
                FDI {sheet.toothFdi}
              </Text>
            )}
          </Title>
          <Text fz="sm" c="dimmed">
            {name} · {PROCEDURE_LABELS[draft.procedure]} · born {date(sheet.patient.dateOfBirth)} ·{' '}
            <Anchor component={Link} to={`/referrals/${sheet.referralId}`} fz="sm">
              Referral #{sheet.referralId}
            </Anchor>{' '}
            received {date(sheet.referral.receivedOn)}
          </Text>
        </Stack>
        <Group gap="sm">
          <Badge color="stone" variant="light">
            {sheet.status.replace(/_/g, ' ')}
          </Badge>
          {sheet.referral.urgency !== 'routine' && <Badge color={sheet.referral.urgency === 'urgent' ? 'red' : 'amber'}>{sheet.referral.urgency}</Badge>}
          {dirty && (
            <Text fz="xs" c="amber.9" fw={600}>
              Unsaved changes
            </Text>
          )}
          {!CLOSED_STATUSES.includes(sheet.status) && (
            <Button leftSection={<IconDeviceFloppy size={16} />} onClick={onSave} loading={save.isPending} disabled={!valid}>
              {BEFORE_BOOKING.includes(sheet.status) ? 'Save and mark planned' : 'Save'}
            </Button>
          )}
          {sheet.estimate && !dirty && ['planned', 'triaged', 'received'].includes(sheet.status) && <FindTimesButton caseId={sheet.id} variant="light" />}
        </Group>
      </Group>

      {saveError && (
        <Alert color="red" variant="light" mb="md" title="Not saved" role="alert">
          {saveError.message}
        </Alert>
      )}

      <Grid gap="lg">
        <Grid.Col span={{ base: 12, lg: 7 }}>
          <Stack gap="md">
            {mayComplete && finishing && <CompletionCard caseId={sheet.id} />}
            <Card p="md" component="section" aria-label="Procedure">
              <Group gap="md" align="flex-start" wrap="wrap">
                <Select
                  label="Procedure"
                  w={220}
                  data={procedureOptions}
                  allowDeselect={false}
                  value={draft.procedure}
                  onChange={(v) => v && update({ procedure: v as Procedure })}
                  error={errors.procedure}
                />
                <NumberInput
                  label="Canals"
                  w={130}
                  min={1}
                  max={8}
                  allowDecimal={false}
                  placeholder={result?.canalsAssumed ? `usual ${result.canals}` : 'usual count'}
                  description={draft.canals === null ? 'blank: the usual count' : undefined}
                  value={draft.canals ?? ''}
                  onChange={(v) => update({ canals: typeof v === 'number' ? v : null })}
                  error={errors.canals}
                />
                <Select
                  label="Treating endodontist"
                  w={240}
                  clearable
                  placeholder="Not chosen yet"
                  data={(operators.data ?? []).filter((u) => u.active || u.id === draft.operatorId).map((u) => ({ value: String(u.id), label: u.name }))}
                  value={draft.operatorId === null ? null : String(draft.operatorId)}
                  onChange={(v) => update({ operatorId: v ? Number(v) : null })}
                  description="Their learned pace adjusts the estimate."
                  error={errors.operatorId}
                />
              </Group>
              {sheet.referral.reason && (
                <Text fz="sm" mt="sm">
                  <Text span fw={600} fz="sm">
                    Reason for referral:
                  </Text>{' '}
                  {sheet.referral.reason}
                </Text>
              )}
            </Card>
            <AssessmentPanel
              factors={factors}
              draft={draft}
              result={result}
              toothShown={shownTooth}
              errors={errors}
              canals={draft.canals ?? result?.canals}
              onLevel={(key, level) => setDraft((d) => ({ ...d, assessment: { ...d.assessment, [key]: level } }))}
              onFacts={(facts) => update({ facts })}
            />
            {mayComplete && !finishing && <CompletionCard caseId={sheet.id} />}
          </Stack>
        </Grid.Col>
        <Grid.Col span={{ base: 12, lg: 5 }}>
          {/* The estimate stays in view while the assessment scrolls; it scrolls on its own when taller than the window. */}
          <Stack gap="md" style={{ position: 'sticky', top: 72, maxHeight: 'calc(100vh - 88px)', overflowY: 'auto' }}>
            {preview.isError && (
              <Alert color="red" variant="light" title="No estimate for these inputs" role="alert">
                {(preview.error as Error).message}
              </Alert>
            )}
            {mayAdjust && editing && result && (
              <OverrideEditor
                visits={result.visits}
                initialMinutes={booked?.minutesPerVisit ?? result.visits.map((v) => v.minutes)}
                initialReason={booked?.reason ?? ''}
                serverErrors={errors}
                onCancel={() => setEditing(false)}
                onApply={(o) => {
                  update({ override: o });
                  setEditing(false);
                }}
              />
            )}
            {result ? (
              <EstimateCard
                result={result}
                factors={factors}
                booked={booked}
                updating={preview.isFetching || preview.settling}
                toothName={name}
                adjust={
                  mayAdjust && (
                    <Group gap="xs">
                      {booked && (
                        <Button size="compact-xs" variant="subtle" color="stone" onClick={() => update({ override: null })}>
                          Remove adjustment
                        </Button>
                      )}
                      <Button size="compact-xs" variant="light" leftSection={<IconAdjustments size={14} />} onClick={() => setEditing(true)} disabled={editing}>
                        Adjust minutes
                      </Button>
                    </Group>
                  )
                }
              />
            ) : (
              !preview.isError && (
                <Card>
                  <Center py="xl">
                    <Loader size="sm" aria-label="Estimating" />
                  </Center>
                </Card>
              )
            )}
            {sheet.history.length > 0 && (
              <Card p="md" component="section" aria-label="Changes">
                <Title order={4} fz="sm" mb="xs">
                  Changes
                </Title>
                <Timeline bulletSize={10} lineWidth={2}>
                  {sheet.history.slice(0, 8).map((h, i) => (
                    <Timeline.Item key={i} title={<Text fz="xs" fw={600}>{when(h.at)} · {h.byName ?? 'system'}</Text>}>
                      <Text fz="xs" c="dimmed">
                        {h.fields.join(', ')}
                      </Text>
                    </Timeline.Item>
                  ))}
                </Timeline>
              </Card>
            )}
          </Stack>
        </Grid.Col>
      </Grid>
    </>
  );
}
