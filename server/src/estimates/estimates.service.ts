import { BadRequestException, Injectable } from '@nestjs/common';
import { InjectModel } from '@nestjs/sequelize';
import {
  LEVELS,
  PROCEDURES,
  parseTooth,
  type CellAccuracy,
  type CompletedVisit,
  type EstimateResult,
  type EstimateTable,
  type Level,
  type Procedure,
  type ToothNotation,
} from '@ostium/shared';
import Papa from 'papaparse';
import { fn, col, type Transaction } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import { PracticesService } from '../practices/practices.service.js';
import { UsersService } from '../users/users.service.js';
import type { EstimateRequestDto } from './dto/estimate-request.dto.js';
import { asBadRequest } from './estimate-errors.util.js';
import {
  accuracyReport,
  calibrationLookup,
  calibrationOptions,
  checkAssessment,
  checkFacts,
  checkTable,
  DEFAULT_ESTIMATE_TABLE,
  estimate,
  factorCatalogue,
  learnCalibration,
  toothGroup,
  parseFdi,
  type CalibrationModel,
} from './estimator/index.js';
import { EstimateTableVersion } from './models/estimate-table-version.model.js';
import { VisitRecord } from './models/visit-record.model.js';

export interface EstimateTableInfo {
  version: number;
  table: EstimateTable;
  createdAt: string | null;
  createdBy: number | null;
  versions: { version: number; createdAt: string; createdBy: number | null }[];
}

export interface ImportResult {
  imported: number;
  accuracy: CellAccuracy[];
}

const IMPORT_COLUMNS = ['date', 'tooth', 'procedure', 'canals', 'level', 'operator_email', 'actual_minutes'] as const;

// A neutral factor that moves the level without adding minutes, to price a history row at its level.
const LEVEL_PROBE = 'diagnosis' as const;

/** Every key path of the default table, so a saved table can be checked for unknown fields. */
function unknownPaths(value: unknown, template: unknown, path = ''): string[] {
  if (Array.isArray(template) || typeof template !== 'object' || template === null) return [];
  if (typeof value !== 'object' || value === null || Array.isArray(value)) return [];
  const out: string[] = [];
  for (const k of Object.keys(value)) {
    const p = path ? `${path}.${k}` : k;
    if (!(k in (template as object))) out.push(p);
    else out.push(...unknownPaths((value as Record<string, unknown>)[k], (template as Record<string, unknown>)[k], p));
  }
  return out;
}
function missingPaths(value: unknown, template: unknown, path = ''): string[] {
  if (Array.isArray(template) || typeof template !== 'object' || template === null) return [];
  if (typeof value !== 'object' || value === null || Array.isArray(value)) return [path || 'table'];
  const out: string[] = [];
  for (const k of Object.keys(template)) {
    if (k === 'version') continue;
    const p = path ? `${path}.${k}` : k;
    if (!(k in (value as object))) out.push(p);
    else out.push(...missingPaths((value as Record<string, unknown>)[k], (template as Record<string, unknown>)[k], p));
  }
  return out;
}

@Injectable()
export class EstimatesService {
  // Learned calibration per practice, rebuilt when the visit log changes (checked by a cheap count query,
  // so several server instances agree without sharing memory).
  private readonly models = new Map<number, { stamp: string; model: CalibrationModel | null }>();

  constructor(
    private readonly sequelize: Sequelize,
    @InjectModel(EstimateTableVersion) private readonly tables: typeof EstimateTableVersion,
    @InjectModel(VisitRecord) private readonly visits: typeof VisitRecord,
    private readonly practices: PracticesService,
    private readonly users: UsersService,
  ) {}

  async currentTable(practiceId: number, transaction?: Transaction): Promise<EstimateTable> {
    const row = await this.tables.findOne({ where: { practiceId }, order: [['version', 'DESC']], transaction });
    return row ? { ...row.content, version: row.version } : { ...structuredClone(DEFAULT_ESTIMATE_TABLE) };
  }

  async tableInfo(practiceId: number): Promise<EstimateTableInfo> {
    const rows = await this.tables.findAll({ where: { practiceId }, order: [['version', 'DESC']], attributes: ['version', 'createdAt', 'createdBy'] });
    const table = await this.currentTable(practiceId);
    const current = rows[0];
    return {
      version: table.version,
      table,
      createdAt: current ? current.createdAt.toISOString() : null,
      createdBy: current?.createdBy ?? null,
      versions: rows.map((r) => ({ version: r.version, createdAt: r.createdAt.toISOString(), createdBy: r.createdBy })),
    };
  }

  /** Every save is a new version; estimates name the version they used. */
  async saveTable(practiceId: number, userId: number, body: unknown): Promise<EstimateTableInfo> {
    const extra = unknownPaths(body, DEFAULT_ESTIMATE_TABLE).filter((p) => p !== 'version');
    const missing = missingPaths(body, DEFAULT_ESTIMATE_TABLE);
    const errors = [
      ...extra.map((p) => ({ field: `table.${p}`, message: `table.${p} is not a known setting` })),
      ...missing.map((p) => ({ field: `table.${p}`, message: `table.${p} is missing` })),
    ];
    if (errors.length) throw new BadRequestException({ message: errors.map((e) => e.message).join('; '), errors });
    const current = await this.currentTable(practiceId);
    const next = { ...(body as EstimateTable), version: current.version + 1 };
    asBadRequest(() => checkTable(next));
    await this.tables.create({ practiceId, version: next.version, content: next, createdBy: userId });
    this.models.delete(practiceId);
    return this.tableInfo(practiceId);
  }

  factors(table: EstimateTable = DEFAULT_ESTIMATE_TABLE) {
    return factorCatalogue(table);
  }

  async notation(practiceId: number): Promise<ToothNotation> {
    return (await this.practices.get(practiceId)).settings.toothNotation;
  }

  /** The preview behind POST /api/estimates: stores nothing. */
  async preview(practiceId: number, dto: EstimateRequestDto): Promise<EstimateResult> {
    const table = await this.currentTable(practiceId);
    const model = await this.calibration(practiceId, table);
    const fdi = asBadRequest(() => parseTooth(dto.tooth, dto.notation ?? 'fdi').fdi);
    return asBadRequest(() =>
      estimate(
        { toothFdi: fdi, procedure: dto.procedure, canals: dto.canals, assessment: checkAssessment(dto.assessment ?? {}), facts: checkFacts(dto.facts ?? {}) },
        table,
        model ? calibrationLookup(model, dto.operatorId, table) : undefined,
      ),
    );
  }

  /** For other domains (the case sheet): the same computation on stored inputs. */
  async estimateFor(practiceId: number, input: { toothFdi: string; procedure: Procedure; canals?: number; assessment?: unknown; facts?: unknown; operatorId?: number }) {
    const table = await this.currentTable(practiceId);
    const model = await this.calibration(practiceId, table);
    return asBadRequest(() =>
      estimate(
        { toothFdi: input.toothFdi, procedure: input.procedure, canals: input.canals, assessment: checkAssessment(input.assessment ?? {}), facts: checkFacts(input.facts ?? {}) },
        table,
        model ? calibrationLookup(model, input.operatorId, table) : undefined,
      ),
    );
  }

  private async calibration(practiceId: number, table: EstimateTable): Promise<CalibrationModel | null> {
    const [row] = (await this.visits.findAll({
      where: { practiceId },
      attributes: [[fn('COUNT', col('id')), 'n'], [fn('MAX', col('id')), 'maxId']],
      raw: true,
    })) as unknown as { n: number; maxId: number | null }[];
    const stamp = `${row?.n ?? 0}:${row?.maxId ?? 0}:${table.version}`;
    const cached = this.models.get(practiceId);
    if (cached?.stamp === stamp) return cached.model;
    const visits = await this.completedVisits(practiceId);
    const model = visits.length ? learnCalibration(visits, calibrationOptions(table)) : null;
    this.models.set(practiceId, { stamp, model });
    return model;
  }

  private async completedVisits(practiceId: number): Promise<CompletedVisit[]> {
    const rows = await this.visits.findAll({ where: { practiceId }, order: [['id', 'ASC']] });
    return rows.map((r) => ({
      procedure: r.procedure,
      toothGroup: r.toothGroup,
      level: r.level,
      operatorId: r.operatorId ?? undefined,
      estimatedMinutes: r.estimatedMinutes,
      actualMinutes: r.actualMinutes,
    }));
  }

  async accuracy(practiceId: number): Promise<CellAccuracy[]> {
    const table = await this.currentTable(practiceId);
    const visits = await this.completedVisits(practiceId);
    return visits.length ? accuracyReport(visits, calibrationOptions(table)) : [];
  }

  /** Table minutes of one visit of a case at a given level (the history's yardstick). */
  tableMinutesAt(table: EstimateTable, toothFdi: string, procedure: Procedure, canals: number, level: Level): number {
    const assessment = { archPosition: 'low', [LEVEL_PROBE]: level } as const;
    const r = estimate({ toothFdi, procedure, canals, assessment }, table);
    return Math.round(r.totalMinutes / r.visits.length);
  }

  /**
   * One real visit measured at dismissal (dismissed − seated), logged with source 'visit' so the
   * calibration learns from it; the yardstick is the current table's minutes, as for imported visits.
   */
  async recordVisit(
    practiceId: number,
    v: { appointmentId: number; visitDate: string; toothFdi: string; procedure: Procedure; canals: number; level: Level; operatorId: number | null; actualMinutes: number },
    transaction?: Transaction,
  ): Promise<{ id: number; estimatedMinutes: number; actualMinutes: number }> {
    const table = await this.currentTable(practiceId, transaction);
    const estimatedMinutes = this.tableMinutesAt(table, v.toothFdi, v.procedure, v.canals, v.level);
    const row = await this.visits.create(
      {
        practiceId,
        visitDate: v.visitDate,
        toothFdi: v.toothFdi,
        procedure: v.procedure,
        toothGroup: toothGroup(parseFdi(v.toothFdi, 'tooth')),
        canals: v.canals,
        level: v.level,
        operatorId: v.operatorId,
        estimatedMinutes,
        actualMinutes: Math.max(1, Math.round(v.actualMinutes)),
        tableVersion: table.version,
        source: 'visit',
        appointmentId: v.appointmentId,
      },
      { transaction },
    );
    this.models.delete(practiceId);
    return { id: row.id, estimatedMinutes, actualMinutes: row.actualMinutes };
  }

  /**
   * CSV of past visits: date, tooth, procedure, canals, level, operator_email, actual_minutes.
   * Every line is checked first; one bad line imports nothing. A good file goes in one transaction.
   */
  async importHistory(practiceId: number, csv: string, notation?: ToothNotation): Promise<ImportResult> {
    const parsed = Papa.parse<Record<string, string>>(csv.replace(/^\uFEFF/, ''), { header: true, skipEmptyLines: 'greedy', transformHeader: (h) => h.trim().toLowerCase() });
    const header = parsed.meta.fields ?? [];
    const missing = IMPORT_COLUMNS.filter((c) => !header.includes(c));
    if (missing.length) {
      throw new BadRequestException({ message: `The file lacks the column(s) ${missing.join(', ')}`, errors: missing.map((c) => ({ field: `file.columns.${c}`, message: 'missing column' })) });
    }
    if (!parsed.data.length) throw new BadRequestException({ message: 'The file has no rows', errors: [{ field: 'file', message: 'no rows' }] });
    const table = await this.currentTable(practiceId);
    const useNotation = notation ?? (await this.notation(practiceId));
    const operators = new Map<string, number | null>();
    const errors: { field: string; message: string }[] = [];
    const rows: Partial<VisitRecord>[] = [];
    for (let i = 0; i < parsed.data.length; i++) {
      const line = i + 2; // the header is line 1
      const r = parsed.data[i];
      const problems: string[] = [];
      const date = (r.date ?? '').trim();
      if (!/^\d{4}-\d{2}-\d{2}$/.test(date) || Number.isNaN(Date.parse(`${date}T00:00:00Z`))) problems.push('date must be YYYY-MM-DD');
      let fdi = '';
      try {
        fdi = parseTooth((r.tooth ?? '').trim(), useNotation).fdi;
        parseFdi(fdi, 'tooth');
      } catch (e) {
        problems.push((e as Error).message);
      }
      const procedure = (r.procedure ?? '').trim().toLowerCase() as Procedure;
      if (!(PROCEDURES as readonly string[]).includes(procedure)) problems.push(`procedure must be one of ${PROCEDURES.join(', ')}`);
      const canals = Number((r.canals ?? '').trim());
      if (!Number.isInteger(canals) || canals < 1 || canals > 8) problems.push('canals must be a whole number from 1 to 8');
      const level = (r.level ?? '').trim().toLowerCase() as Level;
      if (!(LEVELS as readonly string[]).includes(level)) problems.push('level must be low, moderate or high');
      const email = (r.operator_email ?? '').trim().toLowerCase();
      let operatorId: number | null = null;
      if (email) {
        if (!operators.has(email)) {
          const u = await this.users.findByEmail(email);
          operators.set(email, u && u.practiceId === practiceId && u.role === 'endodontist' ? u.id : null);
        }
        operatorId = operators.get(email) ?? null;
        if (operatorId === null) problems.push(`operator_email ${email} is not an endodontist of this practice`);
      }
      const actual = Number((r.actual_minutes ?? '').trim());
      if (!Number.isInteger(actual) || actual < 5 || actual > 600) problems.push('actual_minutes must be a whole number from 5 to 600');
      if (problems.length) {
        errors.push(...problems.map((p) => ({ field: `line ${line}`, message: p })));
        continue;
      }
      const estimatedMinutes = this.tableMinutesAt(table, fdi, procedure, canals, level);
      rows.push({
        practiceId,
        visitDate: date,
        toothFdi: fdi,
        procedure,
        toothGroup: toothGroup(parseFdi(fdi, 'tooth')),
        canals,
        level,
        operatorId,
        estimatedMinutes,
        actualMinutes: actual,
        tableVersion: table.version,
        source: 'import',
        appointmentId: null,
      });
    }
    if (errors.length) {
      const lines = [...new Set(errors.map((e) => e.field))];
      throw new BadRequestException({ message: `Nothing imported: ${lines.length} line(s) have problems (${lines.slice(0, 10).join(', ')}${lines.length > 10 ? ', …' : ''})`, errors });
    }
    await this.sequelize.transaction(async (transaction) => {
      await this.visits.bulkCreate(rows, { transaction, individualHooks: true });
    });
    this.models.delete(practiceId);
    return { imported: rows.length, accuracy: await this.accuracy(practiceId) };
  }
}
