import { Card, Checkbox, Group, NumberInput, Stack, Text, Title } from '@mantine/core';
import { COMPLICATIONS, type EstimateFacts, type EstimateResult, type FactorDefinition, type FactorKey, type Level } from '@ostium/shared';
import { useId, type ReactNode } from 'react';
import { COMPLICATION_LABELS, groupFactors, INPUT_LIMITS, rowState, type SheetDraft } from '../case-sheet.util';
import { LevelChoice } from './level-choice';

export interface AssessmentPanelProps {
  factors: FactorDefinition[];
  draft: SheetDraft;
  result: EstimateResult | null | undefined;
  /** The tooth as the practice writes it, for "from tooth 19". */
  toothShown: string;
  /** Field problems, keyed like the server's (`facts.curvatureDegrees`, `assessment.isolation`). */
  errors: Record<string, string>;
  onLevel: (key: FactorKey, level: Level) => void;
  onFacts: (facts: EstimateFacts) => void;
  /** Canal count in effect (entered or usual), the ceiling of the calcified count. */
  canals: number | undefined;
}

const num = (v: number | string) => (typeof v === 'number' ? v : undefined);

/** A measured fact on one line with its row: a short visible word, the full name for assistive technology. */
function FactNumber({
  shown,
  name,
  unit,
  placeholder,
  limits,
  step = 1,
  decimals = 0,
  value,
  onChange,
  error,
}: {
  shown: string;
  name: string;
  unit?: string;
  placeholder?: string;
  limits: { min: number; max: number; integer: boolean };
  step?: number;
  decimals?: number;
  value: number | undefined;
  onChange: (v: number | undefined) => void;
  error?: string;
}) {
  return (
    <Group gap={6} wrap="nowrap" align="flex-start">
      <Text fz="xs" fw={600} c="stone.7" pt={6} aria-hidden="true" w={62} ta="right">
        {shown}
      </Text>
      <NumberInput
        size="xs"
        w={104}
        aria-label={name}
        placeholder={placeholder}
        min={limits.min}
        max={limits.max}
        step={step}
        allowDecimal={!limits.integer}
        decimalScale={decimals || undefined}
        rightSection={unit ? <Text fz={10} c="dimmed">{unit}</Text> : undefined}
        rightSectionWidth={unit ? 38 : undefined}
        hideControls
        value={value ?? ''}
        onChange={(v) => onChange(num(v))}
        error={error}
      />
    </Group>
  );
}

/** The assessment as grouped rows: the three choices, the measured facts that set a row, and what the level means. */
export function AssessmentPanel({ factors, draft, result, toothShown, errors, onLevel, onFacts, canals }: AssessmentPanelProps) {
  const facts = draft.facts;
  const setFact = <K extends keyof EstimateFacts>(k: K, v: EstimateFacts[K]) => onFacts({ ...facts, [k]: v });

  // The measured facts sit in the row they set; a fact, once given, decides the row's level.
  const factInputs: Partial<Record<FactorKey, ReactNode>> = {
    medicalHistory: (
      <FactNumber
        shown="ASA class"
        name="ASA class"
        placeholder="1–6"
        limits={INPUT_LIMITS.asaClass}
        value={facts.asaClass}
        onChange={(v) => setFact('asaClass', v)}
        error={errors['facts.asaClass']}
      />
    ),
    emergency: (
      <Checkbox size="xs" pt={6} label="Acute abscess or swelling" checked={!!facts.acuteAbscess} onChange={(e) => setFact('acuteAbscess', e.currentTarget.checked || undefined)} />
    ),
    canalMorphology: (
      <Stack gap={6}>
        <FactNumber
          shown="Curvature"
          name="Curvature in degrees"
          unit="°"
          placeholder="—"
          limits={INPUT_LIMITS.curvatureDegrees}
          value={facts.curvatureDegrees}
          onChange={(v) => setFact('curvatureDegrees', v)}
          error={errors['facts.curvatureDegrees']}
        />
        <Checkbox size="xs" label="S-shaped canal" checked={!!facts.sShapedCanal} onChange={(e) => setFact('sShapedCanal', e.currentTarget.checked || undefined)} />
      </Stack>
    ),
    canalVisibility: (
      <FactNumber
        shown="Calcified"
        name="Calcified canals"
        unit="canals"
        placeholder="0"
        limits={{ ...INPUT_LIMITS.calcifiedCanals, max: canals ?? INPUT_LIMITS.calcifiedCanals.max }}
        value={facts.calcifiedCanals}
        onChange={(v) => setFact('calcifiedCanals', v)}
        error={errors['facts.calcifiedCanals']}
      />
    ),
    apicalOpening: (
      <FactNumber
        shown="Measured"
        name="Apical opening in mm"
        unit="mm"
        placeholder="—"
        step={0.1}
        decimals={2}
        limits={INPUT_LIMITS.apicalOpeningMm}
        value={facts.apicalOpeningMm}
        onChange={(v) => setFact('apicalOpeningMm', v)}
        error={errors['facts.apicalOpeningMm']}
      />
    ),
    toothLength: (
      <FactNumber
        shown="Measured"
        name="Tooth length in mm"
        unit="mm"
        placeholder="—"
        step={0.5}
        decimals={1}
        limits={INPUT_LIMITS.toothLengthMm}
        value={facts.toothLengthMm}
        onChange={(v) => setFact('toothLengthMm', v)}
        error={errors['facts.toothLengthMm']}
      />
    ),
    previousTreatment: (
      <Checkbox.Group
        size="xs"
        label="Complications"
        value={facts.complications ?? []}
        onChange={(v) => setFact('complications', v.length ? COMPLICATIONS.filter((c) => v.includes(c)) : undefined)}
      >
        <Stack gap={4} mt={4}>
          {COMPLICATIONS.map((c) => (
            <Checkbox key={c} size="xs" value={c} label={COMPLICATION_LABELS[c]} />
          ))}
        </Stack>
      </Checkbox.Group>
    ),
  };

  return (
    <Stack gap="md">
      {groupFactors(factors).map((g) => (
        <Card key={g.group} p="md" component="section" aria-label={g.label}>
          <Title order={4} fz="sm" tt="uppercase" c="stone.7" mb="xs" style={{ letterSpacing: '0.06em' }}>
            {g.label}
          </Title>
          <Stack gap={0}>
            {g.factors.map((def, i) => (
              <FactorRow
                key={def.key}
                def={def}
                first={i === 0}
                state={rowState(def, draft, result, toothShown)}
                onLevel={(l) => onLevel(def.key, l)}
                fact={factInputs[def.key]}
                error={errors[`assessment.${def.key}`]}
              />
            ))}
          </Stack>
        </Card>
      ))}
    </Stack>
  );
}

function FactorRow({
  def,
  first,
  state,
  onLevel,
  fact,
  error,
}: {
  def: FactorDefinition;
  first: boolean;
  state: ReturnType<typeof rowState>;
  onLevel: (l: Level) => void;
  fact?: ReactNode;
  error?: string;
}) {
  const labelId = useId();
  return (
    <Group
      align="flex-start"
      gap="md"
      py={8}
      wrap="wrap"
      data-factor={def.key}
      style={first ? undefined : { borderTop: '1px solid var(--mantine-color-stone-1)' }}
    >
      <Text id={labelId} fz="sm" fw={600} w={160} pt={4}>
        {def.label}
      </Text>
      <Group gap="md" align="flex-start" wrap="wrap" style={{ flex: '1 1 300px', minWidth: 0 }}>
        <div style={{ flex: '1 1 250px', minWidth: 0 }}>
          <LevelChoice labelledBy={labelId} value={state.value} onChange={onLevel} meanings={def.levels} readOnly={state.readOnly} note={state.note} error={error} />
        </div>
        {fact && <div style={{ flex: '0 0 auto' }}>{fact}</div>}
      </Group>
    </Group>
  );
}
