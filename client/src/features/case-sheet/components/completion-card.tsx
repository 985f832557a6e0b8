import { Alert, Anchor, Badge, Button, Card, Checkbox, Group, List, Stack, TagsInput, Text, Textarea, Title } from '@mantine/core';
import { notifications } from '@mantine/notifications';
import type { CaseCompletionView, LetterSummary } from '@ostium/shared';
import { IconCircleCheck, IconFileTypePdf, IconFlagCheck } from '@tabler/icons-react';
import { DateTime } from 'luxon';
import { useState } from 'react';
import { QueryState } from '../../../components/query-state';
import { ApiError } from '../../../lib/api-client';
import { openLetterPdf, useCompleteCase, useCompletion } from '../api/completion';

const FINDINGS_MAX = 4000;
const day = (isoDate: string) => DateTime.fromISO(isoDate).toFormat('ccc d LLL yyyy');

const LETTER_WORDS: Record<LetterSummary['status'], { label: string; color: string }> = {
  queued: { label: 'Queued', color: 'amber' },
  sent: { label: 'Sent', color: 'lagoon' },
  failed: { label: 'Failed', color: 'red' },
  skipped: { label: 'Skipped', color: 'stone' },
};

/** A report that is on its way or has gone fixes what was saved; otherwise it may be changed and sent again. */
const reportFixed = (v: CaseCompletionView) => ['queued', 'sent'].includes(v.completion?.report?.status ?? '');

/** Case sheet card for the endodontist: findings, recall plan and the completion report to the referring dentist. */
export function CompletionCard({ caseId }: { caseId: number }) {
  const completion = useCompletion(caseId);
  return (
    <Card p="md" component="section" aria-label="Finish treatment">
      <Group gap={6} mb="xs">
        <IconFlagCheck size={18} color="var(--mantine-color-lagoon-8)" />
        <Title order={3} fz="md">
          Finish treatment
        </Title>
      </Group>
      <QueryState query={completion}>{(v) => <CompletionBody key={v.completion?.completedAt ?? 'new'} caseId={caseId} v={v} />}</QueryState>
    </Card>
  );
}

function ReportState({ report, zone }: { report: LetterSummary; zone: string }) {
  const [opening, setOpening] = useState(false);
  const w = LETTER_WORDS[report.status];
  const when = DateTime.fromISO(report.sentAt ?? report.at, { zone }).toFormat('d LLL yyyy, HH:mm');
  return (
    <Stack gap={4} data-testid="report-state">
      <Group gap="xs">
        <Text fz="sm" fw={600}>
          Completion report
        </Text>
        <Badge color={w.color} size="sm" style={{ textTransform: 'none' }}>
          {w.label}
        </Badge>
      </Group>
      <Text fz="xs" c="dimmed">
        to {report.to} · {when}
        {report.detail ? ` · ${report.detail}` : ''}
      </Text>
      <Anchor
        component="button"
        type="button"
        fz="sm"
        onClick={async () => {
          setOpening(true);
          try {
            await openLetterPdf(report.id);
          } catch (e) {
            notifications.show({ color: 'red', title: 'Could not open the report', message: (e as Error).message });
          } finally {
            setOpening(false);
          }
        }}
        style={{ display: 'inline-flex', alignItems: 'center', gap: 4 }}
        disabled={opening}
      >
        <IconFileTypePdf size={14} /> {opening ? 'Opening…' : 'Open the report (PDF)'}
      </Anchor>
    </Stack>
  );
}

function CompletionBody({ caseId, v }: { caseId: number; v: CaseCompletionView }) {
  const done = v.completion;
  const fixed = reportFixed(v);
  const canSubmit = v.canComplete || (!!done && !fixed && !['declined', 'cancelled'].includes(v.caseStatus));
  const [editing, setEditing] = useState(!done);
  const [findings, setFindings] = useState(done?.findings ?? '');
  const [recall, setRecall] = useState<string[]>((done ? done.recallPlan.map((r) => r.months) : v.defaultRecallPlan).map(String));
  const [sendReport, setSendReport] = useState(true);
  const [missing, setMissing] = useState(false);
  const complete = useCompleteCase(caseId);
  const err = complete.error instanceof ApiError ? complete.error : null;

  const lastVisit = v.visits.at(-1)?.date ?? null;
  const months = recall.map((x) => Number(x.trim())).filter((n) => Number.isInteger(n));
  const badRecall = recall.filter((x) => !/^\d+$/.test(x.trim()) || Number(x) < 1 || Number(x) > 120);

  const submit = () => {
    if (!findings.trim()) return setMissing(true);
    complete.mutate(
      { findings: findings.trim(), recallPlan: [...new Set(months)].sort((a, b) => a - b), sendReport },
      {
        onSuccess: (next) => {
          setEditing(false);
          notifications.show({
            color: 'lagoon',
            title: 'Treatment finished',
            message: next.completion?.report ? 'The completion report is on its way to the referring dentist.' : 'Saved; no report was sent.',
          });
        },
      },
    );
  };

  return (
    <Stack gap="sm">
      {v.visits.length > 0 && (
        <div>
          <Text fz="xs" fw={700} c="stone.6" tt="uppercase" style={{ letterSpacing: '0.05em' }}>
            Visits done
          </Text>
          <List size="sm" spacing={2} aria-label="Visits done">
            {v.visits.map((x) => (
              <List.Item key={x.appointmentId}>
                {day(x.date)}, {x.startTime}–{x.endTime} · {x.endodontist} · {x.locationName}
              </List.Item>
            ))}
          </List>
        </div>
      )}

      {done && (
        <Stack gap={6}>
          <Group gap={6}>
            <IconCircleCheck size={16} color="var(--mantine-color-lagoon-7)" />
            <Text fz="sm">
              Treatment ended {day(done.treatmentEndedOn)}; completed {DateTime.fromISO(done.completedAt, { zone: v.timeZone }).toFormat('d LLL yyyy')}
              {done.completedBy ? ` by ${done.completedBy}` : ''}.
            </Text>
          </Group>
          {!editing && (
            <>
              <Text fz="sm" style={{ whiteSpace: 'pre-wrap' }} data-testid="saved-findings">
                {done.findings}
              </Text>
              <Text fz="sm">
                <b>Recall:</b> {done.recallPlan.length ? done.recallPlan.map((r) => `${r.months} months (${day(r.dueOn)})`).join(', ') : 'none planned'}
              </Text>
            </>
          )}
          {done.report ? (
            <ReportState report={done.report} zone={v.timeZone} />
          ) : (
            !editing && (
              <Text fz="sm" c="dimmed">
                No report was sent to the referring dentist.
              </Text>
            )
          )}
          {!editing && canSubmit && (
            <Button size="compact-sm" variant="light" onClick={() => setEditing(true)} style={{ alignSelf: 'flex-start' }}>
              Change and send the report
            </Button>
          )}
        </Stack>
      )}

      {editing && (
        <>
          {!canSubmit && v.blockedBy && (
            <Alert color="amber" variant="light" p="xs" title="Not yet" role="status">
              <Text fz="sm">{v.blockedBy}</Text>
              {v.openVisits.length > 0 && (
                <List size="sm" mt={4}>
                  {v.openVisits.map((o) => (
                    <List.Item key={o.appointmentId}>{o.description}</List.Item>
                  ))}
                </List>
              )}
            </Alert>
          )}
          <Textarea
            label="Findings for the referring dentist"
            description="What was done and found, in your words; the report adds the tooth, procedure and visit dates."
            withAsterisk
            rows={5}
            maxLength={FINDINGS_MAX}
            value={findings}
            disabled={!canSubmit}
            onChange={(e) => {
              setFindings(e.currentTarget.value);
              setMissing(false);
            }}
            error={(missing && !findings.trim() ? 'Write the findings' : undefined) ?? err?.field('findings')}
          />
          <Text fz={11} c="dimmed" ta="right" mt={-6}>
            {findings.length} / {FINDINGS_MAX}
          </Text>
          <TagsInput
            label="Recall plan, months after treatment"
            description={lastVisit && months.length ? `Reviews due ${months.map((m) => DateTime.fromISO(lastVisit).plus({ months: m }).toFormat('d LLL yyyy')).join(', ')}` : 'Type a number of months and press Enter'}
            value={recall}
            onChange={setRecall}
            disabled={!canSubmit}
            maxTags={6}
            error={badRecall.length ? `Whole months from 1 to 120: ${badRecall.join(', ')}` : err?.field('recallPlan')}
          />
          <Checkbox label="Send the report to the referring dentist" checked={sendReport} onChange={(e) => setSendReport(e.currentTarget.checked)} disabled={!canSubmit} />
          {complete.isError && (!err || err.errors.every((e) => !['findings', 'recallPlan'].includes(e.field))) && (
            <Alert color="red" variant="light" p="xs" role="alert" title="Not finished">
              {(complete.error as Error).message}
            </Alert>
          )}
          <Group justify="flex-end" gap="xs">
            {done && (
              <Button variant="subtle" color="stone" onClick={() => setEditing(false)}>
                Keep as is
              </Button>
            )}
            <Button leftSection={<IconFlagCheck size={16} />} onClick={submit} loading={complete.isPending} disabled={!canSubmit || badRecall.length > 0}>
              {sendReport ? 'Finish and send the report' : 'Finish treatment'}
            </Button>
          </Group>
        </>
      )}
    </Stack>
  );
}
