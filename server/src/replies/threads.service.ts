import { BadRequestException, ConflictException, Injectable, NotFoundException } from '@nestjs/common';
import { InjectModel } from '@nestjs/sequelize';
import type { OutboxMessage, ReplyThread, ReplyThreadSummary, ThreadItem } from '@ostium/shared';
import { Op, QueryTypes } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import { MessagingClock } from '../messaging/messaging-clock.service.js';
import { OutboxMessageRow } from '../messaging/models/outbox-message.model.js';
import { OutboxService } from '../messaging/outbox.service.js';
import { PatientsService } from '../patients/patients.service.js';
import { smsLength } from '../reminders/rules/sms-encoding.util.js';
import { DeskTasksService } from './desk-tasks.service.js';
import type { DeskReplyDto } from './dto/replies.dto.js';
import { InboundMessageRow } from './models/inbound-message.model.js';
import { ReplyContextService } from './reply-context.service.js';
import { deskReplyText } from './reply-texts.util.js';
import { VisitActionsService } from './visit-actions.service.js';

export type ThreadFilter = 'all' | 'unread' | 'tasks' | 'failed';

/** A thread is a patient's (by id) or an unmatched sender's (`unmatched:<address>`). */
export type ThreadKey = { patientId: number } | { address: string };

const UNMATCHED = /^unmatched:(.{1,254})$/;

export function parseThreadKey(raw: string): ThreadKey {
  if (/^\d{1,9}$/.test(raw)) return { patientId: Number(raw) };
  const m = UNMATCHED.exec(raw);
  if (m) return { address: m[1]! };
  throw new BadRequestException({ message: 'patientId must be a patient id or unmatched:<address>', errors: [{ field: 'patientId', message: 'a patient id or unmatched:<address>' }] });
}

const iso = (d: Date | string | null) => (d ? new Date(d).toISOString() : null);
const PURPOSE_LABEL: Record<string, string> = {
  reminder: 'Reminder',
  booking_email: 'Booking e-mail',
  keyword_reply: 'Automatic reply',
  desk_reply: 'Reply from the desk',
  waitlist_offer: 'Waitlist offer',
  letter: 'Letter',
};

/** When an outbox item sits in the thread: when it went (or failed), else when it is due. */
const outAt = (m: OutboxMessage) => m.sentAt ?? m.failedAt ?? m.dueAt;
/** The same in SQL for the list, counting only what has happened by now (a reminder planned for next week is no activity yet). */
const OUT_AT = 'COALESCE(sent_at, failed_at, IF(due_at <= :now, due_at, NULL))';

export function mapInbound(r: InboundMessageRow): Extract<ThreadItem, { direction: 'in' }> {
  return {
    direction: 'in',
    id: r.id,
    channel: r.channel,
    from: r.fromAddress,
    body: r.body,
    kind: r.kind,
    effect: r.effect,
    appointmentId: r.appointmentId,
    receivedAt: r.receivedAt.toISOString(),
    readAt: iso(r.readAt),
  };
}

interface Acc {
  patientId: number | null;
  address: string | null;
  unread: number;
  openTasks: number;
  failed: number;
  lastAt: number;
  lastPreview: string;
}

/** The front desk's Replies: one thread per patient (and per unknown sender), tasks, desk replies. */
@Injectable()
export class ThreadsService {
  constructor(
    private readonly sequelize: Sequelize,
    @InjectModel(InboundMessageRow) private readonly inbound: typeof InboundMessageRow,
    @InjectModel(OutboxMessageRow) private readonly outboxRows: typeof OutboxMessageRow,
    private readonly outbox: OutboxService,
    private readonly patients: PatientsService,
    private readonly tasks: DeskTasksService,
    private readonly visits: VisitActionsService,
    private readonly context: ReplyContextService,
    private readonly clock: MessagingClock,
  ) {}

  private select<T extends object>(sql: string, replacements: Record<string, unknown>) {
    return this.sequelize.query<T>(sql, { replacements, type: QueryTypes.SELECT });
  }

  /** Unread threads first, then the most recent; five grouped queries whatever the number of threads. */
  async list(practiceId: number, filter: ThreadFilter = 'all', now = this.clock.now()): Promise<ReplyThreadSummary[]> {
    const p = { practiceId, now };
    const [ins, outs, lastIns, lastOuts, tasks] = await Promise.all([
      this.select<{ patient_id: number | null; addr: string | null; unread: string | number; last_at: Date }>(
        `SELECT patient_id, IF(patient_id IS NULL, from_address, NULL) AS addr, SUM(read_at IS NULL) AS unread, MAX(received_at) AS last_at
           FROM inbound_messages WHERE practice_id = :practiceId GROUP BY patient_id, addr`,
        p,
      ),
      this.select<{ patient_id: number; failed: string | number; last_at: Date | null }>(
        `SELECT patient_id, SUM(status = 'failed') AS failed, MAX(${OUT_AT}) AS last_at
           FROM outbox_messages WHERE practice_id = :practiceId AND patient_id IS NOT NULL AND purpose <> 'letter' GROUP BY patient_id`,
        p,
      ),
      this.select<{ patient_id: number | null; addr: string | null; body: string }>(
        `SELECT patient_id, addr, body FROM (
           SELECT patient_id, IF(patient_id IS NULL, from_address, NULL) AS addr, body,
                  ROW_NUMBER() OVER (PARTITION BY patient_id, IF(patient_id IS NULL, from_address, NULL) ORDER BY received_at DESC, id DESC) AS rn
             FROM inbound_messages WHERE practice_id = :practiceId) x WHERE rn = 1`,
        p,
      ),
      this.select<{ patient_id: number; body: string | null; purpose: string; status: string }>(
        `SELECT patient_id, body, purpose, status FROM (
           SELECT patient_id, body, purpose, status,
                  ROW_NUMBER() OVER (PARTITION BY patient_id ORDER BY ${OUT_AT} IS NULL, ${OUT_AT} DESC, id DESC) AS rn
             FROM outbox_messages WHERE practice_id = :practiceId AND patient_id IS NOT NULL AND purpose <> 'letter') x WHERE rn = 1`,
        p,
      ),
      this.select<{ patient_id: number | null; addr: string | null; n: string | number }>(
        `SELECT t.patient_id, IF(t.patient_id IS NULL, m.from_address, NULL) AS addr, COUNT(*) AS n
           FROM desk_tasks t LEFT JOIN inbound_messages m ON m.id = t.inbound_message_id
          WHERE t.practice_id = :practiceId AND t.status = 'open' GROUP BY t.patient_id, addr`,
        p,
      ),
    ]);
    const threads = new Map<string, Acc & { inAt: number; outAt: number; inPreview?: string; outPreview?: string }>();
    const keyOf = (patientId: number | null, addr: string | null) => (patientId !== null ? `p${patientId}` : `a${addr}`);
    const acc = (patientId: number | null, addr: string | null) => {
      const k = keyOf(patientId, addr);
      let t = threads.get(k);
      if (!t) {
        t = { patientId, address: patientId === null ? addr : null, unread: 0, openTasks: 0, failed: 0, lastAt: 0, lastPreview: '', inAt: 0, outAt: 0 };
        threads.set(k, t);
      }
      return t;
    };
    for (const r of ins) Object.assign(acc(r.patient_id, r.addr), { unread: Number(r.unread), inAt: new Date(r.last_at).getTime() });
    for (const r of outs) Object.assign(acc(r.patient_id, null), { failed: Number(r.failed), outAt: r.last_at ? new Date(r.last_at).getTime() : 0 });
    for (const r of lastIns) acc(r.patient_id, r.addr).inPreview = r.body;
    for (const r of lastOuts) acc(r.patient_id, null).outPreview = r.body ?? `${PURPOSE_LABEL[r.purpose] ?? r.purpose} (${r.status})`;
    for (const r of tasks) {
      // A task without a patient and without an inbound text (none made so far) has no thread to sit in.
      if (r.patient_id === null && r.addr === null) continue;
      acc(r.patient_id, r.addr).openTasks = Number(r.n);
    }
    const all = [...threads.values()].filter((t) => t.inAt || t.outAt || t.failed);
    const ids = all.flatMap((t) => (t.patientId !== null ? [t.patientId] : []));
    const people = ids.length
      ? await this.select<{ id: number; first_name: string; last_name: string; sms_consent: number | boolean }>(
          'SELECT id, first_name, last_name, sms_consent FROM patients WHERE practice_id = :practiceId AND id IN (:ids)',
          { practiceId, ids },
        )
      : [];
    const byId = new Map(people.map((x) => [x.id, x]));
    const out: ReplyThreadSummary[] = all.map((t) => {
      const person = t.patientId !== null ? byId.get(t.patientId) : undefined;
      // On a tie the reply follows what it answers.
      const inLater = t.inAt > t.outAt;
      return {
        patientId: t.patientId,
        patientName: person ? `${person.first_name} ${person.last_name}` : null,
        address: t.address,
        unread: t.unread,
        openTasks: t.openTasks,
        failed: t.failed,
        lastAt: new Date(Math.max(t.inAt, t.outAt)).toISOString(),
        lastPreview: ((inLater ? t.inPreview : t.outPreview) ?? t.inPreview ?? t.outPreview ?? '').slice(0, 160),
        smsConsent: person ? !!person.sms_consent : null,
      };
    });
    const wanted = out.filter((t) => (filter === 'unread' ? t.unread > 0 : filter === 'tasks' ? t.openTasks > 0 : filter === 'failed' ? t.failed > 0 : true));
    return wanted.sort((a, b) => Number(b.unread > 0) - Number(a.unread > 0) || b.lastAt.localeCompare(a.lastAt) || (a.patientId ?? 0) - (b.patientId ?? 0)).slice(0, 300);
  }

  async get(practiceId: number, key: ThreadKey, now = this.clock.now()): Promise<ReplyThread> {
    if ('address' in key) {
      const rows = await this.inbound.findAll({ where: { practiceId, patientId: null, fromAddress: key.address }, order: [['receivedAt', 'ASC'], ['id', 'ASC']] });
      if (!rows.length) throw new NotFoundException(`No texts from ${key.address}`);
      return {
        patientId: null,
        patientName: null,
        phone: key.address,
        email: null,
        smsConsent: null,
        nextAppointment: null,
        items: rows.map(mapInbound),
        tasks: await this.tasks.listForAddress(practiceId, key.address),
      };
    }
    const patient = await this.patients.get(practiceId, key.patientId);
    const [outs, ins, tasks, visits] = await Promise.all([
      // Letters go to the referring dentist, not to the patient: they are on the referral, not in this thread.
      this.outboxRows.findAll({ where: { practiceId, patientId: patient.id, purpose: { [Op.ne]: 'letter' } }, order: [['id', 'ASC']] }),
      this.inbound.findAll({ where: { practiceId, patientId: patient.id }, order: [['receivedAt', 'ASC'], ['id', 'ASC']] }),
      this.tasks.list(practiceId, undefined, patient.id),
      this.visits.replyableVisits([patient.id], now),
    ]);
    const items: { at: string; item: ThreadItem }[] = [
      ...outs.map((r) => {
        const m = this.outbox.toDto(r);
        return { at: outAt(m), item: { direction: 'out' as const, ...m } };
      }),
      ...ins.map((r) => ({ at: r.receivedAt.toISOString(), item: mapInbound(r) })),
    ];
    items.sort((a, b) => a.at.localeCompare(b.at) || (a.item.direction === b.item.direction ? a.item.id - b.item.id : a.item.direction === 'in' ? -1 : 1));
    const next = visits.find((v) => v.start.getTime() > now.getTime()) ?? null;
    return {
      patientId: patient.id,
      patientName: `${patient.firstName} ${patient.lastName}`,
      phone: patient.phone,
      email: patient.email,
      smsConsent: patient.smsConsent,
      nextAppointment: next ? { id: next.id, start: next.start.toISOString(), state: next.state, locationName: next.locationName } : null,
      items: items.map((x) => x.item),
      tasks,
    };
  }

  async markRead(practiceId: number, key: ThreadKey, userId: number, now = this.clock.now()): Promise<number> {
    const where = 'address' in key ? { practiceId, patientId: null, fromAddress: key.address, readAt: null } : { practiceId, patientId: (await this.patients.find(practiceId, key.patientId)).id, readAt: null };
    const [n] = await this.inbound.update({ readAt: now, readBy: userId }, { where });
    return n;
  }

  /**
   * A message typed by the front desk, sent through the outbox. A text needs the patient's consent and
   * must fit one segment with the opt-out hint (references.md "Messages"); an e-mail needs an address.
   */
  async reply(practiceId: number, key: ThreadKey, dto: DeskReplyDto, userId: number, now = this.clock.now()): Promise<OutboxMessage> {
    if ('address' in key) {
      throw new ConflictException(`${key.address} belongs to no patient, so there is no consent to text it; add the number to a patient first`);
    }
    const patient = await this.patients.get(practiceId, key.patientId);
    const name = `${patient.firstName} ${patient.lastName}`;
    const [visit] = (await this.visits.replyableVisits([patient.id], now)).filter((v) => v.start.getTime() > now.getTime());
    if (dto.channel === 'sms') {
      if (!patient.phone) throw new ConflictException(`${name} has no mobile number on file`);
      if (!patient.smsConsent) {
        const why = patient.smsConsentSource ? ` (${patient.smsConsentSource})` : '';
        throw new ConflictException(`${name} has not agreed to texts${why}; call or e-mail instead`);
      }
      const text = deskReplyText(dto.body);
      const length = smsLength(text);
      if (length.units > length.limit) {
        const message = `body: with the opt-out hint the text is ${length.units} of ${length.limit} ${length.encoding} characters; shorten it to one segment`;
        throw new BadRequestException({ message, errors: [{ field: 'body', message }] });
      }
      const { row } = await this.outbox.enqueue({
        practiceId,
        channel: 'sms',
        purpose: 'desk_reply',
        patientId: patient.id,
        appointmentId: visit?.id ?? null,
        to: patient.phone,
        body: text,
        dueAt: now,
        createdBy: userId,
      });
      return this.outbox.toDto(row);
    }
    if (!patient.email) throw new ConflictException(`${name} has no e-mail address on file`);
    const practice = await this.context.practice(practiceId);
    const { row } = await this.outbox.enqueue({
      practiceId,
      channel: 'email',
      purpose: 'desk_reply',
      patientId: patient.id,
      appointmentId: visit?.id ?? null,
      to: patient.email,
      subject: dto.subject?.trim() || `A message from ${practice.name}`,
      body: dto.body.trim(),
      dueAt: now,
      createdBy: userId,
    });
    return this.outbox.toDto(row);
  }
}
