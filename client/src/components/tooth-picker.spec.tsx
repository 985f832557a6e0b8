import type { ToothNotation } from '@ostium/shared';
import { fireEvent, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { useState } from 'react';
import { describe, expect, it } from 'vitest';
// ISO 3950 ↔ Universal crosswalk from HL7's Dental Data Exchange implementation guide (appendix D1); see its README.
import crosswalkCsv from '../../../shared/src/fixtures/tooth-crosswalk.csv?raw';
import { renderPage } from '../test/render';
import { parseTeethText, ToothPicker } from './tooth-picker';

const crosswalk = crosswalkCsv
  .trim()
  .split('\n')
  .slice(1)
  .map((line) => {
    const [universal, fdi, dentition, jaw, side, tooth] = line.split(',');
    return { universal: universal!, fdi: fdi!, dentition: dentition!, jaw: jaw!, side: side!, tooth: tooth! };
  });

/** The picker as a form uses it: controlled, with every change recorded. */
function Harness({ notation, initial = [], changes }: { notation: ToothNotation; initial?: string[]; changes: string[][] }) {
  const [value, setValue] = useState<string[]>(initial);
  return (
    <>
      <ToothPicker
        notation={notation}
        value={value}
        onChange={(v) => {
          changes.push(v);
          setValue(v);
        }}
      />
      <output data-testid="value">{value.join(' ')}</output>
    </>
  );
}

const tile = (name: RegExp | string) => screen.getByRole('button', { name });
const selectedValue = () => screen.getByTestId('value').textContent;

describe('ToothPicker', () => {
  it('names every permanent tile after the ISO 3950 / HL7 crosswalk, in both notations', async () => {
    renderPage(<Harness notation="universal" changes={[]} />);
    const permanent = crosswalk.filter((r) => r.dentition === 'permanent');
    expect(permanent).toHaveLength(32);
    for (const r of permanent) {
      const jaw = r.jaw === 'maxillary' ? 'upper' : 'lower';
      // Crosswalk row: Universal r.universal = ISO 3950 r.fdi (HL7 Dental Data Exchange, appendix D1).
      expect(tile(`Tooth ${r.universal} (FDI ${r.fdi}), ${jaw} ${r.side} ${r.tooth}`)).toHaveTextContent(new RegExp(`^${r.universal}$`));
    }
  });

  it('names every primary tile after the crosswalk once switched to primary teeth', async () => {
    renderPage(<Harness notation="fdi" changes={[]} />);
    await userEvent.click(screen.getByLabelText('Primary'));
    const primary = crosswalk.filter((r) => r.dentition === 'primary');
    expect(primary).toHaveLength(20);
    for (const r of primary) {
      const jaw = r.jaw === 'maxillary' ? 'upper' : 'lower';
      // Crosswalk row: Universal letter r.universal = ISO 3950 r.fdi (HL7 Dental Data Exchange, appendix D1).
      expect(tile(`Tooth ${r.fdi} (Universal ${r.universal}), ${jaw} ${r.side} primary ${r.tooth}`)).toHaveTextContent(new RegExp(`^${r.fdi}$`));
    }
    expect(screen.queryByRole('button', { name: /^Tooth 36 / })).toBeNull();
  });

  it('lays the arches out facing the patient: upper 1→16, lower 32→17, split at the midline', () => {
    renderPage(<Harness notation="universal" changes={[]} />);
    const upper = within(screen.getByRole('group', { name: 'Upper teeth' })).getAllByRole('button').map((b) => b.textContent);
    const lower = within(screen.getByRole('group', { name: 'Lower teeth' })).getAllByRole('button').map((b) => b.textContent);
    expect(upper).toEqual(Array.from({ length: 16 }, (_, i) => String(i + 1)));
    expect(lower).toEqual(Array.from({ length: 16 }, (_, i) => String(32 - i)));
  });

  it('selects and deselects by click, reporting FDI and setting aria-pressed', async () => {
    const changes: string[][] = [];
    renderPage(<Harness notation="universal" changes={changes} />);
    const t19 = tile(/^Tooth 19 /);
    expect(t19).toHaveAttribute('aria-pressed', 'false');
    await userEvent.click(t19);
    await userEvent.click(tile(/^Tooth 3 /));
    expect(t19).toHaveAttribute('aria-pressed', 'true');
    // Universal 19 = FDI 36 and Universal 3 = FDI 16 (references.md, ISO 3950 / HL7 crosswalk checks); kept in chart order.
    expect(changes.at(-1)).toEqual(['16', '36']);
    expect(screen.getByLabelText('Tooth numbers (Universal)')).toHaveValue('3, 19');
    await userEvent.click(t19);
    expect(t19).toHaveAttribute('aria-pressed', 'false');
    expect(selectedValue()).toBe('16');
  });

  it('moves with the arrow keys and toggles with Space and Enter', async () => {
    const changes: string[][] = [];
    renderPage(<Harness notation="universal" changes={changes} />);
    const first = tile(/^Tooth 1 /);
    // One tab stop for the whole chart.
    expect(screen.getAllByRole('button').filter((b) => b.getAttribute('tabindex') === '0' && b.hasAttribute('aria-pressed'))).toEqual([first]);
    first.focus();
    await userEvent.keyboard('{ArrowRight}{ArrowRight}');
    expect(tile(/^Tooth 3 /)).toHaveFocus();
    await userEvent.keyboard(' ');
    expect(tile(/^Tooth 3 /)).toHaveAttribute('aria-pressed', 'true');
    await userEvent.keyboard('{ArrowDown}');
    // Below Universal 3 (upper right first molar) sits 30 (lower right first molar).
    expect(tile(/^Tooth 30 /)).toHaveFocus();
    await userEvent.keyboard('{Enter}');
    await userEvent.keyboard('{End}');
    expect(tile(/^Tooth 17 /)).toHaveFocus();
    await userEvent.keyboard('{ArrowUp}');
    expect(tile(/^Tooth 16 /)).toHaveFocus();
    await userEvent.keyboard('{ArrowRight}{Home}');
    expect(tile(/^Tooth 1 /)).toHaveFocus();
    expect(tile(/^Tooth 1 /)).toHaveAttribute('tabindex', '0');
    // 3 → 16 and 30 → 46 (references.md, ISO 3950 / HL7 crosswalk).
    expect(changes.at(-1)).toEqual(['16', '46']);
  });

  it('reads "19, 30" typed in Universal as FDI 36 and 46', async () => {
    const changes: string[][] = [];
    renderPage(<Harness notation="universal" changes={changes} />);
    await userEvent.type(screen.getByLabelText('Tooth numbers (Universal)'), '19, 30');
    // references.md checks (verified): Universal 19 → FDI 36, 30 → FDI 46 (ISO 3950 / HL7 crosswalk).
    expect(selectedValue()).toBe('36 46');
    expect(tile(/^Tooth 19 /)).toHaveAttribute('aria-pressed', 'true');
    expect(tile(/^Tooth 30 /)).toHaveAttribute('aria-pressed', 'true');
    expect(screen.getByLabelText('Tooth numbers (Universal)')).toHaveValue('19, 30');
  });

  it('reads "36 46" typed in FDI and shows FDI on the tiles', async () => {
    renderPage(<Harness notation="fdi" changes={[]} />);
    await userEvent.type(screen.getByLabelText('Tooth numbers (FDI)'), '36 46');
    expect(selectedValue()).toBe('36 46');
    // FDI 36 = Universal 19 (references.md, ISO 3950 / HL7 crosswalk).
    expect(tile('Tooth 36 (Universal 19), lower left first molar')).toHaveAttribute('aria-pressed', 'true');
  });

  it('says which typed entry is not a tooth and keeps the good ones', async () => {
    renderPage(<Harness notation="universal" changes={[]} />);
    const input = screen.getByLabelText('Tooth numbers (Universal)');
    await userEvent.type(input, '19, 33, ');
    expect(await screen.findByText(/tooth 33 is not a Universal tooth number/i)).toBeInTheDocument();
    expect(input).toHaveAttribute('aria-invalid', 'true');
    expect(selectedValue()).toBe('36');
  });

  it('switches to the primary chart when primary teeth are typed, and counts each dentition', async () => {
    renderPage(<Harness notation="universal" changes={[]} />);
    await userEvent.type(screen.getByLabelText('Tooth numbers (Universal)'), 'a');
    // Universal A = FDI 55 (references.md, ISO 3950 / HL7 crosswalk checks).
    expect(selectedValue()).toBe('55');
    expect(tile('Tooth A (FDI 55), upper right primary second molar')).toHaveAttribute('aria-pressed', 'true');
    expect(screen.getByText('Primary · 1')).toBeInTheDocument();
  });

  it('updates the text box when the selection changes by click after typing', async () => {
    renderPage(<Harness notation="universal" changes={[]} />);
    const input = screen.getByLabelText('Tooth numbers (Universal)');
    await userEvent.type(input, '#19');
    await userEvent.click(tile(/^Tooth 30 /));
    expect(input).toHaveValue('19, 30');
  });

  it('shows both notations on hover', async () => {
    renderPage(<Harness notation="universal" changes={[]} />);
    fireEvent.mouseEnter(tile(/^Tooth 14 /));
    // Universal 14 = FDI 26, upper left first molar (ISO 3950 / HL7 crosswalk).
    expect(await screen.findByText('Universal 14 · FDI 26')).toBeInTheDocument();
    expect(screen.getByText('upper left first molar')).toBeInTheDocument();
  });

  it('clears the selection', async () => {
    renderPage(<Harness notation="fdi" initial={['11', '21']} changes={[]} />);
    await userEvent.click(screen.getByRole('button', { name: 'Clear' }));
    expect(selectedValue()).toBe('');
    expect(screen.getByLabelText('Tooth numbers (FDI)')).toHaveValue('');
  });
});

describe('parseTeethText', () => {
  it('accepts commas, spaces, semicolons and "#" and drops repeats', () => {
    // 8 → 11, 9 → 21, 32 → 48 (references.md crosswalk checks, verified).
    expect(parseTeethText('#9; 8  32,8', 'universal')).toEqual({ teeth: ['11', '21', '48'], errors: [] });
  });

  it('refuses stray text without losing the teeth around it', () => {
    const r = parseTeethText('11 x 99', 'fdi');
    expect(r.teeth).toEqual(['11']);
    expect(r.errors).toHaveLength(2);
  });
});
