import { Injectable, OnModuleInit } from '@nestjs/common';
import { InjectModel } from '@nestjs/sequelize';
import type { AuditEntry, Page } from '@ostium/shared';
import { Op, type WhereOptions } from 'sequelize';
import { Model, Sequelize } from 'sequelize-typescript';
import { currentContext } from '../common/context/request-context.js';
import { AuditEntryRow } from './models/audit-entry.model.js';
import type { AuditQueryDto } from './dto/audit-query.dto.js';

// Never copied into the log: secrets and bulky payloads.
const REDACTED = new Set(['passwordHash', 'tokenVersion', 'tokenHash', 'content']);

function clean(values: Record<string, unknown> | null): Record<string, unknown> | null {
  if (!values) return null;
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(values)) {
    if (REDACTED.has(k)) out[k] = '[redacted]';
    else if (v instanceof Model) continue;
    else if (Array.isArray(v) && v[0] instanceof Model) continue;
    else out[k] = v;
  }
  return out;
}

export function mapAuditEntry(r: AuditEntryRow): AuditEntry {
  return {
    id: Number(r.id),
    at: r.at.toISOString(),
    userId: r.userId,
    userEmail: r.userEmail,
    action: r.action,
    entity: r.entity,
    entityId: r.entityId,
    before: r.before,
    after: r.after,
    requestId: r.requestId,
  };
}

/**
 * Records every create, update and delete made while serving an API request, through
 * Sequelize's global hooks, inside the same transaction as the change.
 */
@Injectable()
export class AuditService implements OnModuleInit {
  constructor(
    private readonly sequelize: Sequelize,
    @InjectModel(AuditEntryRow) private readonly entries: typeof AuditEntryRow,
  ) {}

  onModuleInit() {
    const record = (action: AuditEntry['action']) => async (instance: Model, options: { transaction?: unknown }) => {
      const ctx = currentContext();
      if (!ctx || instance instanceof AuditEntryRow) return;
      const model = instance.constructor as typeof Model;
      const data = instance.get({ plain: true }) as Record<string, unknown>;
      let before: Record<string, unknown> | null = null;
      let after: Record<string, unknown> | null = null;
      if (action === 'create') after = data;
      else if (action === 'delete') before = data;
      else {
        const changed = (instance.changed() || []) as string[];
        if (!changed.length) return;
        before = Object.fromEntries(changed.map((k) => [k, instance.previous(k as never)]));
        after = Object.fromEntries(changed.map((k) => [k, data[k]]));
      }
      const pk = model.primaryKeyAttribute;
      await this.entries.create(
        {
          practiceId: ctx.user?.practiceId ?? (data.practiceId as number | undefined) ?? null,
          at: new Date(),
          userId: ctx.user?.id ?? null,
          userEmail: ctx.user?.email ?? null,
          action,
          entity: model.tableName,
          entityId: String(data[pk] ?? ''),
          before: clean(before),
          after: clean(after),
          requestId: ctx.requestId,
        },
        { transaction: options.transaction as never, hooks: false },
      );
    };
    // afterUpdate sees changed()/previous() before they are reset by save().
    this.sequelize.addHook('afterCreate', 'audit', record('create') as never);
    this.sequelize.addHook('afterUpdate', 'audit', record('update') as never);
    this.sequelize.addHook('afterDestroy', 'audit', record('delete') as never);
  }

  async list(practiceId: number, q: AuditQueryDto): Promise<Page<AuditEntry>> {
    const where: WhereOptions = { practiceId };
    if (q.userId) Object.assign(where, { userId: q.userId });
    if (q.entity) Object.assign(where, { entity: q.entity });
    if (q.entityId) Object.assign(where, { entityId: q.entityId });
    if (q.from || q.to) {
      Object.assign(where, {
        at: { ...(q.from ? { [Op.gte]: new Date(q.from) } : {}), ...(q.to ? { [Op.lt]: new Date(q.to) } : {}) },
      });
    }
    const page = q.page ?? 1;
    const pageSize = q.pageSize ?? 50;
    const { rows, count } = await this.entries.findAndCountAll({
      where,
      order: [['at', 'DESC'], ['id', 'DESC']],
      limit: pageSize,
      offset: (page - 1) * pageSize,
    });
    return { items: rows.map(mapAuditEntry), total: count, page, pageSize };
  }
}
