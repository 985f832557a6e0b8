import { BadRequestException, ConflictException, Injectable, NotFoundException } from '@nestjs/common';
import { InjectModel } from '@nestjs/sequelize';
import type { ReferringDentist } from '@ostium/shared';
import { col, fn, type Transaction, type WhereOptions } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import { toE164 } from '../patients/dto/field-validators.util.js';
import { contactSearchWhere } from '../patients/search.util.js';
import { ReferralRow } from '../referrals/models/referral.model.js';
import type { CreateReferringDentistDto, UpdateReferringDentistDto } from './dto/referring-dentist.dto.js';
import { ReferringDentistRow } from './models/referring-dentist.model.js';

export function mapReferringDentist(d: ReferringDentistRow, referralCount: number): ReferringDentist {
  return {
    id: d.id,
    name: d.name,
    practiceName: d.practiceName,
    email: d.email,
    phone: d.phone,
    address: d.address,
    letterChannel: d.letterChannel,
    notes: d.notes,
    referralCount,
    createdAt: d.createdAt.toISOString(),
  };
}

// Fields a merge copies from the removed record when the kept one has none.
const FILLABLE = ['practiceName', 'email', 'phone', 'address', 'notes'] as const;

@Injectable()
export class ReferringDentistsService {
  constructor(
    private readonly sequelize: Sequelize,
    @InjectModel(ReferringDentistRow) private readonly dentists: typeof ReferringDentistRow,
    @InjectModel(ReferralRow) private readonly referrals: typeof ReferralRow,
  ) {}

  /** Referral counts for these dentists in one query. */
  async referralCounts(ids: number[], transaction?: Transaction): Promise<Map<number, number>> {
    if (!ids.length) return new Map();
    const rows = (await this.referrals.findAll({
      attributes: ['referringDentistId', [fn('COUNT', col('id')), 'n']],
      where: { referringDentistId: ids },
      group: ['referringDentistId'],
      raw: true,
      transaction,
    })) as unknown as { referringDentistId: number; n: number | string }[];
    return new Map(rows.map((r) => [Number(r.referringDentistId), Number(r.n)]));
  }

  async mapOne(d: ReferringDentistRow, transaction?: Transaction): Promise<ReferringDentist> {
    const counts = await this.referralCounts([d.id], transaction);
    return mapReferringDentist(d, counts.get(d.id) ?? 0);
  }

  async search(practiceId: number, q?: string, limit = 50): Promise<ReferringDentist[]> {
    // Words of the dentist's or the practice's name: "farrow larchmere" finds both.
    const match = contactSearchWhere(q, ['name', 'practiceName']);
    const where: WhereOptions = match ? { practiceId, ...match } : { practiceId };
    const rows = await this.dentists.findAll({ where, order: [['name', 'ASC'], ['id', 'ASC']], limit });
    const counts = await this.referralCounts(rows.map((r) => r.id));
    return rows.map((r) => mapReferringDentist(r, counts.get(r.id) ?? 0));
  }

  async find(practiceId: number, id: number, transaction?: Transaction, lock = false): Promise<ReferringDentistRow> {
    const d = await this.dentists.findOne({ where: { id, practiceId }, transaction, ...(lock && transaction ? { lock: transaction.LOCK.UPDATE } : {}) });
    if (!d) throw new NotFoundException(`Referring dentist ${id} not found`);
    return d;
  }

  async get(practiceId: number, id: number): Promise<ReferringDentist> {
    return this.mapOne(await this.find(practiceId, id));
  }

  async findByName(practiceId: number, name: string): Promise<ReferringDentistRow | null> {
    return this.dentists.findOne({ where: { practiceId, name }, order: [['id', 'ASC']] });
  }

  async createRow(practiceId: number, dto: CreateReferringDentistDto, transaction?: Transaction): Promise<ReferringDentistRow> {
    return this.dentists.create(
      {
        practiceId,
        name: dto.name,
        practiceName: dto.practiceName ?? null,
        email: dto.email ?? null,
        phone: toE164(dto.phone),
        address: dto.address ?? null,
        letterChannel: dto.letterChannel ?? 'email',
        notes: dto.notes ?? null,
      },
      { transaction },
    );
  }

  async create(practiceId: number, dto: CreateReferringDentistDto): Promise<ReferringDentist> {
    return mapReferringDentist(await this.createRow(practiceId, dto), 0);
  }

  async update(practiceId: number, id: number, dto: UpdateReferringDentistDto): Promise<ReferringDentist> {
    const d = await this.find(practiceId, id);
    if (dto.name !== undefined) d.name = dto.name;
    if (dto.practiceName !== undefined) d.practiceName = dto.practiceName;
    if (dto.email !== undefined) d.email = dto.email;
    if (dto.phone !== undefined) d.phone = toE164(dto.phone);
    if (dto.address !== undefined) d.address = dto.address;
    if (dto.letterChannel !== undefined) d.letterChannel = dto.letterChannel;
    if (dto.notes !== undefined) d.notes = dto.notes;
    await d.save();
    return this.mapOne(d);
  }

  async remove(practiceId: number, id: number): Promise<void> {
    const d = await this.find(practiceId, id);
    const n = (await this.referralCounts([id])).get(id) ?? 0;
    if (n) throw new ConflictException(`Referring dentist ${id} has ${n} referral${n === 1 ? '' : 's'}; merge the record into another instead of deleting it`);
    await d.destroy();
  }

  /**
   * The same dentist entered twice: `otherId`'s referrals move to `id`, blank fields of `id` are filled
   * from the other, and the other record is deleted, all in one transaction.
   */
  async merge(practiceId: number, id: number, otherId: number): Promise<ReferringDentist> {
    if (id === otherId) {
      throw new BadRequestException({ message: 'A referring dentist cannot be merged with itself', errors: [{ field: 'otherId', message: 'must be a different record' }] });
    }
    return this.sequelize.transaction(async (transaction) => {
      // One locking read in id order, so two merges of the same pair cannot deadlock or interleave.
      const rows = await this.dentists.findAll({ where: { practiceId, id: [id, otherId] }, order: [['id', 'ASC']], lock: transaction.LOCK.UPDATE, transaction });
      const keep = rows.find((r) => r.id === id);
      const other = rows.find((r) => r.id === otherId);
      if (!keep) throw new NotFoundException(`Referring dentist ${id} not found`);
      if (!other) throw new BadRequestException({ message: `Referring dentist ${otherId} not found`, errors: [{ field: 'otherId', message: 'does not exist' }] });
      await this.referrals.update({ referringDentistId: keep.id }, { where: { referringDentistId: other.id, practiceId }, individualHooks: true, transaction });
      for (const f of FILLABLE) if (keep[f] == null && other[f] != null) keep.set(f, other[f]);
      await keep.save({ transaction });
      await other.destroy({ transaction });
      return this.mapOne(keep, transaction);
    });
  }
}
