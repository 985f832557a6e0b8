// Checks of a practice's reminder settings before they are saved. Every problem names its field
// (`rules.1.hoursBefore`, `templates.text-48h.body`) so the settings screen can point at it.
import type { MessageChannel, ReminderRule, ReminderSettings } from '@ostium/shared';
import { MESSAGE_CHANNELS, REMINDER_TRIGGERS } from '@ostium/shared';
import { DEFAULT_QUIET_WINDOW, parseHhMm, renderTemplate, TemplateError, templatePlaceholders, type SmsLength } from './rules/index.js';
import { longestValues, type PracticeNames } from './reminder-values.util.js';

export interface FieldProblem {
  field: string;
  message: string;
}

const ID = /^[a-z0-9](?:[a-z0-9-]{0,38}[a-z0-9])?$/;
const SETTINGS_KEYS = ['rules', 'templates', 'quietHours', 'caps', 'confirmLinkValidHours', 'waitlistOfferMinutes', 'waitlistOfferCount'] as const;
const RULE_KEYS = ['id', 'label', 'enabled', 'channel', 'trigger', 'hoursBefore', 'onlyIfUnconfirmed', 'attachCalendar', 'templateId'] as const;
const TEMPLATE_KEYS = ['id', 'label', 'channel', 'subject', 'body'] as const;
export const MAX_RULES = 20;
export const MAX_TEMPLATES = 20;
/** Two weeks: the planner looks 15 days ahead. */
export const MAX_HOURS_BEFORE = 336;
const MAX_EMAIL_BODY = 5000;
const MAX_SUBJECT = 200;
/** The outbox's subject column. */
const MAX_RENDERED_SUBJECT = 255;

type Obj = Record<string, unknown>;
const isObj = (v: unknown): v is Obj => typeof v === 'object' && v !== null && !Array.isArray(v);
const isWhole = (v: unknown): v is number => typeof v === 'number' && Number.isInteger(v);

/** The text at its longest for this practice's names, as the carrier counts it (worst location first). */
export interface LongestText {
  text: string;
  location: string;
  length: SmsLength;
}

/**
 * Problems of a text template (no field prefix): unknown placeholders, no opt-out, too long for one
 * segment (160 GSM-7 / 70 UCS-2, 3GPP TS 23.038/23.040) with the longest values the practice can produce.
 */
export function textTemplateProblems(body: string, names: PracticeNames): { problems: string[]; longest: LongestText | null } {
  const { unknown } = templatePlaceholders(body);
  if (unknown.length) return { problems: [new TemplateError(`unknown placeholder${unknown.length > 1 ? 's' : ''}: ${unknown.map((u) => `{${u}}`).join(', ')}`).message], longest: null };
  let longest: LongestText | null = null;
  for (const { location, values } of longestValues(names, 'sms')) {
    try {
      const r = renderTemplate(body, values);
      // Over-limit first: a UCS-2 text of 80 units is worse than a GSM-7 one of 150.
      const over = r.length.units - r.length.limit;
      if (!longest || over > longest.length.units - longest.length.limit) longest = { text: r.text, location, length: r.length };
    } catch (e) {
      if (e instanceof TemplateError) return { problems: [e.message], longest: null };
      throw e;
    }
  }
  const problems: string[] = [];
  if (longest && longest.length.segments > 1) {
    problems.push(
      `too long for one text: ${longest.length.units} of ${longest.length.limit} characters (${longest.length.encoding}) with the longest names ` +
        `(“${names.practice}”, “${longest.location}”, a date like “Wed 30 Sep”, “12:30 PM” and the full link)`,
    );
  }
  return { problems, longest };
}

/** Problems of an e-mail subject or body (no field prefix). */
function emailPartProblems(part: 'subject' | 'body', value: string, names: PracticeNames): string[] {
  const { unknown } = templatePlaceholders(value);
  if (unknown.length) return [`unknown placeholder${unknown.length > 1 ? 's' : ''}: ${unknown.map((u) => `{${u}}`).join(', ')}`];
  if (part === 'subject') {
    const longest = Math.max(...longestValues(names, 'email').map(({ values }) => value.replace(/\{([^{}]*)\}/g, (_, n: string) => values[n.trim() as keyof typeof values] ?? '').length));
    if (longest > MAX_RENDERED_SUBJECT) return [`the subject can reach ${longest} characters; keep it under ${MAX_RENDERED_SUBJECT}`];
  }
  return [];
}

function unknownKeys(value: Obj, known: readonly string[], path: string, problems: FieldProblem[]) {
  for (const k of Object.keys(value)) {
    if (!known.includes(k)) problems.push({ field: path ? `${path}.${k}` : k, message: `${path ? `${path}.${k}` : k} is not a known field` });
  }
}

function need(problems: FieldProblem[], field: string, ok: boolean, message: string) {
  if (!ok) problems.push({ field, message: `${field} ${message}` });
  return ok;
}

function text(problems: FieldProblem[], field: string, v: unknown, max: number): v is string {
  return need(problems, field, typeof v === 'string' && v.trim().length > 0 && v.length <= max, `must be text of 1–${max} characters`);
}

function checkTemplates(value: unknown, names: PracticeNames, problems: FieldProblem[]): Map<string, MessageChannel> {
  const channels = new Map<string, MessageChannel>();
  if (!need(problems, 'templates', Array.isArray(value) && value.length >= 1 && value.length <= MAX_TEMPLATES, `must be a list of 1–${MAX_TEMPLATES} templates`)) return channels;
  (value as unknown[]).forEach((t, i) => {
    if (!isObj(t)) {
      problems.push({ field: `templates.${i}`, message: `templates.${i} must be a template object` });
      return;
    }
    const idOk = typeof t.id === 'string' && ID.test(t.id) && !channels.has(t.id);
    // Named by id when it has a usable one (`templates.text-48h.body`), else by position.
    const path = idOk ? `templates.${t.id as string}` : `templates.${i}`;
    if (typeof t.id === 'string' && ID.test(t.id) && channels.has(t.id)) problems.push({ field: `templates.${i}.id`, message: `templates.${i}.id “${t.id}” is used by another template` });
    else need(problems, `templates.${i}.id`, idOk, 'must be 1–40 lower-case letters, digits or dashes');
    unknownKeys(t, TEMPLATE_KEYS, path, problems);
    text(problems, `${path}.label`, t.label, 80);
    const channelOk = need(problems, `${path}.channel`, MESSAGE_CHANNELS.includes(t.channel as MessageChannel), `must be one of ${MESSAGE_CHANNELS.join(', ')}`);
    if (idOk && channelOk) channels.set(t.id as string, t.channel as MessageChannel);
    if (!channelOk) return;
    if (t.channel === 'sms') {
      need(problems, `${path}.subject`, t.subject === null || t.subject === undefined, 'must be null: a text has no subject');
      if (need(problems, `${path}.body`, typeof t.body === 'string' && t.body.trim().length > 0 && t.body.length <= 1000, 'must be text of 1–1000 characters')) {
        for (const p of textTemplateProblems(t.body as string, names).problems) problems.push({ field: `${path}.body`, message: `${path}.body: ${p}` });
      }
    } else {
      if (text(problems, `${path}.subject`, t.subject, MAX_SUBJECT)) {
        for (const p of emailPartProblems('subject', t.subject, names)) problems.push({ field: `${path}.subject`, message: `${path}.subject: ${p}` });
      }
      if (text(problems, `${path}.body`, t.body, MAX_EMAIL_BODY)) {
        for (const p of emailPartProblems('body', t.body, names)) problems.push({ field: `${path}.body`, message: `${path}.body: ${p}` });
      }
    }
  });
  return channels;
}

function checkRules(value: unknown, templates: Map<string, MessageChannel>, problems: FieldProblem[]) {
  if (!need(problems, 'rules', Array.isArray(value) && value.length <= MAX_RULES, `must be a list of at most ${MAX_RULES} rules`)) return;
  const ids = new Set<string>();
  (value as unknown[]).forEach((r, i) => {
    const path = `rules.${i}`;
    if (!isObj(r)) {
      problems.push({ field: path, message: `${path} must be a rule object` });
      return;
    }
    unknownKeys(r, RULE_KEYS, path, problems);
    if (need(problems, `${path}.id`, typeof r.id === 'string' && ID.test(r.id), 'must be 1–40 lower-case letters, digits or dashes')) {
      if (ids.has(r.id as string)) problems.push({ field: `${path}.id`, message: `${path}.id “${r.id as string}” is used by another rule` });
      ids.add(r.id as string);
    }
    text(problems, `${path}.label`, r.label, 80);
    need(problems, `${path}.enabled`, typeof r.enabled === 'boolean', 'must be true or false');
    const channelOk = need(problems, `${path}.channel`, MESSAGE_CHANNELS.includes(r.channel as MessageChannel), `must be one of ${MESSAGE_CHANNELS.join(', ')}`);
    const triggerOk = need(problems, `${path}.trigger`, REMINDER_TRIGGERS.includes(r.trigger as ReminderRule['trigger']), `must be one of ${REMINDER_TRIGGERS.join(', ')}`);
    if (triggerOk && r.trigger === 'before_visit') {
      need(problems, `${path}.hoursBefore`, isWhole(r.hoursBefore) && r.hoursBefore >= 1 && r.hoursBefore <= MAX_HOURS_BEFORE, `must be a whole number of hours from 1 to ${MAX_HOURS_BEFORE}`);
    }
    if (triggerOk && r.trigger === 'on_booking') need(problems, `${path}.hoursBefore`, r.hoursBefore === null, 'must be null for a rule that fires on booking');
    need(problems, `${path}.onlyIfUnconfirmed`, typeof r.onlyIfUnconfirmed === 'boolean', 'must be true or false');
    if (need(problems, `${path}.attachCalendar`, typeof r.attachCalendar === 'boolean', 'must be true or false') && channelOk && r.channel === 'sms' && r.attachCalendar) {
      problems.push({ field: `${path}.attachCalendar`, message: `${path}.attachCalendar: only an e-mail can carry a calendar file` });
    }
    if (need(problems, `${path}.templateId`, typeof r.templateId === 'string' && r.templateId.length > 0, 'must name a template')) {
      const channel = templates.get(r.templateId as string);
      if (!channel) problems.push({ field: `${path}.templateId`, message: `${path}.templateId: there is no template “${r.templateId as string}”` });
      else if (channelOk && channel !== r.channel) {
        problems.push({
          field: `${path}.templateId`,
          message: `${path}.templateId: template “${r.templateId as string}” is for ${channel === 'sms' ? 'texts' : 'e-mail'}, the rule sends ${r.channel === 'sms' ? 'a text' : 'an e-mail'}`,
        });
      }
    }
  });
}

function checkQuietHours(value: unknown, problems: FieldProblem[]) {
  if (!need(problems, 'quietHours', isObj(value), 'must be an object with start and end')) return;
  const q = value as Obj;
  unknownKeys(q, ['start', 'end'], 'quietHours', problems);
  const minutes: Partial<Record<'start' | 'end', number>> = {};
  for (const k of ['start', 'end'] as const) {
    try {
      if (typeof q[k] !== 'string') throw new RangeError('');
      minutes[k] = parseHhMm(q[k] as string);
    } catch {
      problems.push({ field: `quietHours.${k}`, message: `quietHours.${k} must be a time HH:MM (00:00–23:59)` });
    }
  }
  const { start, end } = minutes;
  const earliest = parseHhMm(DEFAULT_QUIET_WINDOW.start);
  const latest = parseHhMm(DEFAULT_QUIET_WINDOW.end);
  // 47 CFR 64.1200(c)(1): a practice may narrow 08:00–21:00, never widen it.
  if (start !== undefined && start < earliest) problems.push({ field: 'quietHours.start', message: `quietHours.start: texts may not go before ${DEFAULT_QUIET_WINDOW.start} (47 CFR 64.1200(c)(1))` });
  if (end !== undefined && end > latest) problems.push({ field: 'quietHours.end', message: `quietHours.end: texts may not go after ${DEFAULT_QUIET_WINDOW.end} (47 CFR 64.1200(c)(1))` });
  if (start !== undefined && end !== undefined && start >= end) problems.push({ field: 'quietHours.end', message: 'quietHours.end must be later than quietHours.start' });
}

function checkCaps(value: unknown, problems: FieldProblem[]) {
  if (!need(problems, 'caps', isObj(value), 'must be an object with perDay and perWeek')) return;
  const c = value as Obj;
  unknownKeys(c, ['perDay', 'perWeek'], 'caps', problems);
  const day = need(problems, 'caps.perDay', isWhole(c.perDay) && c.perDay >= 1 && c.perDay <= 5, 'must be a whole number from 1 to 5');
  const week = need(problems, 'caps.perWeek', isWhole(c.perWeek) && c.perWeek >= 1 && c.perWeek <= 20, 'must be a whole number from 1 to 20');
  if (day && week && (c.perWeek as number) < (c.perDay as number)) problems.push({ field: 'caps.perWeek', message: 'caps.perWeek must be at least caps.perDay' });
}

/** Every problem of a settings object; none means it can be saved as it is. */
export function reminderSettingsProblems(value: unknown, names: PracticeNames): FieldProblem[] {
  const problems: FieldProblem[] = [];
  if (!isObj(value)) return [{ field: 'settings', message: 'settings must be an object' }];
  unknownKeys(value, SETTINGS_KEYS, '', problems);
  for (const k of SETTINGS_KEYS) if (!(k in value)) problems.push({ field: k, message: `${k} is missing` });
  const templates = 'templates' in value ? checkTemplates(value.templates, names, problems) : new Map<string, MessageChannel>();
  if ('rules' in value) checkRules(value.rules, templates, problems);
  if ('quietHours' in value) checkQuietHours(value.quietHours, problems);
  if ('caps' in value) checkCaps(value.caps, problems);
  if ('confirmLinkValidHours' in value) need(problems, 'confirmLinkValidHours', isWhole(value.confirmLinkValidHours) && value.confirmLinkValidHours >= 0 && value.confirmLinkValidHours <= 720, 'must be a whole number of hours from 0 to 720');
  if ('waitlistOfferMinutes' in value) need(problems, 'waitlistOfferMinutes', isWhole(value.waitlistOfferMinutes) && value.waitlistOfferMinutes >= 5 && value.waitlistOfferMinutes <= 1440, 'must be a whole number of minutes from 5 to 1440');
  if ('waitlistOfferCount' in value) need(problems, 'waitlistOfferCount', isWhole(value.waitlistOfferCount) && value.waitlistOfferCount >= 1 && value.waitlistOfferCount <= 20, 'must be a whole number from 1 to 20');
  return problems;
}

/** A checked settings object with only the known fields, in a stable order (what gets stored). */
export function normalizeSettings(s: ReminderSettings): ReminderSettings {
  return {
    rules: s.rules.map((r) => ({
      id: r.id,
      label: r.label.trim(),
      enabled: r.enabled,
      channel: r.channel,
      trigger: r.trigger,
      hoursBefore: r.trigger === 'before_visit' ? r.hoursBefore : null,
      onlyIfUnconfirmed: r.onlyIfUnconfirmed,
      attachCalendar: r.attachCalendar,
      templateId: r.templateId,
    })),
    templates: s.templates.map((t) => ({ id: t.id, label: t.label.trim(), channel: t.channel, subject: t.channel === 'email' ? t.subject : null, body: t.body })),
    quietHours: { start: s.quietHours.start, end: s.quietHours.end },
    caps: { perDay: s.caps.perDay, perWeek: s.caps.perWeek },
    confirmLinkValidHours: s.confirmLinkValidHours,
    waitlistOfferMinutes: s.waitlistOfferMinutes,
    waitlistOfferCount: s.waitlistOfferCount,
  };
}
