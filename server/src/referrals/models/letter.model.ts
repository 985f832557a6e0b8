import { Column, DataType, Model, Table } from 'sequelize-typescript';
import type { LetterSummary } from '@ostium/shared';

@Table({ tableName: 'letters', underscored: true })
export class LetterRow extends Model {
  @Column({ type: DataType.INTEGER, autoIncrement: true, primaryKey: true }) declare id: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare practiceId: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare referralId: number;
  @Column({ type: DataType.ENUM('acknowledgement', 'booking_notice', 'completion_report'), allowNull: false }) declare kind: LetterSummary['kind'];
  @Column({ type: DataType.STRING(254), allowNull: false }) declare toAddress: string;
  @Column({ type: DataType.STRING(255), allowNull: false }) declare subject: string;
  @Column({ type: DataType.ENUM('sent', 'failed', 'skipped'), allowNull: false }) declare status: LetterSummary['status'];
  @Column(DataType.STRING(1000)) declare detail: string | null;
  @Column(DataType.STRING(255)) declare messageId: string | null;
  @Column({ type: DataType.DATE(3), allowNull: false }) declare at: Date;
}
