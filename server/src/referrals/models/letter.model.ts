import { Column, DataType, Model, Table } from 'sequelize-typescript';
import { LETTER_KINDS, LETTER_STATUSES, type LetterSummary } from '@ostium/shared';

@Table({ tableName: 'letters', underscored: true })
export class LetterRow extends Model {
  @Column({ type: DataType.INTEGER, autoIncrement: true, primaryKey: true }) declare id: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare practiceId: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare referralId: number;
  @Column(DataType.INTEGER) declare caseId: number | null;
  @Column({ type: DataType.ENUM(...LETTER_KINDS), allowNull: false }) declare kind: LetterSummary['kind'];
  @Column({ type: DataType.STRING(254), allowNull: false }) declare toAddress: string;
  @Column({ type: DataType.STRING(255), allowNull: false }) declare subject: string;
  @Column({ type: DataType.ENUM(...LETTER_STATUSES), allowNull: false }) declare status: LetterSummary['status'];
  @Column(DataType.STRING(1000)) declare detail: string | null;
  @Column(DataType.STRING(255)) declare messageId: string | null;
  @Column(DataType.STRING(191)) declare dedupeKey: string | null;
  @Column(DataType.INTEGER) declare outboxMessageId: number | null;
  @Column(DataType.DATE(3)) declare sentAt: Date | null;
  /** What the letter said when last composed for sending (LetterContent), so its PDF can be rendered again. */
  @Column(DataType.JSON) declare content: Record<string, unknown> | null;
  @Column({ type: DataType.DATE(3), allowNull: false }) declare at: Date;
  declare createdAt: Date;
  declare updatedAt: Date;
}
