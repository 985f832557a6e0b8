import { ConflictException, Injectable, NotFoundException } from '@nestjs/common';
import { InjectModel } from '@nestjs/sequelize';
import type { Patient } from '@ostium/shared';
import { Op, type Transaction, type WhereOptions } from 'sequelize';
import { ReferralRow } from '../referrals/models/referral.model.js';
import { DuplicatePatientException } from './duplicate-patient.exception.js';
import type { CreatePatientDto, UpdatePatientDto } from './dto/patient.dto.js';
import { toE164 } from './dto/field-validators.util.js';
import { PatientRow } from './models/patient.model.js';
import { contactSearchWhere } from './search.util.js';

export function mapPatient(p: PatientRow): Patient {
  return {
    id: p.id,
    firstName: p.firstName,
    lastName: p.lastName,
    dateOfBirth: p.dateOfBirth,
    phone: p.phone,
    email: p.email,
    preferredChannel: p.preferredChannel,
    smsConsent: p.smsConsent,
    smsConsentAt: p.smsConsentAt ? p.smsConsentAt.toISOString() : null,
    smsConsentSource: p.smsConsentSource,
    timeZone: p.timeZone,
    notes: p.notes,
    createdAt: p.createdAt.toISOString(),
  };
}

@Injectable()
export class PatientsService {
  constructor(
    @InjectModel(PatientRow) private readonly patients: typeof PatientRow,
    @InjectModel(ReferralRow) private readonly referrals: typeof ReferralRow,
  ) {}

  async search(practiceId: number, q?: string, limit = 50): Promise<Patient[]> {
    const match = contactSearchWhere(q, ['firstName', 'lastName']);
    const where: WhereOptions = match ? { practiceId, ...match } : { practiceId };
    const rows = await this.patients.findAll({ where, order: [['lastName', 'ASC'], ['firstName', 'ASC'], ['id', 'ASC']], limit });
    return rows.map(mapPatient);
  }

  async find(practiceId: number, id: number, transaction?: Transaction): Promise<PatientRow> {
    const p = await this.patients.findOne({ where: { id, practiceId }, transaction });
    if (!p) throw new NotFoundException(`Patient ${id} not found`);
    return p;
  }

  async get(practiceId: number, id: number): Promise<Patient> {
    return mapPatient(await this.find(practiceId, id));
  }

  /** Patients with this first and last name (case-insensitive) and date of birth, other than `exceptId`. */
  async sameNameAndBirth(
    practiceId: number,
    v: { firstName: string; lastName: string; dateOfBirth: string },
    exceptId?: number,
    transaction?: Transaction,
  ): Promise<Patient[]> {
    const fn = this.patients.sequelize!.fn;
    const col = this.patients.sequelize!.col;
    const where = this.patients.sequelize!.where;
    const rows = await this.patients.findAll({
      where: {
        practiceId,
        dateOfBirth: v.dateOfBirth,
        ...(exceptId ? { id: { [Op.ne]: exceptId } } : {}),
        [Op.and]: [
          where(fn('LOWER', col('first_name')), v.firstName.trim().toLowerCase()),
          where(fn('LOWER', col('last_name')), v.lastName.trim().toLowerCase()),
        ],
      },
      order: [['id', 'ASC']],
      transaction,
    });
    return rows.map(mapPatient);
  }

  /**
   * Creates a patient; refuses with DuplicatePatientException (409) when one with the same name and
   * date of birth exists, unless `confirmNew`. `defaultTimeZone` is the referral location's zone.
   */
  async createRow(practiceId: number, dto: CreatePatientDto, opts: { transaction?: Transaction; defaultTimeZone?: string } = {}): Promise<PatientRow> {
    if (!dto.confirmNew) {
      const existing = await this.sameNameAndBirth(practiceId, dto, undefined, opts.transaction);
      if (existing.length) throw new DuplicatePatientException(existing);
    }
    const consent = dto.smsConsent === true;
    return this.patients.create(
      {
        practiceId,
        firstName: dto.firstName,
        lastName: dto.lastName,
        dateOfBirth: dto.dateOfBirth,
        phone: toE164(dto.phone),
        email: dto.email ?? null,
        preferredChannel: dto.preferredChannel ?? 'text',
        smsConsent: consent,
        // The server's clock, not the client's, says when consent was recorded.
        smsConsentAt: consent ? new Date() : null,
        smsConsentSource: consent ? (dto.smsConsentSource ?? null) : null,
        timeZone: dto.timeZone ?? opts.defaultTimeZone ?? null,
        notes: dto.notes ?? null,
      },
      { transaction: opts.transaction },
    );
  }

  async create(practiceId: number, dto: CreatePatientDto): Promise<Patient> {
    return mapPatient(await this.createRow(practiceId, dto));
  }

  async update(practiceId: number, id: number, dto: UpdatePatientDto): Promise<Patient> {
    const p = await this.find(practiceId, id);
    const next = { firstName: dto.firstName ?? p.firstName, lastName: dto.lastName ?? p.lastName, dateOfBirth: dto.dateOfBirth ?? p.dateOfBirth };
    const identityChanged =
      next.firstName.toLowerCase() !== p.firstName.toLowerCase() || next.lastName.toLowerCase() !== p.lastName.toLowerCase() || next.dateOfBirth !== p.dateOfBirth;
    if (identityChanged && !dto.confirmNew) {
      const existing = await this.sameNameAndBirth(practiceId, next, p.id);
      if (existing.length) throw new DuplicatePatientException(existing);
    }
    p.firstName = next.firstName;
    p.lastName = next.lastName;
    p.dateOfBirth = next.dateOfBirth;
    if (dto.phone !== undefined) p.phone = toE164(dto.phone);
    if (dto.email !== undefined) p.email = dto.email;
    if (dto.preferredChannel !== undefined) p.preferredChannel = dto.preferredChannel;
    if (dto.smsConsent !== undefined && dto.smsConsent !== p.smsConsent) {
      p.smsConsent = dto.smsConsent;
      p.smsConsentAt = dto.smsConsent ? new Date() : null;
      if (!dto.smsConsent) p.smsConsentSource = null;
    }
    if (dto.smsConsentSource !== undefined && p.smsConsent) p.smsConsentSource = dto.smsConsentSource;
    if (dto.timeZone !== undefined) p.timeZone = dto.timeZone;
    if (dto.notes !== undefined) p.notes = dto.notes;
    await p.save();
    return mapPatient(p);
  }

  /** Fills the time zone from the referral's location when the patient has none yet. */
  async defaultTimeZone(patient: PatientRow, timeZone: string, transaction?: Transaction) {
    if (patient.timeZone) return;
    patient.timeZone = timeZone;
    await patient.save({ transaction });
  }

  async remove(practiceId: number, id: number): Promise<void> {
    const p = await this.find(practiceId, id);
    const referrals = await this.referrals.count({ where: { patientId: id } });
    if (referrals) {
      throw new ConflictException(`Patient ${id} has ${referrals} referral${referrals === 1 ? '' : 's'} and cannot be deleted`);
    }
    await p.destroy();
  }
}
