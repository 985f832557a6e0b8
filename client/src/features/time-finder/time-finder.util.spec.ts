import type { TimeProposal } from '@ostium/shared';
import { describe, expect, it } from 'vitest';
import { daysApart, gapText, IdempotencyKeys, newIdempotencyKey, searchRequest, type SearchForm } from './time-finder.util';

const proposal = (start: string, chairId = 1): TimeProposal => ({ visits: [{ start, end: start, chairId, operatorId: 5 }], gapMinutesLeft: 0, reasons: [] });
const form = (over: Partial<SearchForm> = {}): SearchForm => ({ weekdays: [], partOfDay: 'any', locationId: null, operatorId: null, earliest: '', urgent: false, ...over });

describe('IdempotencyKeys', () => {
  it('gives the same proposal the same key, even from a refetched copy, and another proposal a new one', () => {
    let n = 0;
    const keys = new IdempotencyKeys(() => `k${++n}`);
    const a = proposal('2026-03-09T13:00:00.000Z');
    expect(keys.for(a)).toBe('k1');
    expect(keys.for(structuredClone(a))).toBe('k1');
    expect(keys.for(proposal('2026-03-09T13:00:00.000Z', 2))).toBe('k2');
  });

  it('makes keys that do not repeat', () => {
    const made = new Set(Array.from({ length: 200 }, newIdempotencyKey));
    expect(made.size).toBe(200);
  });
});

describe('searchRequest', () => {
  it('leaves out empty wishes and sorts the weekdays', () => {
    expect(searchRequest(7, form(), 'America/New_York')).toEqual({ caseId: 7, limit: 5 });
    expect(searchRequest(7, form({ weekdays: [5, 1], partOfDay: 'morning', locationId: 2, operatorId: 6, urgent: true }), 'America/New_York')).toEqual({
      caseId: 7,
      limit: 5,
      locationId: 2,
      operatorId: 6,
      preferences: { weekdays: [1, 5], partOfDay: 'morning' },
      urgent: true,
    });
    // Every day ticked is no preference at all.
    expect(searchRequest(7, form({ weekdays: [1, 2, 3, 4, 5, 6, 7] }), 'UTC').preferences).toBeUndefined();
  });

  it('starts a future "not before" date at local midnight of the location', () => {
    // 2099-01-05 in New York is EST (−5): midnight local is 05:00Z (IANA rules via luxon, references.md "Calendars").
    expect(searchRequest(7, form({ earliest: '2099-01-05' }), 'America/New_York').from).toBe('2099-01-05T05:00:00.000Z');
    expect(searchRequest(7, form({ earliest: '2000-01-05' }), 'America/New_York').from).toBeUndefined();
  });
});

describe('gapText and daysApart', () => {
  it('say what a proposal leaves and how far apart its visits are', () => {
    expect(gapText(0)).toBe('Leaves no gap');
    expect(gapText(25)).toBe('Leaves a 25-min gap');
    expect(gapText(75)).toBe('Leaves 1 h 15 min of gaps');
    // Across the spring-forward change two 09:00 visits are still 14 calendar days apart (references.md "Calendars").
    expect(daysApart('2026-03-02T14:00:00.000Z', '2026-03-16T13:00:00.000Z', 'America/New_York')).toBe(14);
  });
});
