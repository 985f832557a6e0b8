import { Alert, Badge, Button, Card, Grid, Group, MultiSelect, NumberInput, Select, SimpleGrid, Stack, Switch, Table, TagsInput, Text, Title } from '@mantine/core';
import { useForm, type UseFormReturnType } from '@mantine/form';
import { notifications } from '@mantine/notifications';
import { LEVELS, PROCEDURES, TOOTH_GROUPS, type EstimateTable, type EstimateTableInfo, type Level } from '@ostium/shared';
import { IconDeviceFloppy } from '@tabler/icons-react';
import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { PageHeader } from '../../../components/page-header';
import { NotSavedAlert, SettingsSection as Section } from '../../../components/settings-section';
import { QueryState } from '../../../components/query-state';
import { ApiError } from '../../../lib/api-client';
import { usersQuery } from '../../users/api/users';
import { PROCEDURE_LABELS } from '../../case-sheet/case-sheet.util';
import { useEstimateTable, useSaveEstimateTable } from '../api/estimate-table';
import { NUMBER_RULES, serverFieldErrors, validateTable } from '../estimate-table.util';

type Form = UseFormReturnType<EstimateTable>;

const procedureOptions = PROCEDURES.map((p) => ({ value: p, label: PROCEDURE_LABELS[p] }));
const levelOptions = LEVELS.map((l) => ({ value: l, label: l[0]!.toUpperCase() + l.slice(1) }));
const GROUP_LABEL = { anterior: 'Anterior', premolar: 'Premolar', molar: 'Molar' } as const;
const when = (iso: string) => new Date(iso).toLocaleString([], { dateStyle: 'medium', timeStyle: 'short' });

/** Settings → Estimate table: every practice-editable number of the chair-time estimate; each save is a new version. */
export function EstimateTablePage() {
  const info = useEstimateTable();
  return (
    <>
      <PageHeader
        title="Estimate table"
        description="The minutes, multipliers and rules behind every chair-time estimate. Saving makes a new version; saved cases keep the version they were planned with."
      />
      <QueryState query={info}>{(i) => <TableEditor key={i.version} info={i} />}</QueryState>
    </>
  );
}

function NumField({ form, path, label, hiddenLabel = false, unit, step = 1, decimals = 0, w }: {
  form: Form;
  path: string;
  label: string;
  /** In the base grid the row and column headers show the name; assistive technology still gets it. */
  hiddenLabel?: boolean;
  unit?: string;
  step?: number;
  decimals?: number;
  w?: number;
}) {
  const rule = NUMBER_RULES[path];
  return (
    <NumberInput
      size="xs"
      w={w}
      label={hiddenLabel ? undefined : label}
      aria-label={hiddenLabel ? label : undefined}
      rightSection={unit ? <Text fz={10} c="dimmed">{unit}</Text> : undefined}
      rightSectionWidth={unit ? 34 : undefined}
      step={step}
      decimalScale={decimals || undefined}
      allowDecimal={decimals > 0}
      allowNegative={false}
      min={rule?.min}
      hideControls
      {...form.getInputProps(path)}
    />
  );
}


// Paths the grid shows a field for; a server error elsewhere goes in the banner.
const SECTION_ERRORS = ['tierMultiplier', 'interval', 'calibration', 'recall.months'];

function TableEditor({ info }: { info: EstimateTableInfo }) {
  const save = useSaveEstimateTable();
  const users = useQuery(usersQuery());
  const [otherErrors, setOtherErrors] = useState<string[]>([]);
  const form = useForm<EstimateTable>({
    initialValues: structuredClone(info.table),
    validate: (v) => validateTable(v),
  });
  const err = (p: string) => form.errors[p];

  const submit = form.onSubmit((values) => {
    setOtherErrors([]);
    save.mutate(values, {
      onSuccess: (next) => notifications.show({ color: 'lagoon', title: `Saved as version ${next.version}`, message: 'New estimates use it from now on.' }),
      onError: (e) => {
        if (!(e instanceof ApiError)) return;
        const byPath = serverFieldErrors(e.errors);
        const known = new Set([...Object.keys(NUMBER_RULES), ...SECTION_ERRORS]);
        form.setErrors(byPath);
        setOtherErrors(Object.entries(byPath).filter(([p]) => !known.has(p)).map(([p, m]) => `${p}: ${m}`));
      },
    });
  });

  const userName = (id: number | null) => (id === null ? 'built in' : (users.data?.find((u) => u.id === id)?.name ?? `user ${id}`));
  const saveError = save.error as Error | null;

  return (
    <form onSubmit={submit} noValidate>
      <Group justify="space-between" mb="md">
        <Group gap="xs">
          <Badge size="lg" variant="light">
            Version {info.version}
          </Badge>
          {info.createdAt && (
            <Text fz="xs" c="dimmed">
              saved {when(info.createdAt)} by {userName(info.createdBy)}
            </Text>
          )}
        </Group>
        <Group gap="xs">
          <Button variant="subtle" color="stone" onClick={() => form.reset()} disabled={!form.isDirty()}>
            Undo changes
          </Button>
          <Button type="submit" leftSection={<IconDeviceFloppy size={16} />} loading={save.isPending} disabled={!form.isDirty()}>
            Save as version {info.version + 1}
          </Button>
        </Group>
      </Group>
      {saveError && <NotSavedAlert message={saveError.message} details={otherErrors} />}
      {Object.keys(form.errors).length > 0 && !saveError && (
        <Alert color="red" variant="light" mb="md" role="alert">
          Some numbers need a look; they are marked below.
        </Alert>
      )}
      <Grid gap="md">
        <Grid.Col span={{ base: 12, lg: 8 }}>
          <Stack gap="md">
            <Section title="Base minutes" hint="Chair time of a low-difficulty case, by procedure and tooth group; extra canals beyond the covered count add their minutes.">
              <Table withTableBorder={false} aria-label="Base minutes">
                <Table.Thead>
                  <Table.Tr>
                    <Table.Th />
                    {TOOTH_GROUPS.map((g) => (
                      <Table.Th key={g}>{GROUP_LABEL[g]}</Table.Th>
                    ))}
                  </Table.Tr>
                </Table.Thead>
                <Table.Tbody>
                  {(
                    [
                      ['base.initial', 'Root canal therapy, retreatment', 'min'],
                      ['base.surgery', 'Apical surgery', 'min'],
                      ['canalsIncluded', 'Canals the base covers', ''],
                    ] as const
                  ).map(([prefix, label, unit]) => (
                    <Table.Tr key={prefix}>
                      <Table.Td fz="sm" fw={600}>
                        {label}
                      </Table.Td>
                      {TOOTH_GROUPS.map((g) => (
                        <Table.Td key={g}>
                          <NumField form={form} path={`${prefix}.${g}`} label={`${label}, ${GROUP_LABEL[g].toLowerCase()}`} hiddenLabel unit={unit || undefined} w={100} />
                        </Table.Td>
                      ))}
                    </Table.Tr>
                  ))}
                </Table.Tbody>
              </Table>
              <SimpleGrid cols={{ base: 2, sm: 3 }} mt="sm">
                <NumField form={form} path="base.consult" label="Consultation" unit="min" />
                <NumField form={form} path="base.emergency" label="Emergency visit" unit="min" />
                <NumField form={form} path="extraCanalMinutes" label="Each extra canal" unit="min" />
              </SimpleGrid>
            </Section>

            <Section title="Difficulty multipliers" hint="The base (with extra canals) is scaled by the case's level." error={err('tierMultiplier')}>
              <SimpleGrid cols={3}>
                {LEVELS.map((l) => (
                  <NumField key={l} form={form} path={`tierMultiplier.${l}`} label={levelOptions.find((o) => o.value === l)!.label} unit="×" step={0.05} decimals={3} />
                ))}
              </SimpleGrid>
            </Section>

            <Section title="Add-ons" hint="Minutes added after the multiplier.">
              <SimpleGrid cols={{ base: 2, sm: 3 }}>
                <NumField form={form} path="addOns.retreatmentRemovalMinutes" label="Removing the earlier filling" unit="min" />
                <NumField form={form} path="addOns.calcifiedCanalMinutes" label="Each calcified canal" unit="min" />
                <NumField form={form} path="addOns.calcifiedCanalMaxMinutes" label="Calcified canals, at most" unit="min" />
                <NumField form={form} path="addOns.complicationMinutes" label="Ledge, perforation or separated instrument" unit="min" />
                <NumField form={form} path="addOns.limitedOpeningMinutes" label="Limited mouth opening" unit="min" />
                <NumField form={form} path="addOns.severeCurvatureMinutes" label="Severe curvature" unit="min" />
                <NumField form={form} path="addOns.patientManagementMinutes" label="Anxious or medically complex patient" unit="min" />
              </SimpleGrid>
            </Section>

            <Section title="Rules" hint="When a plan takes two visits and when it books a microscope.">
              <SimpleGrid cols={{ base: 1, sm: 2 }}>
                <MultiSelect size="xs" label="Always two visits for" data={procedureOptions} {...form.getInputProps('twoVisit.procedures')} />
                <MultiSelect size="xs" label="Two visits at difficulty" data={levelOptions} {...form.getInputProps('twoVisit.levels')} />
                <MultiSelect size="xs" label="Microscope at difficulty" data={levelOptions} {...form.getInputProps('microscope.levels')} />
                <MultiSelect size="xs" label="Microscope for" data={procedureOptions} {...form.getInputProps('microscope.procedures')} />
                <MultiSelect size="xs" label="Never a microscope for" data={procedureOptions} {...form.getInputProps('microscope.exemptProcedures')} />
                <MultiSelect size="xs" label="Scaled by difficulty" data={procedureOptions} {...form.getInputProps('tierProcedures')} />
                <Switch size="xs" mt="sm" label="Microscope for calcified canals" {...form.getInputProps('microscope.calcifiedCanals', { type: 'checkbox' })} />
                <Switch size="xs" mt="sm" label="Microscope for every upper molar" {...form.getInputProps('microscope.maxillaryMolars', { type: 'checkbox' })} />
                <TagsInput
                  size="xs"
                  label="Recall reviews, months after completion"
                  value={form.values.recall.months.map(String)}
                  onChange={(v) => form.setFieldValue('recall.months', v.map((x) => Number(x.trim())).filter((n) => !Number.isNaN(n)))}
                  error={err('recall.months')}
                />
              </SimpleGrid>
            </Section>
          </Stack>
        </Grid.Col>

        <Grid.Col span={{ base: 12, lg: 4 }}>
          <Stack gap="md">
            <Section title="Booking" hint="Every visit is a multiple of the grid; longer plans split into visits." error={err('interval')}>
              <SimpleGrid cols={2}>
                <NumField form={form} path="gridMinutes" label="Booking grid" unit="min" />
                <NumField form={form} path="longestVisitMinutes" label="Longest visit" unit="min" />
                <NumField form={form} path="turnoverMinutes" label="Turnover after a visit" unit="min" />
                <NumField form={form} path="twoVisit.addedVisitSetupMinutes" label="Set-up per added visit" unit="min" />
                <NumField form={form} path="interval.minDays" label="Between visits, at least" unit="days" />
                <NumField form={form} path="interval.maxDays" label="Between visits, at most" unit="days" />
              </SimpleGrid>
            </Section>

            <Section title="Level thresholds" hint="Where a measured fact moves its factor's level.">
              <SimpleGrid cols={2}>
                <NumField form={form} path="thresholds.curvatureModerateFromDegrees" label="Curvature moderate from" unit="°" />
                <NumField form={form} path="thresholds.curvatureHighAboveDegrees" label="Curvature high above" unit="°" />
                <NumField form={form} path="thresholds.apicalOpeningModerateFromMm" label="Apical opening moderate from" unit="mm" step={0.1} decimals={2} />
                <NumField form={form} path="thresholds.apicalOpeningHighAboveMm" label="Apical opening high above" unit="mm" step={0.1} decimals={2} />
                <NumField form={form} path="thresholds.toothLengthHighAboveMm" label="Tooth length high above" unit="mm" step={0.5} decimals={1} />
                <Select size="xs" label="ASA class II counts as" data={levelOptions} allowDeselect={false} {...form.getInputProps('asaClassTwoLevel')} onChange={(v) => v && form.setFieldValue('asaClassTwoLevel', v as Level)} />
              </SimpleGrid>
            </Section>

            <Section title="Calibration" hint="How completed visits adjust the estimate." error={err('calibration')}>
              <SimpleGrid cols={2}>
                <NumField form={form} path="calibration.bookingQuantile" label="Booking quantile" step={0.05} decimals={2} />
                <NumField form={form} path="calibration.bandCoverage" label="Band coverage" step={0.05} decimals={2} />
                <NumField form={form} path="calibration.cellPseudoVisits" label="Cell pseudo-visits" decimals={1} />
                <NumField form={form} path="calibration.operatorPseudoVisits" label="Operator pseudo-visits" decimals={1} />
                <NumField form={form} path="calibration.minVisitsForBand" label="Visits before a band" />
                <NumField form={form} path="calibration.ratioClip" label="Ratio clip" unit="×" step={0.5} decimals={2} />
              </SimpleGrid>
            </Section>

            <Card p="md" component="section" aria-label="Version history">
              <Title order={3} fz="sm" mb="xs">
                Version history
              </Title>
              {info.versions.length === 0 ? (
                <Text fz="sm" c="dimmed">
                  Version 1 is the built-in table; no version has been saved yet.
                </Text>
              ) : (
                <Table aria-label="Versions">
                  <Table.Tbody>
                    {info.versions.map((v) => (
                      <Table.Tr key={v.version}>
                        <Table.Td fw={600}>
                          v{v.version}
                          {v.version === info.version && (
                            <Badge size="xs" ml={6}>
                              current
                            </Badge>
                          )}
                        </Table.Td>
                        <Table.Td fz="xs">{when(v.createdAt)}</Table.Td>
                        <Table.Td fz="xs">{userName(v.createdBy)}</Table.Td>
                      </Table.Tr>
                    ))}
                  </Table.Tbody>
                </Table>
              )}
              <Text fz="xs" c="dimmed" mt="xs">
                Tray templates are kept as they are with each version.
              </Text>
            </Card>
          </Stack>
        </Grid.Col>
      </Grid>
    </form>
  );
}
