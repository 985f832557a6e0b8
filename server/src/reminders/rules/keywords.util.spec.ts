// Reply keywords: opt-out words from references.md "Messages" (STOP, END, CANCEL, UNSUBSCRIBE, QUIT from
// the industry handbook; REVOKE, OPT OUT since 2025); HELP / INFO and START per references.md; C / YES /
// CONFIRM and R / RESCHEDULE per messaging.md. STOPALL and UNSTOP: common practice, no source.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { classifyReply, KEYWORDS, normalizeReply, type ReplyKind } from './keywords.util.js';

describe('classifyReply', () => {
  const table: [string, ReplyKind][] = [
    ['C', 'confirm'], ['YES', 'confirm'], ['CONFIRM', 'confirm'],
    ['R', 'reschedule'], ['RESCHEDULE', 'reschedule'],
    ['STOP', 'opt_out'], ['END', 'opt_out'], ['CANCEL', 'opt_out'], ['UNSUBSCRIBE', 'opt_out'], ['QUIT', 'opt_out'],
    ['REVOKE', 'opt_out'], ['OPT OUT', 'opt_out'], ['STOPALL', 'opt_out'],
    ['START', 'opt_in'], ['UNSTOP', 'opt_in'],
    ['HELP', 'help'], ['INFO', 'help'],
  ];
  it.each(table)('%s → %s', (word, kind) => {
    expect(classifyReply(word)).toBe(kind);
  });

  it('ignores case, surrounding white space and trailing punctuation', () => {
    expect(classifyReply('  stop!! ')).toBe('opt_out');
    expect(classifyReply('Yes.')).toBe('confirm');
    expect(classifyReply('c\n')).toBe('confirm');
    expect(classifyReply('Opt   Out')).toBe('opt_out');
    expect(classifyReply('help?')).toBe('help');
    expect(classifyReply('Confirm :)')).toBe('confirm');
  });

  it('only a whole-message keyword counts', () => {
    for (const body of ['stop by at 3', 'yes please', 'STOP STOP', 'can I reschedule?', 'C you then', '', '   ', 'R2', 'STOPP']) {
      expect(classifyReply(body), body).toBe('other');
    }
  });

  it('keeps leading punctuation (only trailing punctuation is dropped)', () => {
    expect(normalizeReply('  "stop"  ')).toBe('"STOP');
    expect(classifyReply('"stop"')).toBe('other');
  });

  const allWords = Object.entries(KEYWORDS).flatMap(([kind, words]) => words.map((w) => [w, kind as ReplyKind] as const));
  it('property: any keyword in any case, padded and punctuated, keeps its kind', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...allWords),
        fc.array(fc.boolean(), { minLength: 12, maxLength: 12 }),
        fc.constantFrom('', ' ', '\t ', '\n'),
        fc.constantFrom('', '.', '!', '?!', ' .', '...'),
        ([word, kind], upper, pad, punct) => {
          const cased = [...word].map((ch, i) => (upper[i % upper.length] ? ch.toUpperCase() : ch.toLowerCase())).join('');
          expect(classifyReply(`${pad}${cased}${punct}${pad}`)).toBe(kind);
        },
      ),
    );
  });

  it('property: a keyword followed by more words is other', () => {
    fc.assert(
      fc.property(fc.constantFrom(...allWords), fc.stringMatching(/^[a-z]{1,8}$/), ([word], tail) => {
        expect(classifyReply(`${word} ${tail}`)).toBe('other');
      }),
    );
  });
});
