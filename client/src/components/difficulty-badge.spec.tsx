import { LEVELS } from '@ostium/shared';
import { screen } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { renderPage } from '../test/render';
import { DifficultyBadge } from './difficulty-badge';

// product.md ("Look"): low = teal, one dot; moderate = amber, two dots; high = plum, three dots.
const EXPECTED = { low: { dots: 1, color: 'lagoon', text: 'Low' }, moderate: { dots: 2, color: 'amber', text: 'Moderate' }, high: { dots: 3, color: 'plum', text: 'High' } };

describe('DifficultyBadge', () => {
  it.each(LEVELS)('shows %s with its own colour, dot count and accessible name', (level) => {
    renderPage(<DifficultyBadge level={level} />);
    const badge = screen.getByRole('img', { name: `Difficulty: ${level}` });
    expect(badge).toHaveTextContent(EXPECTED[level].text);
    expect(badge.querySelectorAll('[data-dot]')).toHaveLength(EXPECTED[level].dots);
    expect(badge.getAttribute('style') ?? '').toContain(`--mantine-color-${EXPECTED[level].color}`);
  });

  it('keeps the name and the dots when compact', () => {
    renderPage(<DifficultyBadge level="high" compact />);
    const badge = screen.getByRole('img', { name: 'Difficulty: high' });
    expect(badge).not.toHaveTextContent('High');
    expect(badge.querySelectorAll('[data-dot]')).toHaveLength(3);
  });
});
