import { Button, Group, SegmentedControl, Stack, Text, TextInput, Tooltip } from '@mantine/core';
import { ALL_TEETH, parseTooth, ToothNumberError, type ToothInfo, type ToothNotation } from '@ostium/shared';
import { memo, useEffect, useId, useMemo, useRef, useState, type KeyboardEvent, type ReactNode } from 'react';
import classes from './tooth-picker.module.css';

type Dentition = ToothInfo['dentition'];

const NOTATION_NAME: Record<ToothNotation, string> = { fdi: 'FDI', universal: 'Universal' };
const CHART_INDEX = new Map(ALL_TEETH.map((t, i) => [t.fdi, i]));
const BY_FDI = new Map(ALL_TEETH.map((t) => [t.fdi, t]));

/**
 * Arches as seen facing the patient: the patient's right is on the viewer's left, so the upper row
 * runs Universal 1→16 and the lower row 32→17 (primary: A→J over T→K).
 */
const ROWS: Record<Dentition, [ToothInfo[], ToothInfo[]]> = {
  permanent: [ALL_TEETH.slice(0, 16), ALL_TEETH.slice(16, 32).reverse()],
  primary: [ALL_TEETH.slice(32, 42), ALL_TEETH.slice(42, 52).reverse()],
};

const shownNumber = (t: ToothInfo, n: ToothNotation) => (n === 'fdi' ? t.fdi : t.universal);
const other = (n: ToothNotation): ToothNotation => (n === 'fdi' ? 'universal' : 'fdi');

/** "upper left primary first molar" */
export function toothName(t: ToothInfo): string {
  return `${t.jaw === 'maxillary' ? 'upper' : 'lower'} ${t.side} ${t.dentition === 'primary' ? 'primary ' : ''}${t.tooth}`;
}

/** Accessible name of a tile, e.g. "Tooth 19 (FDI 36), lower left first molar". */
export function toothLabel(t: ToothInfo, notation: ToothNotation): string {
  const o = other(notation);
  return `Tooth ${shownNumber(t, notation)} (${NOTATION_NAME[o]} ${shownNumber(t, o)}), ${toothName(t)}`;
}

/** Chart order (Universal 1–32, then A–T), without repeats: a stable order for the request and the text box. */
export function sortTeeth(fdi: Iterable<string>): string[] {
  return [...new Set(fdi)].filter((f) => CHART_INDEX.has(f)).sort((a, b) => CHART_INDEX.get(a)! - CHART_INDEX.get(b)!);
}

export function formatTeeth(fdi: string[], notation: ToothNotation): string {
  return sortTeeth(fdi)
    .map((f) => shownNumber(BY_FDI.get(f)!, notation))
    .join(', ');
}

/** Reads "19, 30" or "36 46" (commas, spaces or semicolons) in `notation`; bad entries are reported, good ones kept. */
export function parseTeethText(text: string, notation: ToothNotation): { teeth: string[]; errors: string[] } {
  const teeth: string[] = [];
  const errors: string[] = [];
  for (const token of text.split(/[\s,;]+/).filter(Boolean)) {
    try {
      teeth.push(parseTooth(token, notation).fdi);
    } catch (e) {
      if (!(e instanceof ToothNumberError)) throw e;
      errors.push(e.message.charAt(0).toUpperCase() + e.message.slice(1));
    }
  }
  return { teeth: sortTeeth(teeth), errors };
}

const sameSet = (a: string[], b: string[]) => a.length === b.length && sortTeeth(a).join() === sortTeeth(b).join();

export interface ToothPickerProps {
  /** Selected teeth in ISO 3950 (FDI) form, the stored form. */
  value: string[];
  onChange: (fdi: string[]) => void;
  /** The practice's notation: shown on the tiles and read from the text box. */
  notation: ToothNotation;
  label?: string;
  description?: ReactNode;
  /** An error from outside (e.g. the server's `teeth.0.tooth`), shown under the text box. */
  error?: ReactNode;
  disabled?: boolean;
}

/** Tooth chart of our own design: upper and lower arches split at the midline, multi-select, keyboard operable. */
export const ToothPicker = memo(function ToothPicker({ value, onChange, notation, label = 'Teeth', description, error, disabled }: ToothPickerProps) {
  const labelId = useId();
  const selected = useMemo(() => new Set(value), [value]);
  const [dentition, setDentition] = useState<Dentition>(() =>
    value.length > 0 && value.every((f) => BY_FDI.get(f)?.dentition === 'primary') ? 'primary' : 'permanent',
  );
  const [text, setText] = useState(() => formatTeeth(value, notation));
  const [textErrors, setTextErrors] = useState<string[]>([]);
  const [focusFdi, setFocusFdi] = useState<string | null>(null);
  const tileRefs = useRef(new Map<string, HTMLButtonElement>());

  // Keep the text box in step with clicks, but leave what the user is typing alone while it means the same teeth.
  useEffect(() => {
    if (!sameSet(parseTeethText(text, notation).teeth, value)) {
      setText(formatTeeth(value, notation));
      setTextErrors([]);
    }
    // Deliberately not keyed on `text`: only outside changes of the selection may rewrite it.
  }, [value, notation]);

  const rows = ROWS[dentition];
  const flat = [...rows[0], ...rows[1]];
  const tabStop = (focusFdi && flat.some((t) => t.fdi === focusFdi) ? focusFdi : null) ?? flat.find((t) => selected.has(t.fdi))?.fdi ?? rows[0][0]!.fdi;

  const toggle = (fdi: string) => {
    const next = selected.has(fdi) ? value.filter((f) => f !== fdi) : [...value, fdi];
    onChange(sortTeeth(next));
  };

  const moveTo = (t: ToothInfo | undefined) => {
    if (!t) return;
    setFocusFdi(t.fdi);
    tileRefs.current.get(t.fdi)?.focus();
  };

  const onTileKey = (e: KeyboardEvent<HTMLButtonElement>, row: 0 | 1, col: number) => {
    const r = rows[row];
    const moves: Record<string, () => ToothInfo | undefined> = {
      ArrowLeft: () => r[Math.max(0, col - 1)],
      ArrowRight: () => r[Math.min(r.length - 1, col + 1)],
      // Up and down jump to the opposing tooth of the other arch, the same column.
      ArrowUp: () => rows[0][col],
      ArrowDown: () => rows[1][col],
      Home: () => r[0],
      End: () => r[r.length - 1],
    };
    const move = moves[e.key];
    if (move) {
      e.preventDefault();
      moveTo(move());
    }
  };

  const onText = (next: string) => {
    setText(next);
    const parsed = parseTeethText(next, notation);
    // The last entry may still be half typed ("3" on the way to "36"): judge it when it is finished or on blur.
    const finished = /[\s,;]$/.test(next) ? next : next.replace(/[^\s,;]*$/, '');
    setTextErrors(parseTeethText(finished, notation).errors);
    // Typed teeth of the other dentition only: show the chart they are on.
    const kinds = new Set(parsed.teeth.map((f) => BY_FDI.get(f)!.dentition));
    if (kinds.size === 1 && !kinds.has(dentition)) setDentition([...kinds][0]!);
    if (!sameSet(parsed.teeth, value)) onChange(parsed.teeth);
  };

  const count = (d: Dentition) => value.filter((f) => BY_FDI.get(f)?.dentition === d).length;
  const segment = (d: Dentition, name: string) => ({ value: d, label: count(d) ? `${name} · ${count(d)}` : name });

  const tile = (t: ToothInfo, row: 0 | 1, col: number) => {
    const o = other(notation);
    return (
      <Tooltip
        key={t.fdi}
        withArrow
        openDelay={250}
        // Keyboard users moving through the chart see the same card as mouse users.
        events={{ hover: true, focus: true, touch: false }}
        label={
          <Stack gap={0}>
            <Text fz="xs" fw={700}>
              {NOTATION_NAME[notation]} {shownNumber(t, notation)} · {NOTATION_NAME[o]} {shownNumber(t, o)}
            </Text>
            <Text fz="xs">{toothName(t)}</Text>
          </Stack>
        }
      >
        <button
          type="button"
          ref={(el) => {
            if (el) tileRefs.current.set(t.fdi, el);
            else tileRefs.current.delete(t.fdi);
          }}
          className={classes.tile}
          data-group={t.group}
          data-fdi={t.fdi}
          aria-pressed={selected.has(t.fdi)}
          aria-label={toothLabel(t, notation)}
          tabIndex={t.fdi === tabStop ? 0 : -1}
          disabled={disabled}
          onClick={() => {
            setFocusFdi(t.fdi);
            toggle(t.fdi);
          }}
          onFocus={() => setFocusFdi(t.fdi)}
          onKeyDown={(e) => onTileKey(e, row, col)}
        >
          {shownNumber(t, notation)}
        </button>
      </Tooltip>
    );
  };

  const arch = (row: 0 | 1) => {
    const teeth = rows[row];
    const half = teeth.length / 2;
    return (
      <div className={`${classes.arch} ${row === 0 ? classes.upper : classes.lower}`} role="group" aria-label={row === 0 ? 'Upper teeth' : 'Lower teeth'}>
        <span className={classes.archLabel} aria-hidden="true">
          {row === 0 ? 'Upper' : 'Lower'}
        </span>
        <div className={classes.row}>
          <div className={classes.half}>{teeth.slice(0, half).map((t, i) => tile(t, row, i))}</div>
          <div className={classes.midline} aria-hidden="true" />
          <div className={classes.half}>{teeth.slice(half).map((t, i) => tile(t, row, half + i))}</div>
        </div>
      </div>
    );
  };

  const selectedInfo = sortTeeth(value).map((f) => BY_FDI.get(f)!);
  const shownError = error ?? (textErrors.length ? textErrors.join('; ') : null);

  return (
    <div role="group" aria-labelledby={labelId}>
      <Group justify="space-between" mb={6} gap="xs">
        <Text id={labelId} fz="sm" fw={500}>
          {label}
        </Text>
        <Group gap="xs">
          {value.length > 0 && (
            <Button size="compact-xs" variant="subtle" color="stone" onClick={() => onChange([])} disabled={disabled}>
              Clear
            </Button>
          )}
          <SegmentedControl
            size="xs"
            aria-label="Dentition"
            value={dentition}
            onChange={(v) => setDentition(v as Dentition)}
            data={[segment('permanent', 'Permanent'), segment('primary', 'Primary')]}
            disabled={disabled}
          />
        </Group>
      </Group>
      {description && (
        <Text fz="xs" c="dimmed" mb={6}>
          {description}
        </Text>
      )}
      <div className={classes.chart}>
        {arch(0)}
        <div className={classes.plane} aria-hidden="true">
          <span className={classes.archLabel} />
          <span>R</span>
          <span className={classes.planeLine} />
          <span>L</span>
        </div>
        {arch(1)}
      </div>
      <TextInput
        mt="xs"
        label={`Tooth numbers (${NOTATION_NAME[notation]})`}
        placeholder={notation === 'universal' ? 'e.g. 19, 30 or A' : 'e.g. 36 46 or 55'}
        description="Type or click; separate teeth with commas or spaces."
        value={text}
        onChange={(e) => onText(e.currentTarget.value)}
        onBlur={() => {
          const errors = parseTeethText(text, notation).errors;
          setTextErrors(errors);
          if (errors.length === 0) setText(formatTeeth(value, notation));
        }}
        error={shownError}
        disabled={disabled}
        autoComplete="off"
      />
      {selectedInfo.length > 0 && (
        <Text fz="xs" c="dimmed" mt={4} aria-live="polite">
          {selectedInfo.length === 1 ? '1 tooth' : `${selectedInfo.length} teeth`}:{' '}
          {selectedInfo.map((t) => `${shownNumber(t, notation)} ${toothName(t)}`).join(' · ')}
        </Text>
      )}
    </div>
  );
});
