// Inbound reply keywords. Only a whole message that is a keyword counts, so "stop by at 3" is a
// message for the front desk, not an opt-out.

export type ReplyKind = 'confirm' | 'reschedule' | 'opt_out' | 'opt_in' | 'help' | 'other';

/** Opt-out words per references.md (STOP, END, CANCEL, UNSUBSCRIBE, QUIT; REVOKE, OPT OUT since 2025; STOPALL). */
export const KEYWORDS: Readonly<Record<Exclude<ReplyKind, 'other'>, readonly string[]>> = {
  confirm: ['C', 'YES', 'CONFIRM'],
  reschedule: ['R', 'RESCHEDULE'],
  opt_out: ['STOP', 'END', 'CANCEL', 'UNSUBSCRIBE', 'QUIT', 'REVOKE', 'OPT OUT', 'STOPALL'],
  opt_in: ['START', 'UNSTOP'],
  help: ['HELP', 'INFO'],
};

const LOOKUP = new Map<string, ReplyKind>(
  Object.entries(KEYWORDS).flatMap(([kind, words]) => words.map((w) => [w, kind as ReplyKind] as const)),
);

/** Upper-cased, trimmed, inner runs of white space made one space, trailing punctuation dropped. */
export function normalizeReply(body: string): string {
  return body
    .trim()
    .replace(/[\s\p{P}]+$/u, '')
    .replace(/\s+/gu, ' ')
    .toUpperCase();
}

export function classifyReply(body: string): ReplyKind {
  return LOOKUP.get(normalizeReply(body)) ?? 'other';
}
