import { Column, DataType, Model, Table } from 'sequelize-typescript';
import { REFERRAL_STATUSES, type ReferralStatus } from '@ostium/shared';

@Table({ tableName: 'referral_status_events', underscored: true, timestamps: false })
export class StatusEventRow extends Model {
  @Column({ type: DataType.BIGINT, autoIncrement: true, primaryKey: true }) declare id: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare practiceId: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare referralId: number;
  @Column({ type: DataType.ENUM(...REFERRAL_STATUSES), allowNull: false }) declare status: ReferralStatus;
  @Column(DataType.STRING(500)) declare reason: string | null;
  @Column(DataType.INTEGER) declare byUserId: number | null;
  @Column(DataType.STRING(160)) declare byName: string | null;
  @Column({ type: DataType.DATE(3), allowNull: false }) declare at: Date;
}
