import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { sessionStore } from '../../../lib/session';
import { mockFetch, renderRoutes } from '../../../test/render';
import { practice, signInAs } from '../../case-sheet/test/case-sheet.fixtures';
import { chairBoardRoutes } from '../../chair-board/routes';
import { chairsideDay, location } from '../../chair-board/test/scheduling.fixtures';

function serve() {
  return mockFetch({
    'GET /api/locations': () => ({ status: 200, body: [location()] }),
    'GET /api/practice': () => ({ status: 200, body: practice('universal') }),
    'GET /api/chairside': () => ({ status: 200, body: chairsideDay() }),
  });
}

const open = () => renderRoutes([{ path: '/', children: chairBoardRoutes }], '/chairside?date=2026-03-09&locationId=1');

describe('ChairsidePage', () => {
  afterEach(() => sessionStore.set(null));

  it('lists each chair’s visits in order with patient, tooth, procedure, level, minutes, microscope and tray', async () => {
    signInAs('assistant');
    const calls = serve();
    open();
    const chair1 = await screen.findByRole('region', { name: 'Chair 1' });
    const visit = within(chair1).getByRole('article', { name: '09:00 Robin Example' });
    // FDI 36 is Universal 19 (references.md, "Tooth numbering").
    expect(visit).toHaveTextContent('Tooth 19');
    expect(visit).toHaveTextContent('Root canal therapy');
    expect(visit).toHaveTextContent('115 min');
    expect(visit).toHaveTextContent('Scope A');
    expect(within(visit).getByRole('img', { name: 'Difficulty: high' })).toBeInTheDocument();
    const tray = within(visit).getByRole('list', { name: 'Tray list for Robin Example' });
    // ISO 3630-1: size 10 is purple, size 25 red (references.md, "Instruments", verified).
    expect([...tray.querySelectorAll('[data-colour]')].map((e) => e.getAttribute('data-colour'))).toEqual(['purple', 'red']);
    expect(tray).toHaveTextContent('10.02');
    expect(tray).toHaveTextContent('Rubber dam kit');
    // Size 40 is black (references.md, "Instruments").
    const chair2 = screen.getByRole('region', { name: 'Chair 2' });
    expect(within(chair2).getByRole('list', { name: 'Tray list for Sam Example' }).querySelector('[data-colour]')).toHaveAttribute('data-colour', 'black');
    expect(Object.fromEntries(calls.find((c) => c.key === 'GET /api/chairside')!.query)).toEqual({ date: '2026-03-09', locationId: '1' });
  });

  it('prints one chair per page with the screen controls left out', async () => {
    signInAs('assistant');
    serve();
    const print = vi.fn();
    const original = window.print;
    window.print = print;
    const { container } = open();
    const chairs = await screen.findAllByRole('region', { name: /^Chair \d$/ });
    // Each chair is a print section (page break after it, design/style in chairside.css).
    chairs.forEach((c) => expect(c).toHaveClass('chairside-chair'));
    expect(container.querySelector('.chairside-sheet')).not.toBeNull();
    // The controls carry the shell's no-print class; the sheet header names day and place for paper only.
    expect(screen.getByRole('button', { name: 'Print' }).closest('.no-print')).not.toBeNull();
    expect(within(chairs[0]!).getByText(/Mon 9 Mar 2026 · Harbour Street/)).toHaveClass('chairside-print-inline');
    await userEvent.click(screen.getByRole('button', { name: 'Print' }));
    expect(print).toHaveBeenCalledTimes(1);
    window.print = original;
  });

  it('has print rules: a page break after each chair, none inside a visit, colours kept', () => {
    // The test environment does not load CSS, so the rules are read from the file itself.
    const PRINT_CSS = readFileSync(join(dirname(fileURLToPath(import.meta.url)), 'chairside.css'), 'utf8');
    const media = PRINT_CSS.slice(PRINT_CSS.indexOf('@media print'));
    expect(media).toMatch(/\.chairside-chair \{[^}]*break-after: page/);
    expect(media).toMatch(/\.chairside-chair:last-child \{[^}]*break-after: auto/);
    expect(media).toMatch(/\.chairside-visit \{[^}]*break-inside: avoid/);
    expect(media).toMatch(/print-color-adjust: exact/);
    // No fixed paper size: the same sheet fits A4 and Letter.
    expect(media).not.toMatch(/size:\s*(A4|letter)/i);
  });
});
