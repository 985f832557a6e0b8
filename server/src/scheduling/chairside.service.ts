import { BadRequestException, Injectable, NotFoundException } from '@nestjs/common';
import type { ChairsideDay, EstimateResult } from '@ostium/shared';
import { DateTime } from 'luxon';
import { QueryTypes } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import { AppointmentsService } from './appointments.service.js';

type Json<T> = T | string | null;
const json = <T>(v: Json<T>): T | null => (v === null ? null : typeof v === 'string' ? (JSON.parse(v) as T) : v);

/** The day's visits per chair of one location, in order, with the tray from each case's stored estimate. */
@Injectable()
export class ChairsideService {
  constructor(
    private readonly sequelize: Sequelize,
    private readonly appointments: AppointmentsService,
  ) {}

  async day(practiceId: number, date: string, locationId: number): Promise<ChairsideDay> {
    const [loc] = await this.sequelize.query<{ time_zone: string }>('SELECT time_zone FROM locations WHERE id = :locationId AND practice_id = :practiceId', {
      replacements: { locationId, practiceId },
      type: QueryTypes.SELECT,
    });
    if (!loc) throw new NotFoundException(`Location ${locationId} not found`);
    const day = DateTime.fromISO(date, { zone: loc.time_zone });
    if (!day.isValid || !/^\d{4}-\d{2}-\d{2}$/.test(date)) throw new BadRequestException({ message: 'date must be YYYY-MM-DD', errors: [{ field: 'date', message: 'YYYY-MM-DD' }] });
    const from = day.startOf('day');
    const to = from.plus({ days: 1 });
    const [chairs, visits] = await Promise.all([
      this.sequelize.query<{ id: number; name: string; active: number | boolean }>('SELECT id, name, active FROM chairs WHERE location_id = :locationId ORDER BY name', {
        replacements: { locationId },
        type: QueryTypes.SELECT,
      }),
      this.appointments.list(practiceId, { from: from.toUTC().toISO()!, to: to.toUTC().toISO()!, locationId }),
    ]);
    const caseIds = [...new Set(visits.map((v) => v.caseId))];
    const estimates = caseIds.length
      ? await this.sequelize.query<{ id: number; estimate: Json<EstimateResult> }>('SELECT id, estimate FROM cases WHERE id IN (:caseIds)', {
          replacements: { caseIds },
          type: QueryTypes.SELECT,
        })
      : [];
    const byCase = new Map(estimates.map((e) => [e.id, json(e.estimate)]));
    return {
      date,
      locationId,
      chairs: chairs
        .filter((c) => c.active || visits.some((v) => v.chairId === c.id))
        .map((c) => ({
          chairId: c.id,
          chairName: c.name,
          visits: visits
            .filter((v) => v.chairId === c.id)
            .map((v) => {
              const est = byCase.get(v.caseId) ?? null;
              return {
                ...v,
                minutes: Math.round((Date.parse(v.end) - Date.parse(v.start)) / 60_000),
                needsMicroscope: est?.visits[v.visitIndex]?.needsMicroscope ?? v.microscopeId !== null,
                trayList: est?.trayList ?? [],
              };
            }),
        })),
    };
  }
}
