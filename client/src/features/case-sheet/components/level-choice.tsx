import { LEVELS, type Level } from '@ostium/shared';
import { useId, useRef, type KeyboardEvent, type ReactNode } from 'react';
import { LEVEL_LABELS } from '../case-sheet.util';
import classes from './level-choice.module.css';

const DOTS: Record<Level, number> = { low: 1, moderate: 2, high: 3 };

export interface LevelChoiceProps {
  value: Level;
  onChange?: (level: Level) => void;
  /** What each level means for this factor; the chosen one is shown under the control. */
  meanings: Record<Level, string>;
  /** Accessible name when there is no visible label to point at. */
  label?: string;
  /** Id of a visible label. */
  labelledBy?: string;
  /** A fact or the procedure fixes the level: focusable and readable, not changeable. */
  readOnly?: boolean;
  /** Why the level is what it is, e.g. "set by curvature 35°". */
  note?: ReactNode;
  error?: ReactNode;
}

/**
 * Three-segment low / moderate / high choice of our own design: each segment carries its level's
 * dots and colour, and it is a radio group for keyboard and assistive technology (one tab stop,
 * arrows move and choose, Home/End jump to the ends).
 */
export function LevelChoice({ value, onChange, meanings, label, labelledBy, readOnly = false, note, error }: LevelChoiceProps) {
  const meaningId = useId();
  const refs = useRef<Partial<Record<Level, HTMLButtonElement | null>>>({});

  const choose = (l: Level) => {
    if (!readOnly && l !== value) onChange?.(l);
  };

  const onKey = (e: KeyboardEvent<HTMLButtonElement>, current: Level) => {
    const i = LEVELS.indexOf(current);
    const target: Record<string, Level | undefined> = {
      ArrowRight: LEVELS[(i + 1) % 3],
      ArrowDown: LEVELS[(i + 1) % 3],
      ArrowLeft: LEVELS[(i + 2) % 3],
      ArrowUp: LEVELS[(i + 2) % 3],
      Home: 'low',
      End: 'high',
    };
    const next = target[e.key];
    if (next) {
      e.preventDefault();
      refs.current[next]?.focus();
      choose(next);
    } else if (e.key === ' ') {
      e.preventDefault();
      choose(current);
    }
  };

  return (
    <div>
      <div
        role="radiogroup"
        aria-label={labelledBy ? undefined : label}
        aria-labelledby={labelledBy}
        aria-describedby={meaningId}
        aria-readonly={readOnly || undefined}
        aria-invalid={error ? true : undefined}
        className={classes.group}
        data-readonly={readOnly || undefined}
      >
        {LEVELS.map((l) => (
          <button
            key={l}
            ref={(el) => {
              refs.current[l] = el;
            }}
            type="button"
            role="radio"
            aria-checked={l === value}
            aria-disabled={readOnly || undefined}
            tabIndex={l === value ? 0 : -1}
            title={meanings[l]}
            className={classes.segment}
            data-level={l}
            onClick={() => choose(l)}
            onKeyDown={(e) => onKey(e, l)}
          >
            <span className={classes.dots} aria-hidden="true">
              {Array.from({ length: DOTS[l] }, (_, i) => (
                <span key={i} className={classes.dot} data-level={l} />
              ))}
            </span>
            {LEVEL_LABELS[l]}
          </button>
        ))}
      </div>
      <div id={meaningId} className={classes.meaning} aria-live="polite">
        {meanings[value]}
        {note && (
          <>
            {' · '}
            <span className={classes.note}>{note}</span>
          </>
        )}
      </div>
      {error && (
        <div role="alert" style={{ color: 'var(--mantine-color-red-7)', fontSize: 'var(--mantine-font-size-xs)' }}>
          {error}
        </div>
      )}
    </div>
  );
}
