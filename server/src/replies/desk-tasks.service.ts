import { Injectable, Logger, NotFoundException } from '@nestjs/common';
import { OnEvent } from '@nestjs/event-emitter';
import { InjectModel } from '@nestjs/sequelize';
import type { DeskTask, DeskTaskKind } from '@ostium/shared';
import { QueryTypes, type Transaction } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import { OUTBOX_FAILED, type OutboxFailedEvent } from '../messaging/messaging-events.js';
import { DeskTaskRow } from './models/desk-task.model.js';

interface TaskListRow {
  id: number;
  kind: DeskTaskKind;
  patient_id: number | null;
  first_name: string | null;
  last_name: string | null;
  appointment_id: number | null;
  detail: string;
  status: 'open' | 'done';
  created_at: Date;
  done_at: Date | null;
  done_by_name: string | null;
}

const TASK_SQL = `SELECT t.id, t.kind, t.patient_id, p.first_name, p.last_name, t.appointment_id, t.detail, t.status, t.created_at, t.done_at, u.name AS done_by_name
  FROM desk_tasks t
  LEFT JOIN patients p ON p.id = t.patient_id
  LEFT JOIN users u ON u.id = t.done_by`;

export function mapTaskRow(r: TaskListRow): DeskTask {
  return {
    id: r.id,
    kind: r.kind,
    patientId: r.patient_id,
    patientName: r.first_name !== null ? `${r.first_name} ${r.last_name}` : null,
    appointmentId: r.appointment_id,
    detail: r.detail,
    status: r.status,
    createdAt: new Date(r.created_at).toISOString(),
    doneAt: r.done_at ? new Date(r.done_at).toISOString() : null,
    doneBy: r.done_by_name,
  };
}

export interface NewTask {
  practiceId: number;
  kind: DeskTaskKind;
  patientId?: number | null;
  appointmentId?: number | null;
  inboundMessageId?: number | null;
  outboxMessageId?: number | null;
  detail: string;
}

/** The front desk's to-do list: reschedule requests, failed deliveries, senders we could not place. */
@Injectable()
export class DeskTasksService {
  private readonly logger = new Logger('DeskTasks');

  constructor(
    private readonly sequelize: Sequelize,
    @InjectModel(DeskTaskRow) private readonly tasks: typeof DeskTaskRow,
  ) {}

  async create(t: NewTask, transaction?: Transaction): Promise<DeskTaskRow> {
    return this.tasks.create(
      {
        practiceId: t.practiceId,
        kind: t.kind,
        patientId: t.patientId ?? null,
        appointmentId: t.appointmentId ?? null,
        inboundMessageId: t.inboundMessageId ?? null,
        outboxMessageId: t.outboxMessageId ?? null,
        detail: t.detail.slice(0, 500),
        status: 'open',
      },
      { transaction },
    );
  }

  /** The open task of this kind for the appointment, if there is one (a second "R" adds no second task). */
  async openFor(practiceId: number, kind: DeskTaskKind, appointmentId: number, transaction?: Transaction): Promise<DeskTaskRow | null> {
    return this.tasks.findOne({ where: { practiceId, kind, appointmentId, status: 'open' }, transaction });
  }

  async list(practiceId: number, status?: 'open' | 'done', patientId?: number | null): Promise<DeskTask[]> {
    const where = ['t.practice_id = :practiceId'];
    if (status) where.push('t.status = :status');
    if (patientId !== undefined) where.push(patientId === null ? 't.patient_id IS NULL' : 't.patient_id = :patientId');
    const rows = await this.sequelize.query<TaskListRow>(`${TASK_SQL} WHERE ${where.join(' AND ')} ORDER BY t.status = 'open' DESC, t.created_at DESC, t.id DESC LIMIT 500`, {
      replacements: { practiceId, status, patientId },
      type: QueryTypes.SELECT,
    });
    return rows.map(mapTaskRow);
  }

  /** Tasks about an unmatched sender: those made for one of its inbound texts. */
  async listForAddress(practiceId: number, address: string, transaction?: Transaction): Promise<DeskTask[]> {
    const rows = await this.sequelize.query<TaskListRow>(
      `${TASK_SQL} JOIN inbound_messages m ON m.id = t.inbound_message_id
        WHERE t.practice_id = :practiceId AND t.patient_id IS NULL AND m.patient_id IS NULL AND m.from_address = :address
        ORDER BY t.status = 'open' DESC, t.created_at DESC, t.id DESC`,
      { replacements: { practiceId, address }, type: QueryTypes.SELECT, transaction },
    );
    return rows.map(mapTaskRow);
  }

  async get(practiceId: number, id: number): Promise<DeskTask> {
    const [row] = await this.sequelize.query<TaskListRow>(`${TASK_SQL} WHERE t.practice_id = :practiceId AND t.id = :id`, {
      replacements: { practiceId, id },
      type: QueryTypes.SELECT,
    });
    if (!row) throw new NotFoundException(`Task ${id} not found`);
    return mapTaskRow(row);
  }

  async setStatus(practiceId: number, id: number, status: 'open' | 'done', userId: number): Promise<DeskTask> {
    const row = await this.tasks.findOne({ where: { id, practiceId } });
    if (!row) throw new NotFoundException(`Task ${id} not found`);
    if (row.status !== status) {
      row.set(status === 'done' ? { status, doneAt: new Date(), doneBy: userId } : { status, doneAt: null, doneBy: null });
      await row.save();
    }
    return this.get(practiceId, id);
  }

  /**
   * A message that ended failed becomes a task so the front desk sees why (once per outbox row: the
   * outbox emits once, and a repeat of the same event finds the task already there).
   */
  @OnEvent(OUTBOX_FAILED)
  async onOutboxFailed(e: OutboxFailedEvent): Promise<void> {
    try {
      await this.sequelize.transaction(async (transaction) => {
        // Serialises two deliveries of the same event: the second waits here, then finds the task.
        await this.sequelize.query('SELECT id FROM outbox_messages WHERE id = :id FOR UPDATE', { replacements: { id: e.outboxId }, type: QueryTypes.SELECT, transaction });
        if (await this.tasks.findOne({ where: { practiceId: e.practiceId, kind: 'delivery_failed', outboxMessageId: e.outboxId }, transaction })) return;
        await this.create(
          {
            practiceId: e.practiceId,
            kind: 'delivery_failed',
            patientId: e.patientId,
            appointmentId: e.appointmentId,
            outboxMessageId: e.outboxId,
            detail: `The ${e.channel === 'sms' ? 'text' : 'e-mail'} (${e.purpose.replace('_', ' ')}) could not be delivered: ${e.reason}`,
          },
          transaction,
        );
      });
    } catch (err) {
      // A listener never throws back into the outbox; the failed row itself still shows the reason.
      this.logger.error(`delivery_failed task for outbox row ${e.outboxId}: ${(err as Error).message}`);
    }
  }
}
