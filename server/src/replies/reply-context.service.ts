import { Injectable } from '@nestjs/common';
import { InjectModel } from '@nestjs/sequelize';
import { formatPhone, type MessageTemplate, type QuietHours, type ReminderSettings } from '@ostium/shared';
import { QueryTypes, type Transaction } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import { ReminderSettingsRow } from '../messaging/models/reminder-settings.model.js';
import { PracticesService } from '../practices/practices.service.js';
import { DEFAULT_REMINDER_SETTINGS } from '../reminders/default-reminder-settings.js';

/** An sms template with this id in the practice's reminder settings turns on a thank-you for "C"/"YES". */
export const CONFIRM_THANKS_TEMPLATE_ID = 'confirm-thanks';

export interface ReplySettings {
  quietHours: QuietHours;
  waitlistOfferMinutes: number;
  waitlistOfferCount: number;
  /** Null (the default): a confirmation gets no text back — texts are kept few. */
  confirmThanks: MessageTemplate | null;
}

// Used while a practice has saved no reminder settings yet (the reminder settings screen shows the same).
export const REPLY_SETTING_DEFAULTS: Omit<ReplySettings, 'confirmThanks'> = {
  quietHours: DEFAULT_REMINDER_SETTINGS.quietHours,
  waitlistOfferMinutes: DEFAULT_REMINDER_SETTINGS.waitlistOfferMinutes,
  waitlistOfferCount: DEFAULT_REMINDER_SETTINGS.waitlistOfferCount,
};

export interface PracticeContact {
  id: number;
  name: string;
  /** Display form, e.g. "(202) 555-0100". */
  phone: string | null;
}

/** The practice's name and number and the few reminder settings replies depend on. */
@Injectable()
export class ReplyContextService {
  constructor(
    private readonly sequelize: Sequelize,
    private readonly practices: PracticesService,
    @InjectModel(ReminderSettingsRow) private readonly settingsRows: typeof ReminderSettingsRow,
  ) {}

  /** Inside a transaction pass it: a second connection could wait on a pool that transactions like it hold. */
  async practice(practiceId: number, transaction?: Transaction): Promise<PracticeContact> {
    const p = await this.practices.get(practiceId, transaction);
    let phone: string | null = null;
    if (p.phone) {
      try {
        phone = formatPhone(p.phone);
      } catch {
        phone = p.phone;
      }
    }
    return { id: p.id, name: p.name, phone };
  }

  async settings(practiceId: number, transaction?: Transaction): Promise<ReplySettings> {
    const row = await this.settingsRows.findByPk(practiceId, { transaction });
    const raw = row?.settings;
    const s = (typeof raw === 'string' ? JSON.parse(raw) : raw) as Partial<ReminderSettings> | undefined;
    const positive = (v: unknown, d: number) => (typeof v === 'number' && Number.isFinite(v) && v > 0 ? v : d);
    return {
      quietHours: s?.quietHours ?? REPLY_SETTING_DEFAULTS.quietHours,
      waitlistOfferMinutes: positive(s?.waitlistOfferMinutes, REPLY_SETTING_DEFAULTS.waitlistOfferMinutes),
      waitlistOfferCount: Math.floor(positive(s?.waitlistOfferCount, REPLY_SETTING_DEFAULTS.waitlistOfferCount)),
      confirmThanks: s?.templates?.find((t) => t.id === CONFIRM_THANKS_TEMPLATE_ID && t.channel === 'sms') ?? null,
    };
  }

  /** The practice an unknown sender's text is filed under: the deployment's first practice. */
  async defaultPracticeId(): Promise<number> {
    const [row] = await this.sequelize.query<{ id: number }>('SELECT MIN(id) AS id FROM practices', { type: QueryTypes.SELECT });
    if (!row?.id) throw new Error('no practice exists to file the text under');
    return row.id;
  }
}
