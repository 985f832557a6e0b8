import { MantineProvider } from '@mantine/core';
import type { Level } from '@ostium/shared';
import { render, screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { useState } from 'react';
import { describe, expect, it, vi } from 'vitest';
import { theme } from '../../../app/theme';
import { LevelChoice } from './level-choice';

const MEANINGS = { low: 'Curved under 10°', moderate: 'Curved 10° to 30°', high: 'Curved over 30°, or S-shaped' };

function Harness({ start = 'low' as Level, readOnly = false, onChange = (_: Level) => {} }) {
  const [v, setV] = useState<Level>(start);
  return (
    <MantineProvider theme={theme}>
      <button type="button">before</button>
      <LevelChoice
        label="Canal and root shape"
        value={v}
        meanings={MEANINGS}
        readOnly={readOnly}
        note={readOnly ? 'set by curvature 35°' : undefined}
        onChange={(l) => {
          onChange(l);
          setV(l);
        }}
      />
    </MantineProvider>
  );
}

const checked = () => screen.getAllByRole('radio').filter((r) => r.getAttribute('aria-checked') === 'true').map((r) => r.textContent);

describe('LevelChoice', () => {
  it('is a named radio group of three levels, each drawn with its number of dots', () => {
    render(<Harness start="moderate" />);
    const group = screen.getByRole('radiogroup', { name: 'Canal and root shape' });
    const radios = screen.getAllByRole('radio');
    expect(radios.map((r) => r.textContent)).toEqual(['Low', 'Moderate', 'High']);
    expect(radios.map((r) => r.querySelectorAll('[data-level]').length)).toEqual([1, 2, 3]);
    expect(checked()).toEqual(['Moderate']);
    // The chosen level's meaning describes the group.
    expect(group).toHaveAccessibleDescription('Curved 10° to 30°');
  });

  it('has one tab stop, on the chosen level', async () => {
    const user = userEvent.setup();
    render(<Harness start="high" />);
    await user.click(screen.getByText('before'));
    await user.tab();
    expect(screen.getByRole('radio', { name: 'High' })).toHaveFocus();
    expect(screen.getAllByRole('radio').map((r) => r.tabIndex)).toEqual([-1, -1, 0]);
  });

  it('moves and chooses with the arrows, wraps around, and jumps with Home and End', async () => {
    const user = userEvent.setup();
    const onChange = vi.fn();
    render(<Harness onChange={onChange} />);
    screen.getByRole('radio', { name: 'Low' }).focus();
    await user.keyboard('{ArrowRight}');
    expect(screen.getByRole('radio', { name: 'Moderate' })).toHaveFocus();
    expect(checked()).toEqual(['Moderate']);
    expect(screen.getByRole('radiogroup')).toHaveAccessibleDescription('Curved 10° to 30°');
    await user.keyboard('{ArrowDown}');
    expect(checked()).toEqual(['High']);
    await user.keyboard('{ArrowRight}');
    expect(checked()).toEqual(['Low']);
    expect(screen.getByRole('radio', { name: 'Low' })).toHaveFocus();
    await user.keyboard('{ArrowLeft}');
    expect(checked()).toEqual(['High']);
    await user.keyboard('{Home}');
    expect(checked()).toEqual(['Low']);
    await user.keyboard('{End}');
    expect(checked()).toEqual(['High']);
    expect(onChange.mock.calls.map((c) => c[0])).toEqual(['moderate', 'high', 'low', 'high', 'low', 'high']);
  });

  it('chooses on click', async () => {
    const user = userEvent.setup();
    render(<Harness />);
    await user.click(screen.getByRole('radio', { name: 'High' }));
    expect(checked()).toEqual(['High']);
    expect(screen.getByText('Curved over 30°, or S-shaped')).toBeInTheDocument();
  });

  it('read-only (set by a fact): focus moves but the level stays, and the note says why', async () => {
    const user = userEvent.setup();
    const onChange = vi.fn();
    render(<Harness start="high" readOnly onChange={onChange} />);
    expect(screen.getByRole('radiogroup')).toHaveAttribute('aria-readonly', 'true');
    screen.getByRole('radio', { name: 'High' }).focus();
    await user.keyboard('{ArrowLeft}');
    expect(screen.getByRole('radio', { name: 'Moderate' })).toHaveFocus();
    await user.click(screen.getByRole('radio', { name: 'Low' }));
    expect(checked()).toEqual(['High']);
    expect(onChange).not.toHaveBeenCalled();
    expect(screen.getByText('set by curvature 35°')).toBeInTheDocument();
  });
});
