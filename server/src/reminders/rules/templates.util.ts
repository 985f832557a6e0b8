// Reminder templates: only the placeholders below exist, so clinical detail (tooth, procedure) has no
// way in (HHS FAQ 198 and 45 CFR 164.502(b): disclose only what confirms the appointment).
import { classifyReply } from './keywords.util.js';
import { smsLength, type SmsLength } from './sms-encoding.util.js';

// confirmLink: the signed, expiring link to the visit's public page (confirm-link.util.ts); it carries no
// detail itself, only an opaque token.
export const TEMPLATE_PLACEHOLDERS = ['practice', 'date', 'time', 'location', 'confirmHint', 'optOut', 'confirmLink'] as const;
export type TemplatePlaceholder = (typeof TEMPLATE_PLACEHOLDERS)[number];
export type TemplateValues = Partial<Record<TemplatePlaceholder, string>>;

export interface RenderedTemplate {
  text: string;
  length: SmsLength;
  /** True when the text fits one segment (160 GSM-7 / 70 UCS-2), the limit for reminders. */
  fitsOneSegment: boolean;
  placeholders: TemplatePlaceholder[];
}

export class TemplateError extends Error {
  constructor(
    message: string,
    readonly unknown: string[] = [],
    readonly missing: string[] = [],
  ) {
    super(message);
    this.name = 'TemplateError';
  }
}

// Every {…} is a placeholder; literal braces are not offered (they would also cost two GSM-7 septets).
const PLACEHOLDER = /\{([^{}]*)\}/g;
const KNOWN = new Set<string>(TEMPLATE_PLACEHOLDERS);

export function templatePlaceholders(template: string): { known: TemplatePlaceholder[]; unknown: string[] } {
  const known: TemplatePlaceholder[] = [];
  const unknown: string[] = [];
  for (const m of template.matchAll(PLACEHOLDER)) {
    const name = m[1].trim();
    if (KNOWN.has(name)) {
      if (!known.includes(name as TemplatePlaceholder)) known.push(name as TemplatePlaceholder);
    } else if (!unknown.includes(name)) unknown.push(name);
  }
  return { known, unknown };
}

/**
 * An opt-out hint names, in capitals, a word the reply classifier treats as an opt-out (so "call to
 * cancel your visit" is not one), or says "opt out".
 */
export function namesOptOutWord(text: string): boolean {
  const words = text.split(/[^\p{L}]+/u).filter((w) => w !== '');
  return words.some((w) => w === w.toUpperCase() && classifyReply(w) === 'opt_out') || /\bopt[\s-]+out\b/i.test(text);
}

export function renderTemplate(template: string, values: TemplateValues): RenderedTemplate {
  const { known, unknown } = templatePlaceholders(template);
  if (unknown.length > 0) {
    throw new TemplateError(`unknown placeholder${unknown.length > 1 ? 's' : ''}: ${unknown.map((u) => `{${u}}`).join(', ')}`, unknown);
  }
  const missing = known.filter((k) => !values[k]?.trim());
  if (missing.length > 0) {
    throw new TemplateError(`no value for ${missing.map((u) => `{${u}}`).join(', ')}`, [], missing);
  }
  const optOut = values.optOut?.trim() ?? '';
  if (!known.includes('optOut') && !namesOptOutWord(template)) {
    throw new TemplateError('a text must say how to opt out: add {optOut}');
  }
  if (known.includes('optOut') && !namesOptOutWord(optOut)) {
    throw new TemplateError(`the opt-out hint must name an opt-out word such as STOP, got "${optOut}"`);
  }
  // One pass, so braces inside a value are never read as placeholders.
  const text = template.replace(PLACEHOLDER, (_, name: string) => values[name.trim() as TemplatePlaceholder]!.trim());
  const length = smsLength(text);
  return { text, length, fitsOneSegment: length.segments <= 1, placeholders: known };
}
