import type { MessageChannel, MessageTemplate, ReminderRule, ReminderSettings } from '@ostium/shared';

/** Puts `token` where the cursor is (replacing a selection) and says where the cursor goes after it. */
export function insertAt(text: string, start: number, end: number, token: string): { text: string; cursor: number } {
  const a = Math.max(0, Math.min(start, text.length));
  const b = Math.max(a, Math.min(end, text.length));
  return { text: text.slice(0, a) + token + text.slice(b), cursor: a + token.length };
}

/**
 * The server names a field by its path in the request ("settings.rules.0.hoursBefore", sometimes
 * "settings.rules[0].hoursBefore"); the form knows it as "rules.0.hoursBefore".
 */
export function formPath(field: string): string {
  return field
    .replace(/\[(\d+)\]/g, '.$1')
    .replace(/^settings\./, '')
    .replace(/^\./, '');
}

/** Field errors by form path; a message that starts with its own path ("rules.1.hoursBefore must…") loses it, the field says where. */
export function serverErrors(errors: { field: string; message: string }[]): Record<string, string> {
  const out: Record<string, string> = {};
  for (const e of errors) {
    const p = formPath(e.field);
    const own = [e.field, p].find((f) => e.message.startsWith(`${f} `) || e.message.startsWith(`${f}: `));
    const m = own ? e.message.slice(own.length).replace(/^:?\s*/, '') : e.message;
    out[p] = out[p] ? `${out[p]}; ${m}` : m;
  }
  return out;
}

const RULE_FIELDS = ['enabled', 'label', 'channel', 'trigger', 'hoursBefore', 'onlyIfUnconfirmed', 'attachCalendar', 'templateId'];
const TEMPLATE_FIELDS = ['label', 'subject', 'body'];
const TOP_FIELDS = ['quietHours.start', 'quietHours.end', 'quietHours', 'caps.perDay', 'caps.perWeek', 'caps', 'confirmLinkValidHours', 'waitlistOfferMinutes', 'waitlistOfferCount'];

/** True when the form shows an input (or a section line) for this path; the rest go in the banner. */
export function isShownPath(path: string, s: ReminderSettings): boolean {
  if (TOP_FIELDS.includes(path)) return true;
  const rule = /^rules\.(\d+)\.(\w+)$/.exec(path);
  if (rule) return Number(rule[1]) < s.rules.length && RULE_FIELDS.includes(rule[2]!);
  const tpl = /^templates\.(\d+)\.(\w+)$/.exec(path);
  if (tpl) return Number(tpl[1]) < s.templates.length && TEMPLATE_FIELDS.includes(tpl[2]!);
  return false;
}

const TIME = /^([01]\d|2[0-3]):[0-5]\d$/;
const whole = (n: unknown, min: number, max: number) => typeof n === 'number' && Number.isInteger(n) && n >= min && n <= max;

/**
 * Checks made before the round trip so the obvious slips show at once; the server checks all of this
 * again, and more (placeholders, opt-out wording, length by encoding).
 */
export function validateSettings(s: ReminderSettings): Record<string, string> {
  const e: Record<string, string> = {};
  s.rules.forEach((r, i) => {
    if (!r.label.trim()) e[`rules.${i}.label`] = 'Give the rule a name';
    if (r.trigger === 'before_visit' && !whole(r.hoursBefore, 1, 336)) e[`rules.${i}.hoursBefore`] = 'Whole hours, 1 to 336';
    const t = s.templates.find((x) => x.id === r.templateId);
    if (!t) e[`rules.${i}.templateId`] = 'Choose a template';
    else if (t.channel !== r.channel) e[`rules.${i}.templateId`] = `This is ${t.channel === 'sms' ? 'a text' : 'an e-mail'} template`;
  });
  s.templates.forEach((t, i) => {
    if (!t.label.trim()) e[`templates.${i}.label`] = 'Give the template a name';
    if (!t.body.trim()) e[`templates.${i}.body`] = 'Write the message';
    if (t.channel === 'email' && !t.subject?.trim()) e[`templates.${i}.subject`] = 'An e-mail needs a subject';
  });
  if (!TIME.test(s.quietHours.start)) e['quietHours.start'] = 'A time, HH:MM';
  if (!TIME.test(s.quietHours.end)) e['quietHours.end'] = 'A time, HH:MM';
  else if (TIME.test(s.quietHours.start) && s.quietHours.start >= s.quietHours.end) e['quietHours.end'] = 'Must be later than the start';
  // Upper bounds are the server's to set (it knows the exemption's limits); here only plain slips.
  if (!whole(s.caps.perDay, 1, Infinity)) e['caps.perDay'] = 'A whole number, at least 1';
  if (!whole(s.caps.perWeek, 1, Infinity)) e['caps.perWeek'] = 'A whole number, at least 1';
  else if (whole(s.caps.perDay, 1, Infinity) && s.caps.perWeek < s.caps.perDay) e['caps.perWeek'] = 'At least the daily cap';
  if (!whole(s.confirmLinkValidHours, 0, Infinity)) e.confirmLinkValidHours = 'Whole hours, 0 or more';
  if (!whole(s.waitlistOfferMinutes, 1, Infinity)) e.waitlistOfferMinutes = 'Whole minutes, at least 1';
  if (!whole(s.waitlistOfferCount, 1, Infinity)) e.waitlistOfferCount = 'A whole number, at least 1';
  return e;
}

/** A stable id that is not taken yet: lower-case letters, digits and dashes, as the outbox key needs. */
export function freshId(prefix: string, taken: string[]): string {
  let n = 1;
  while (taken.includes(`${prefix}-${n}`)) n += 1;
  return `${prefix}-${n}`;
}

export function newRule(s: ReminderSettings): ReminderRule {
  const template = s.templates.find((t) => t.channel === 'sms') ?? s.templates[0];
  return {
    id: freshId('rule', s.rules.map((r) => r.id)),
    label: 'New reminder',
    enabled: false,
    channel: template?.channel ?? 'sms',
    trigger: 'before_visit',
    hoursBefore: 24,
    onlyIfUnconfirmed: true,
    attachCalendar: false,
    templateId: template?.id ?? '',
  };
}

export function newTemplate(s: ReminderSettings, channel: MessageChannel): MessageTemplate {
  return {
    id: freshId(channel === 'sms' ? 'text' : 'email', s.templates.map((t) => t.id)),
    label: channel === 'sms' ? 'New text' : 'New e-mail',
    channel,
    subject: channel === 'email' ? 'Your visit at {practice}' : null,
    body: channel === 'sms' ? '{practice}: visit {date} {time} at {location}. {confirmHint} {optOut}' : 'Your visit at {practice} is on {date} at {time}, {location}.\n\n{confirmLink}',
  };
}
