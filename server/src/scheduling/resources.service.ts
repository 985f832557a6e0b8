import { BadRequestException, ConflictException, Injectable, NotFoundException } from '@nestjs/common';
import { InjectModel } from '@nestjs/sequelize';
import type { Closure, Hold, LocationResource, OperatorSchedule, TimeOff, WorkingRule } from '@ostium/shared';
import { QueryTypes } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import { Chair } from '../practices/models/chair.model.js';
import { Location } from '../practices/models/location.model.js';
import { Microscope } from '../practices/models/microscope.model.js';
import { mapLocation } from '../practices/practices.service.js';
import { User } from '../users/models/user.model.js';
import type { ChairDto, ClosureDto, HoldDto, LocationDto, MicroscopeDto, TimeOffDto, WorkingRuleDto } from './dto/resources.dto.js';
import { HoldRow } from './models/hold.model.js';
import { LocationClosure } from './models/location-closure.model.js';
import { TimeOffRow } from './models/time-off.model.js';
import { WorkingRuleRow } from './models/working-rule.model.js';
import { minutesOf, rangeProblem } from './resource-rules.util.js';

const bad = (field: string, message: string) => new BadRequestException({ message, errors: [{ field, message }] });

export const mapClosure = (c: LocationClosure): Closure => ({ id: c.id, locationId: c.locationId, date: c.date, reason: c.reason });
export const mapWorkingRule = (r: WorkingRuleRow): WorkingRule => ({
  id: r.id,
  operatorId: r.operatorId,
  locationId: r.locationId,
  rrule: r.rrule,
  start: r.startLocal,
  end: r.endLocal,
  breaks: r.breaks ?? [],
});
export const mapTimeOff = (t: TimeOffRow): TimeOff => ({ id: t.id, operatorId: t.operatorId, start: t.start.toISOString(), end: t.end.toISOString(), ...(t.reason ? { reason: t.reason } : {}) });
export const mapHold = (h: HoldRow): Hold => ({
  id: h.id,
  operatorId: h.operatorId,
  locationId: h.locationId,
  rrule: h.rrule,
  start: h.startLocal,
  end: h.endLocal,
  ...(h.opensEveningBeforeAt ? { opensEveningBeforeAt: h.opensEveningBeforeAt } : {}),
});

/** Locations (zone, hours, closures), chairs, microscopes, and the endodontists' working rules, time off and holds. */
@Injectable()
export class ResourcesService {
  constructor(
    private readonly sequelize: Sequelize,
    @InjectModel(Location) private readonly locations: typeof Location,
    @InjectModel(Chair) private readonly chairs: typeof Chair,
    @InjectModel(Microscope) private readonly microscopes: typeof Microscope,
    @InjectModel(LocationClosure) private readonly closures: typeof LocationClosure,
    @InjectModel(WorkingRuleRow) private readonly rules: typeof WorkingRuleRow,
    @InjectModel(TimeOffRow) private readonly timeOff: typeof TimeOffRow,
    @InjectModel(HoldRow) private readonly holds: typeof HoldRow,
    @InjectModel(User) private readonly users: typeof User,
  ) {}

  // ---------- locations ----------

  async listLocations(practiceId: number): Promise<LocationResource[]> {
    const [rows, closures] = await Promise.all([
      this.locations.findAll({ where: { practiceId }, include: [Chair, Microscope], order: [['name', 'ASC'], ['chairs', 'name', 'ASC'], ['microscopes', 'name', 'ASC']] }),
      this.closures.findAll({ where: { practiceId }, order: [['date', 'ASC']] }),
    ]);
    return rows.map((l) => ({ ...mapLocation(l), closures: closures.filter((c) => c.locationId === l.id).map(mapClosure) }));
  }

  async getLocation(practiceId: number, id: number): Promise<LocationResource> {
    const found = (await this.listLocations(practiceId)).find((l) => l.id === id);
    if (!found) throw new NotFoundException(`Location ${id} not found`);
    return found;
  }

  private async locationRow(practiceId: number, id: number): Promise<Location> {
    const l = await this.locations.findOne({ where: { id, practiceId } });
    if (!l) throw new NotFoundException(`Location ${id} not found`);
    return l;
  }

  private static checkHours(dto: LocationDto) {
    dto.openingHours.forEach((d, i) => {
      if (minutesOf(d.close) <= minutesOf(d.open)) throw bad(`openingHours.${i}.close`, `openingHours.${i}: close must be after open`);
    });
  }

  async createLocation(practiceId: number, dto: LocationDto): Promise<LocationResource> {
    ResourcesService.checkHours(dto);
    const l = await this.locations.create({ practiceId, name: dto.name, address: dto.address ?? null, phone: dto.phone ?? null, timeZone: dto.timeZone, openingHours: dto.openingHours });
    return this.getLocation(practiceId, l.id);
  }

  async updateLocation(practiceId: number, id: number, dto: LocationDto): Promise<LocationResource> {
    ResourcesService.checkHours(dto);
    const l = await this.locationRow(practiceId, id);
    l.set({ name: dto.name, address: dto.address ?? null, phone: dto.phone ?? null, timeZone: dto.timeZone, openingHours: dto.openingHours });
    await l.save();
    return this.getLocation(practiceId, id);
  }

  async deleteLocation(practiceId: number, id: number): Promise<void> {
    const l = await this.locationRow(practiceId, id);
    const [use] = await this.sequelize.query<{ n: number }>(
      `SELECT (SELECT COUNT(*) FROM chairs WHERE location_id = :id) + (SELECT COUNT(*) FROM referrals WHERE location_id = :id)
            + (SELECT COUNT(*) FROM working_rules WHERE location_id = :id) + (SELECT COUNT(*) FROM holds WHERE location_id = :id) AS n`,
      { replacements: { id }, type: QueryTypes.SELECT },
    );
    if (Number(use?.n) > 0) throw new ConflictException('The location still has chairs, referrals, working rules or holds; remove those first');
    await this.sequelize.transaction(async (transaction) => {
      await this.closures.destroy({ where: { locationId: id }, individualHooks: true, transaction });
      await this.microscopes.destroy({ where: { locationId: id }, individualHooks: true, transaction });
      await l.destroy({ transaction });
    });
  }

  async addClosure(practiceId: number, locationId: number, dto: ClosureDto): Promise<Closure> {
    await this.locationRow(practiceId, locationId);
    if (await this.closures.findOne({ where: { locationId, date: dto.date } })) throw new ConflictException(`The location is already closed on ${dto.date}`);
    return mapClosure(await this.closures.create({ practiceId, locationId, date: dto.date, reason: dto.reason }));
  }

  async deleteClosure(practiceId: number, id: number): Promise<void> {
    const c = await this.closures.findOne({ where: { id, practiceId } });
    if (!c) throw new NotFoundException(`Closure ${id} not found`);
    await c.destroy();
  }

  // ---------- chairs and microscopes ----------

  private async checkFixedMicroscope(practiceId: number, locationId: number, microscopeId: number | null | undefined, chairId?: number) {
    if (microscopeId === null || microscopeId === undefined) return;
    const m = await this.microscopes.findOne({ where: { id: microscopeId, practiceId } });
    if (!m || m.locationId !== locationId) throw bad('fixedMicroscopeId', 'fixedMicroscopeId must be a microscope of the same location');
    if (m.mobile) throw bad('fixedMicroscopeId', 'a mobile microscope cannot be fixed to a chair');
    const other = await this.chairs.findOne({ where: { fixedMicroscopeId: microscopeId } });
    if (other && other.id !== chairId) throw bad('fixedMicroscopeId', `the microscope is already fixed to ${other.name}`);
  }

  async createChair(practiceId: number, locationId: number, dto: ChairDto) {
    await this.locationRow(practiceId, locationId);
    await this.checkFixedMicroscope(practiceId, locationId, dto.fixedMicroscopeId);
    const c = await this.chairs.create({ practiceId, locationId, name: dto.name, fixedMicroscopeId: dto.fixedMicroscopeId ?? null, active: dto.active ?? true });
    return { id: c.id, name: c.name, locationId: c.locationId, fixedMicroscopeId: c.fixedMicroscopeId, active: c.active };
  }

  async updateChair(practiceId: number, id: number, dto: ChairDto) {
    const c = await this.chairs.findOne({ where: { id, practiceId } });
    if (!c) throw new NotFoundException(`Chair ${id} not found`);
    await this.checkFixedMicroscope(practiceId, c.locationId, dto.fixedMicroscopeId, c.id);
    c.set({ name: dto.name, ...(dto.fixedMicroscopeId !== undefined ? { fixedMicroscopeId: dto.fixedMicroscopeId } : {}), ...(dto.active !== undefined ? { active: dto.active } : {}) });
    await c.save();
    return { id: c.id, name: c.name, locationId: c.locationId, fixedMicroscopeId: c.fixedMicroscopeId, active: c.active };
  }

  /** Removes an unused chair; one with appointments is only retired (kept for the history, never offered). */
  async deleteChair(practiceId: number, id: number): Promise<{ retired: boolean }> {
    const c = await this.chairs.findOne({ where: { id, practiceId } });
    if (!c) throw new NotFoundException(`Chair ${id} not found`);
    const [used] = await this.sequelize.query<{ n: number }>('SELECT COUNT(*) AS n FROM appointments WHERE chair_id = :id', { replacements: { id }, type: QueryTypes.SELECT });
    if (Number(used?.n) > 0) {
      c.active = false;
      await c.save();
      return { retired: true };
    }
    await c.destroy();
    return { retired: false };
  }

  async createMicroscope(practiceId: number, locationId: number, dto: MicroscopeDto) {
    await this.locationRow(practiceId, locationId);
    const m = await this.microscopes.create({ practiceId, locationId, name: dto.name, mobile: dto.mobile, active: dto.active ?? true });
    return { id: m.id, name: m.name, locationId: m.locationId, mobile: m.mobile, active: m.active };
  }

  async updateMicroscope(practiceId: number, id: number, dto: MicroscopeDto) {
    const m = await this.microscopes.findOne({ where: { id, practiceId } });
    if (!m) throw new NotFoundException(`Microscope ${id} not found`);
    if (dto.mobile && (await this.chairs.findOne({ where: { fixedMicroscopeId: id } }))) {
      throw bad('mobile', 'the microscope is fixed to a chair; clear the chair’s fixed microscope first');
    }
    m.set({ name: dto.name, mobile: dto.mobile, ...(dto.active !== undefined ? { active: dto.active } : {}) });
    await m.save();
    return { id: m.id, name: m.name, locationId: m.locationId, mobile: m.mobile, active: m.active };
  }

  async deleteMicroscope(practiceId: number, id: number): Promise<{ retired: boolean }> {
    const m = await this.microscopes.findOne({ where: { id, practiceId } });
    if (!m) throw new NotFoundException(`Microscope ${id} not found`);
    const [used] = await this.sequelize.query<{ n: number }>(
      'SELECT (SELECT COUNT(*) FROM appointments WHERE microscope_id = :id) + (SELECT COUNT(*) FROM chairs WHERE fixed_microscope_id = :id) AS n',
      { replacements: { id }, type: QueryTypes.SELECT },
    );
    if (Number(used?.n) > 0) {
      m.active = false;
      await m.save();
      return { retired: true };
    }
    await m.destroy();
    return { retired: false };
  }

  // ---------- operators ----------

  private async operator(practiceId: number, id: number): Promise<User> {
    const u = await this.users.findOne({ where: { id, practiceId } });
    if (!u || u.role !== 'endodontist') throw new NotFoundException(`Operator ${id} not found (an operator is a user with the endodontist role)`);
    return u;
  }

  async listSchedules(practiceId: number, operatorId?: number): Promise<OperatorSchedule[]> {
    const where = { practiceId, ...(operatorId ? { operatorId } : {}) };
    const [ops, rules, off, holds] = await Promise.all([
      this.users.findAll({ where: { practiceId, role: 'endodontist', active: true, ...(operatorId ? { id: operatorId } : {}) }, order: [['name', 'ASC']] }),
      this.rules.findAll({ where, order: [['id', 'ASC']] }),
      this.timeOff.findAll({ where, order: [['start', 'ASC']] }),
      this.holds.findAll({ where, order: [['id', 'ASC']] }),
    ]);
    return ops.map((o) => ({
      operatorId: o.id,
      name: o.name,
      workingRules: rules.filter((r) => r.operatorId === o.id).map(mapWorkingRule),
      timeOff: off.filter((t) => t.operatorId === o.id).map(mapTimeOff),
      holds: holds.filter((h) => h.operatorId === o.id).map(mapHold),
    }));
  }

  async getSchedule(practiceId: number, operatorId: number): Promise<OperatorSchedule> {
    await this.operator(practiceId, operatorId);
    const [s] = await this.listSchedules(practiceId, operatorId);
    if (!s) throw new NotFoundException(`Operator ${operatorId} is not active`);
    return s;
  }

  private checkRule(dto: { start: string; end: string; breaks?: { start: string; end: string }[] }) {
    const p = rangeProblem(dto.start, dto.end);
    if (p) throw bad('end', p);
    (dto.breaks ?? []).forEach((b, i) => {
      const q = rangeProblem(b.start, b.end);
      if (q) throw bad(`breaks.${i}`, `breaks.${i}: ${q}`);
      if (minutesOf(b.start) < minutesOf(dto.start) || minutesOf(b.end) > minutesOf(dto.end)) throw bad(`breaks.${i}`, `breaks.${i} must lie inside the working time`);
    });
  }

  async addWorkingRule(practiceId: number, operatorId: number, dto: WorkingRuleDto): Promise<WorkingRule> {
    await this.operator(practiceId, operatorId);
    await this.locationRow(practiceId, dto.locationId);
    this.checkRule(dto);
    const r = await this.rules.create({ practiceId, operatorId, locationId: dto.locationId, rrule: dto.rrule, startLocal: dto.start, endLocal: dto.end, breaks: dto.breaks ?? [] });
    return mapWorkingRule(r);
  }

  async updateWorkingRule(practiceId: number, id: number, dto: WorkingRuleDto): Promise<WorkingRule> {
    const r = await this.rules.findOne({ where: { id, practiceId } });
    if (!r) throw new NotFoundException(`Working rule ${id} not found`);
    await this.locationRow(practiceId, dto.locationId);
    this.checkRule(dto);
    r.set({ locationId: dto.locationId, rrule: dto.rrule, startLocal: dto.start, endLocal: dto.end, breaks: dto.breaks ?? [] });
    await r.save();
    return mapWorkingRule(r);
  }

  async deleteWorkingRule(practiceId: number, id: number): Promise<void> {
    const r = await this.rules.findOne({ where: { id, practiceId } });
    if (!r) throw new NotFoundException(`Working rule ${id} not found`);
    await r.destroy();
  }

  async addTimeOff(practiceId: number, operatorId: number, dto: TimeOffDto): Promise<TimeOff> {
    await this.operator(practiceId, operatorId);
    const start = new Date(dto.start);
    const end = new Date(dto.end);
    if (end <= start) throw bad('end', 'end must be after start');
    return mapTimeOff(await this.timeOff.create({ practiceId, operatorId, start, end, reason: dto.reason ?? null }));
  }

  async deleteTimeOff(practiceId: number, id: number): Promise<void> {
    const t = await this.timeOff.findOne({ where: { id, practiceId } });
    if (!t) throw new NotFoundException(`Time off ${id} not found`);
    await t.destroy();
  }

  async listHolds(practiceId: number): Promise<Hold[]> {
    return (await this.holds.findAll({ where: { practiceId }, order: [['id', 'ASC']] })).map(mapHold);
  }

  async addHold(practiceId: number, dto: HoldDto): Promise<Hold> {
    await this.operator(practiceId, dto.operatorId);
    await this.locationRow(practiceId, dto.locationId);
    this.checkRule(dto);
    const h = await this.holds.create({
      practiceId,
      operatorId: dto.operatorId,
      locationId: dto.locationId,
      rrule: dto.rrule,
      startLocal: dto.start,
      endLocal: dto.end,
      opensEveningBeforeAt: dto.opensEveningBeforeAt ?? null,
    });
    return mapHold(h);
  }

  async deleteHold(practiceId: number, id: number): Promise<void> {
    const h = await this.holds.findOne({ where: { id, practiceId } });
    if (!h) throw new NotFoundException(`Hold ${id} not found`);
    await h.destroy();
  }
}
