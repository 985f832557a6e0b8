import { Inject, Injectable, NotFoundException } from '@nestjs/common';
import { InjectModel } from '@nestjs/sequelize';
import type { FeedTokenResponse } from '@ostium/shared';
import ical from 'ical-generator';
import { DateTime } from 'luxon';
import { createHash, randomBytes } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import type { RequestUser } from '../common/context/request-context.js';
import { APP_CONFIG, type AppConfig } from '../config/configuration.js';
import { User } from '../users/models/user.model.js';
import { OperatorFeedToken } from './models/operator-feed-token.model.js';

const hash = (token: string) => createHash('sha256').update(token).digest('hex');
const TOKEN = /^[A-Za-z0-9_-]{32}$/;
// The feed covers recent history and the coming half year, enough for a phone calendar.
const PAST_DAYS = 30;
const AHEAD_DAYS = 183;

const PROCEDURE_LABEL: Record<string, string> = { initial: 'initial treatment', retreatment: 'retreatment', surgery: 'surgery', consult: 'consultation', emergency: 'emergency' };

/** Initials only: the feed leaves the practice's systems, so it carries no full name. */
export const initials = (first: string, last: string) =>
  [first, last]
    .map((n) => n.trim().charAt(0).toUpperCase())
    .filter(Boolean)
    .map((c) => `${c}.`)
    .join(' ');

/** Each operator's own schedule as an RFC 5545 feed at a private, revocable address. */
@Injectable()
export class FeedsService {
  constructor(
    private readonly sequelize: Sequelize,
    @InjectModel(OperatorFeedToken) private readonly tokens: typeof OperatorFeedToken,
    @InjectModel(User) private readonly users: typeof User,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
  ) {}

  private async operatorFor(user: RequestUser, operatorId: number) {
    // An endodontist sees only their own feed; anyone else's does not exist for them.
    if (user.id !== operatorId && user.role !== 'admin') throw new NotFoundException(`Operator ${operatorId} not found (you can manage only your own feed)`);
    const op = await this.users.findOne({ where: { id: operatorId, practiceId: user.practiceId } });
    if (!op || op.role !== 'endodontist') throw new NotFoundException(`Operator ${operatorId} not found`);
    return op;
  }

  /** A new private address; any earlier one stops working. */
  async issue(user: RequestUser, operatorId: number): Promise<FeedTokenResponse> {
    await this.operatorFor(user, operatorId);
    const token = randomBytes(24).toString('base64url');
    const existing = await this.tokens.findOne({ where: { operatorId } });
    if (existing) {
      existing.tokenHash = hash(token);
      await existing.save();
    } else {
      await this.tokens.create({ practiceId: user.practiceId, operatorId, tokenHash: hash(token) });
    }
    return { url: `${this.config.publicUrl.replace(/\/$/, '')}/api/feeds/${token}.ics` };
  }

  async revoke(user: RequestUser, operatorId: number): Promise<void> {
    await this.operatorFor(user, operatorId);
    const existing = await this.tokens.findOne({ where: { operatorId } });
    if (existing) await existing.destroy();
  }

  /** The calendar text for a token, or null when the token is unknown or revoked. */
  async feed(token: string, now = new Date()): Promise<string | null> {
    if (!TOKEN.test(token)) return null;
    const row = await this.tokens.findOne({ where: { tokenHash: hash(token) } });
    if (!row) return null;
    const op = await this.users.findOne({ where: { id: row.operatorId, practiceId: row.practiceId } });
    if (!op || !op.active) return null;
    const rows = await this.sequelize.query<{
      id: number;
      start: Date;
      end: Date;
      updated_at: Date;
      state: string;
      tooth_fdi: string;
      procedure: string;
      chair: string;
      location: string;
      address: string | null;
      time_zone: string;
      first_name: string;
      last_name: string;
    }>(
      `SELECT a.id, a.start, a.end, a.updated_at, a.state, c.tooth_fdi, c.procedure, ch.name AS chair, l.name AS location, l.address, l.time_zone,
              p.first_name, p.last_name
         FROM appointments a
         JOIN cases c ON c.id = a.case_id
         JOIN referrals r ON r.id = a.referral_id
         JOIN patients p ON p.id = r.patient_id
         JOIN chairs ch ON ch.id = a.chair_id
         JOIN locations l ON l.id = a.location_id
        WHERE a.operator_id = :operatorId AND a.practice_id = :practiceId AND a.start < :to AND a.end > :from AND a.state NOT IN ('cancelled', 'no_show')
        ORDER BY a.start`,
      {
        replacements: { operatorId: op.id, practiceId: row.practiceId, from: new Date(now.getTime() - PAST_DAYS * 86_400_000), to: new Date(now.getTime() + AHEAD_DAYS * 86_400_000) },
        type: QueryTypes.SELECT,
      },
    );
    const host = new URL(this.config.publicUrl).hostname || 'ostium.invalid';
    const cal = ical({ name: `Ostium – ${op.name}`, prodId: { company: 'Ostium', product: 'Operator schedule', language: 'EN' }, ttl: 15 * 60 });
    for (const a of rows) {
      const time = DateTime.fromJSDate(new Date(a.start), { zone: a.time_zone }).toFormat('HH:mm');
      cal.createEvent({
        id: `appointment-${a.id}@${host}`,
        start: new Date(a.start),
        end: new Date(a.end),
        stamp: new Date(a.updated_at),
        summary: `${time} ${a.chair}: tooth ${a.tooth_fdi} ${PROCEDURE_LABEL[a.procedure] ?? a.procedure} (${initials(a.first_name, a.last_name)})`,
        location: a.address ? `${a.location}, ${a.address}` : a.location,
      });
    }
    return cal.toString();
  }
}
