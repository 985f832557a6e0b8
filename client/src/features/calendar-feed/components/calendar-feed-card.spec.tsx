import { screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { mockFetch, renderPage } from '../../../test/render';
import { CalendarFeedCard } from './calendar-feed-card';

describe('CalendarFeedCard', () => {
  it('asks for a private address, shows it, and stops it', async () => {
    const calls = mockFetch({
      'POST /api/operators/3/feed-token': () => ({ status: 201, body: { url: 'http://127.0.0.1:3000/api/feeds/abc123.ics' } }),
      'DELETE /api/operators/3/feed-token': () => ({ status: 204 }),
    });
    renderPage(<CalendarFeedCard operatorId={3} />);
    await userEvent.click(screen.getByRole('button', { name: 'Get my calendar address' }));
    expect(await screen.findByLabelText('Calendar feed address')).toHaveValue('http://127.0.0.1:3000/api/feeds/abc123.ics');
    await userEvent.click(screen.getByRole('button', { name: 'Stop the address' }));
    expect(await screen.findByText('The address no longer works.')).toBeInTheDocument();
    expect(screen.queryByLabelText('Calendar feed address')).toBeNull();
    expect(calls.map((c) => c.key)).toEqual(['POST /api/operators/3/feed-token', 'DELETE /api/operators/3/feed-token']);
  });
});
