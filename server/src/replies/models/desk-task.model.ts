import type { DeskTaskKind } from '@ostium/shared';
import { Column, DataType, Model, Table } from 'sequelize-typescript';

/** Something the front desk has to do by hand: call back, fix a number, place an unknown sender. */
@Table({ tableName: 'desk_tasks', underscored: true })
export class DeskTaskRow extends Model {
  @Column({ type: DataType.INTEGER, autoIncrement: true, primaryKey: true }) declare id: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare practiceId: number;
  @Column({ type: DataType.STRING(32), allowNull: false }) declare kind: DeskTaskKind;
  @Column(DataType.INTEGER) declare patientId: number | null;
  @Column(DataType.INTEGER) declare appointmentId: number | null;
  @Column(DataType.INTEGER) declare inboundMessageId: number | null;
  @Column(DataType.INTEGER) declare outboxMessageId: number | null;
  @Column({ type: DataType.STRING(500), allowNull: false }) declare detail: string;
  @Column({ type: DataType.ENUM('open', 'done'), allowNull: false, defaultValue: 'open' }) declare status: 'open' | 'done';
  @Column(DataType.DATE(3)) declare doneAt: Date | null;
  @Column(DataType.INTEGER) declare doneBy: number | null;
  declare createdAt: Date;
  declare updatedAt: Date;
}
