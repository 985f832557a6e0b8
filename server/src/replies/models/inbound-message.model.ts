import type { ReplyKindName } from '@ostium/shared';
import { Column, DataType, Model, Table } from 'sequelize-typescript';

/** A text (or a visit-link action) that came back from a patient or an unknown sender, stored once. */
@Table({ tableName: 'inbound_messages', underscored: true })
export class InboundMessageRow extends Model {
  @Column({ type: DataType.INTEGER, autoIncrement: true, primaryKey: true }) declare id: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare practiceId: number;
  @Column({ type: DataType.ENUM('sms', 'email', 'link'), allowNull: false }) declare channel: 'sms' | 'email' | 'link';
  @Column(DataType.INTEGER) declare patientId: number | null;
  @Column(DataType.INTEGER) declare appointmentId: number | null;
  @Column({ type: DataType.STRING(254), allowNull: false }) declare fromAddress: string;
  @Column(DataType.STRING(254)) declare toAddress: string | null;
  @Column({ type: DataType.TEXT, allowNull: false }) declare body: string;
  @Column(DataType.STRING(64)) declare providerId: string | null;
  @Column({ type: DataType.STRING(24), allowNull: false }) declare kind: ReplyKindName;
  @Column(DataType.STRING(500)) declare effect: string | null;
  @Column(DataType.DATE(3)) declare readAt: Date | null;
  @Column(DataType.INTEGER) declare readBy: number | null;
  @Column({ type: DataType.DATE(3), allowNull: false }) declare receivedAt: Date;
  declare createdAt: Date;
  declare updatedAt: Date;
}
