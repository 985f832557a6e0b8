import { BelongsTo, Column, DataType, ForeignKey, Model, Table } from 'sequelize-typescript';
import { PROCEDURES, REFERRAL_STATUSES, type Level, type Procedure, type ReferralStatus } from '@ostium/shared';
import { ReferralRow } from './referral.model.js';

/** One tooth of a referral: the unit that is assessed, estimated and booked. */
@Table({ tableName: 'cases', underscored: true })
export class CaseRow extends Model {
  @Column({ type: DataType.INTEGER, autoIncrement: true, primaryKey: true }) declare id: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare practiceId: number;
  @ForeignKey(() => ReferralRow) @Column({ type: DataType.INTEGER, allowNull: false }) declare referralId: number;
  @Column({ type: DataType.CHAR(2), allowNull: false }) declare toothFdi: string;
  @Column({ type: DataType.ENUM(...PROCEDURES), allowNull: false }) declare procedure: Procedure;
  @Column({ type: DataType.ENUM(...REFERRAL_STATUSES), allowNull: false, defaultValue: 'received' }) declare status: ReferralStatus;
  @Column(DataType.JSON) declare assessment: Record<string, unknown> | null;
  @Column(DataType.JSON) declare facts: Record<string, unknown> | null;
  @Column(DataType.JSON) declare estimate: Record<string, unknown> | null;
  @Column(DataType.INTEGER) declare tableVersion: number | null;
  @Column(DataType.JSON) declare override: Record<string, unknown> | null;
  @Column(DataType.STRING(16)) declare level: Level | null;
  @Column(DataType.INTEGER) declare estimatedMinutes: number | null;
  @Column(DataType.INTEGER) declare visitCount: number | null;
  @Column(DataType.INTEGER) declare canals: number | null;
  @Column(DataType.INTEGER) declare operatorId: number | null;
  @Column(DataType.INTEGER) declare updatedBy: number | null;
  declare createdAt: Date;
  declare updatedAt: Date;
  @BelongsTo(() => ReferralRow) declare referral?: ReferralRow | null;
}
