import { BadRequestException, ConflictException, Inject, Injectable } from '@nestjs/common';
import { InjectModel } from '@nestjs/sequelize';
import type { ReminderSettings, ReminderSettingsResponse, TemplatePreviewRequest, TemplatePreviewResponse } from '@ostium/shared';
import { DateTime } from 'luxon';
import { QueryTypes, type Transaction } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import type { RequestUser } from '../common/context/request-context.js';
import { APP_CONFIG, type AppConfig } from '../config/configuration.js';
import { ReminderSettingsRow } from '../messaging/models/reminder-settings.model.js';
import { PracticesService } from '../practices/practices.service.js';
import { makeVisitToken, visitLink } from './confirm-link.util.js';
import { DEFAULT_REMINDER_SETTINGS, PLACEHOLDER_MEANINGS } from './default-reminder-settings.js';
import type { SaveReminderSettingsDto, TemplatePreviewDto } from './dto/reminder-settings.dto.js';
import { normalizeSettings, reminderSettingsProblems, textTemplateProblems, type FieldProblem } from './reminder-settings.util.js';
import { fillPlaceholders, placeholderValues, type PracticeNames } from './reminder-values.util.js';
import { ReminderVisitsService } from './reminder-visits.service.js';
import { smsLength, templatePlaceholders } from './rules/index.js';

/** Where the practice has no location yet: a neutral zone for sample dates. */
const FALLBACK_ZONE = 'America/New_York';
const EMAIL_BODY_LIMIT = 5000;

const badRequest = (problems: FieldProblem[]) => new BadRequestException({ message: problems.map((p) => p.message).join('; '), errors: problems });

/** The practice's reminder rules, templates, quiet hours and caps (one versioned row per practice). */
@Injectable()
export class ReminderSettingsService {
  constructor(
    @InjectModel(ReminderSettingsRow) private readonly rows: typeof ReminderSettingsRow,
    private readonly sequelize: Sequelize,
    private readonly practices: PracticesService,
    private readonly visits: ReminderVisitsService,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
  ) {}

  /** The settings in force: the saved ones, or the defaults before the first save (reads never write). */
  async current(practiceId: number, transaction?: Transaction): Promise<ReminderSettings> {
    const row = await this.rows.findByPk(practiceId, { transaction });
    // Settings saved before a field existed get that field's default.
    return row ? { ...structuredClone(DEFAULT_REMINDER_SETTINGS), ...row.settings } : structuredClone(DEFAULT_REMINDER_SETTINGS);
  }

  async names(practiceId: number): Promise<PracticeNames> {
    const [practice, locations] = await Promise.all([this.practices.get(practiceId), this.visits.locationNames(practiceId)]);
    return { practice: practice.name, locations, publicUrl: this.config.publicUrl };
  }

  /** The row, created from the defaults on first read. */
  private async ensureRow(practiceId: number, transaction?: Transaction): Promise<ReminderSettingsRow> {
    const [row] = await this.rows.findOrCreate({
      where: { practiceId },
      defaults: { practiceId, settings: structuredClone(DEFAULT_REMINDER_SETTINGS), version: 1, updatedBy: null },
      transaction,
    });
    return row;
  }

  private async respond(row: ReminderSettingsRow): Promise<ReminderSettingsResponse> {
    let updatedBy: string | null = null;
    if (row.updatedBy) {
      const [u] = await this.sequelize.query<{ name: string }>('SELECT name FROM users WHERE id = :id', { replacements: { id: row.updatedBy }, type: QueryTypes.SELECT });
      updatedBy = u?.name ?? null;
    }
    return {
      settings: { ...structuredClone(DEFAULT_REMINDER_SETTINGS), ...row.settings },
      version: row.version,
      updatedAt: row.updatedBy ? row.updatedAt.toISOString() : null,
      updatedBy,
      placeholders: PLACEHOLDER_MEANINGS,
    };
  }

  async get(practiceId: number): Promise<ReminderSettingsResponse> {
    return this.respond(await this.ensureRow(practiceId));
  }

  /** Saves the whole settings object over the version the caller read; the audit hooks record the change. */
  async save(practiceId: number, user: RequestUser, dto: SaveReminderSettingsDto): Promise<ReminderSettingsResponse> {
    const problems = reminderSettingsProblems(dto.settings, await this.names(practiceId));
    if (problems.length) throw badRequest(problems);
    const next = normalizeSettings(dto.settings as ReminderSettings);
    const row = await this.sequelize.transaction(async (transaction) => {
      await this.ensureRow(practiceId, transaction);
      const current = await this.rows.findByPk(practiceId, { transaction, lock: transaction.LOCK.UPDATE });
      if (!current) throw new Error(`reminder settings of practice ${practiceId} vanished`);
      if (current.version !== dto.version) {
        throw new ConflictException(`The reminder settings were changed by someone else (version ${current.version}, you had ${dto.version}); reload them and try again`);
      }
      current.settings = next;
      current.version = current.version + 1;
      current.updatedBy = user.id;
      // Always recorded, even when nothing but the version changed.
      current.changed('settings', true);
      await current.save({ transaction });
      return current;
    });
    return this.respond(row);
  }

  /** A template filled with the practice's real names and its next visit, counted as the carrier counts it. */
  async preview(practiceId: number, dto: TemplatePreviewDto | TemplatePreviewRequest, now = new Date()): Promise<TemplatePreviewResponse> {
    const names = await this.names(practiceId);
    const next = await this.visits.nextVisit(practiceId, now);
    const zone = next?.location.timeZone ?? FALLBACK_ZONE;
    const start = next?.start ?? DateTime.fromMillis(now.getTime(), { zone }).plus({ days: 1 }).set({ hour: 9, minute: 0, second: 0, millisecond: 0 }).toJSDate();
    // A real token's length, signed with a key that no link check accepts: a preview confirms nothing.
    const token = makeVisitToken(`${this.config.messaging.linkSecret}:preview-only`, next?.id ?? 1, start);
    const values = placeholderValues({
      channel: dto.channel,
      practice: names.practice,
      location: next?.location.name ?? names.locations[0] ?? 'Main office',
      start,
      zone,
      confirmLink: visitLink(this.config.publicUrl, token),
    });
    const text = fillPlaceholders(dto.body, values);
    const subject = dto.channel === 'email' && dto.subject ? fillPlaceholders(dto.subject, values) : null;
    const problems: string[] = [];
    if (dto.channel === 'sms') {
      problems.push(...textTemplateProblems(dto.body, names).problems);
      const length = smsLength(text);
      return { subject: null, text, encoding: length.encoding, characters: length.units, limit: length.limit, segments: length.segments, fitsOneSegment: length.segments <= 1, problems };
    }
    for (const [part, value] of [['subject', dto.subject ?? ''], ['body', dto.body]] as const) {
      const { unknown } = templatePlaceholders(value);
      if (unknown.length) problems.push(`${part}: unknown placeholder${unknown.length > 1 ? 's' : ''}: ${unknown.map((u) => `{${u}}`).join(', ')}`);
    }
    if (!dto.subject?.trim()) problems.push('subject: an e-mail needs a subject');
    const length = smsLength(text);
    // E-mail has no segments; the limit is the template's length limit.
    return { subject, text, encoding: length.encoding, characters: text.length, limit: EMAIL_BODY_LIMIT, segments: 1, fitsOneSegment: text.length <= EMAIL_BODY_LIMIT, problems };
  }
}
