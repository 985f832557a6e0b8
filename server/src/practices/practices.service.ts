import { Injectable, NotFoundException } from '@nestjs/common';
import { InjectModel } from '@nestjs/sequelize';
import type { Transaction } from 'sequelize';
import type { LocationSummary, OpeningHours, PracticeSettings, PracticeSummary } from '@ostium/shared';
import { Chair } from './models/chair.model.js';
import { Location } from './models/location.model.js';
import { Microscope } from './models/microscope.model.js';
import { Practice } from './models/practice.model.js';
import type { UpdatePracticeSettingsDto } from './dto/practice-settings.dto.js';

export const DEFAULT_PRACTICE_SETTINGS: PracticeSettings = {
  toothNotation: 'universal',
  bookingGridMinutes: 5,
  lateCancellationHours: 48,
};

export const mapPractice = (p: Practice): PracticeSummary => ({
  id: p.id,
  name: p.name,
  phone: p.phone,
  email: p.email,
  settings: { ...DEFAULT_PRACTICE_SETTINGS, ...p.settings },
});

export const mapLocation = (l: Location): LocationSummary => ({
  id: l.id,
  name: l.name,
  address: l.address,
  phone: l.phone,
  timeZone: l.timeZone,
  openingHours: l.openingHours,
  chairs: (l.chairs ?? []).map((c) => ({ id: c.id, name: c.name, locationId: c.locationId, fixedMicroscopeId: c.fixedMicroscopeId })),
  microscopes: (l.microscopes ?? []).map((m) => ({ id: m.id, name: m.name, mobile: m.mobile, locationId: m.locationId })),
});

@Injectable()
export class PracticesService {
  constructor(
    @InjectModel(Practice) private readonly practices: typeof Practice,
    @InjectModel(Location) private readonly locations: typeof Location,
    @InjectModel(Chair) private readonly chairs: typeof Chair,
    @InjectModel(Microscope) private readonly microscopes: typeof Microscope,
  ) {}

  /** Pass the caller's transaction when inside one: a read on a second connection could wait on a pool its own transaction holds. */
  async get(practiceId: number, transaction?: Transaction): Promise<PracticeSummary> {
    const p = await this.practices.findByPk(practiceId, { transaction });
    if (!p) throw new NotFoundException('Practice not found');
    return mapPractice(p);
  }

  async updateSettings(practiceId: number, dto: UpdatePracticeSettingsDto): Promise<PracticeSummary> {
    const p = await this.practices.findByPk(practiceId);
    if (!p) throw new NotFoundException('Practice not found');
    p.settings = { ...DEFAULT_PRACTICE_SETTINGS, ...p.settings, ...dto };
    await p.save();
    return mapPractice(p);
  }

  async listLocations(practiceId: number): Promise<LocationSummary[]> {
    const rows = await this.locations.findAll({
      where: { practiceId },
      include: [Chair, Microscope],
      order: [['name', 'ASC'], ['chairs', 'name', 'ASC'], ['microscopes', 'name', 'ASC']],
    });
    return rows.map(mapLocation);
  }

  async count() {
    return this.practices.count();
  }

  // Find-or-create helpers for the demo loader: re-running it changes nothing.
  async ensurePractice(v: { name: string; phone?: string; email?: string; settings?: Partial<PracticeSettings> }) {
    const [p] = await this.practices.findOrCreate({
      where: { name: v.name },
      defaults: { name: v.name, phone: v.phone ?? null, email: v.email ?? null, settings: { ...DEFAULT_PRACTICE_SETTINGS, ...v.settings } },
    });
    return p;
  }

  async ensureLocation(practiceId: number, v: { name: string; address?: string; phone?: string; timeZone: string; openingHours: OpeningHours }) {
    const [l] = await this.locations.findOrCreate({
      where: { practiceId, name: v.name },
      defaults: { practiceId, name: v.name, address: v.address ?? null, phone: v.phone ?? null, timeZone: v.timeZone, openingHours: v.openingHours },
    });
    return l;
  }

  async ensureMicroscope(practiceId: number, locationId: number, v: { name: string; mobile: boolean }) {
    const [m] = await this.microscopes.findOrCreate({
      where: { practiceId, locationId, name: v.name },
      defaults: { practiceId, locationId, name: v.name, mobile: v.mobile },
    });
    return m;
  }

  async ensureChair(practiceId: number, locationId: number, v: { name: string; fixedMicroscopeId?: number | null }) {
    const [c] = await this.chairs.findOrCreate({
      where: { locationId, name: v.name },
      defaults: { practiceId, locationId, name: v.name, fixedMicroscopeId: v.fixedMicroscopeId ?? null },
    });
    return c;
  }
}
