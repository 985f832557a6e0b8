import type { MessageChannel, OutboxPurpose, OutboxStatus } from '@ostium/shared';
import { OUTBOX_STATUSES } from '@ostium/shared';
import { Column, DataType, Model, Table } from 'sequelize-typescript';

/** Every text and e-mail the practice sends goes through one of these rows (see docs/messaging.md). */
@Table({ tableName: 'outbox_messages', underscored: true })
export class OutboxMessageRow extends Model {
  @Column({ type: DataType.INTEGER, autoIncrement: true, primaryKey: true }) declare id: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare practiceId: number;
  @Column({ type: DataType.ENUM('sms', 'email'), allowNull: false }) declare channel: MessageChannel;
  @Column({ type: DataType.STRING(32), allowNull: false }) declare purpose: OutboxPurpose;
  @Column(DataType.STRING(191)) declare dedupeKey: string | null;
  @Column(DataType.STRING(40)) declare ruleId: string | null;
  @Column(DataType.INTEGER) declare appointmentId: number | null;
  @Column(DataType.INTEGER) declare patientId: number | null;
  @Column(DataType.INTEGER) declare referralId: number | null;
  @Column(DataType.INTEGER) declare letterId: number | null;
  @Column(DataType.STRING(254)) declare toAddress: string | null;
  @Column(DataType.STRING(255)) declare subject: string | null;
  @Column(DataType.TEXT) declare body: string | null;
  @Column(DataType.JSON) declare payload: Record<string, unknown> | null;
  @Column({ type: DataType.ENUM(...OUTBOX_STATUSES), allowNull: false, defaultValue: 'pending' }) declare status: OutboxStatus;
  @Column({ type: DataType.DATE(3), allowNull: false }) declare dueAt: Date;
  @Column({ type: DataType.DATE(3), allowNull: false }) declare plannedAt: Date;
  @Column(DataType.STRING(255)) declare deferReason: string | null;
  @Column({ type: DataType.INTEGER, allowNull: false, defaultValue: 0 }) declare attempts: number;
  @Column(DataType.STRING(500)) declare lastError: string | null;
  @Column(DataType.STRING(64)) declare claimedBy: string | null;
  @Column(DataType.DATE(3)) declare claimedUntil: Date | null;
  @Column(DataType.STRING(64)) declare providerId: string | null;
  @Column(DataType.STRING(32)) declare providerStatus: string | null;
  @Column(DataType.DATE(3)) declare sentAt: Date | null;
  @Column(DataType.DATE(3)) declare deliveredAt: Date | null;
  @Column(DataType.DATE(3)) declare failedAt: Date | null;
  @Column(DataType.INTEGER) declare createdBy: number | null;
  declare createdAt: Date;
  declare updatedAt: Date;
}
