import type { AppointmentState } from '@ostium/shared';
import { APPOINTMENT_STATES } from '@ostium/shared';
import { Column, DataType, Model, Table } from 'sequelize-typescript';

/** One booked visit of a case; its cells in appointment_cells are what keeps resources from double booking. */
@Table({ tableName: 'appointments', underscored: true })
export class AppointmentRow extends Model {
  @Column({ type: DataType.INTEGER, autoIncrement: true, primaryKey: true }) declare id: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare practiceId: number;
  @Column({ type: DataType.CHAR(36), allowNull: false }) declare seriesId: string;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare visitIndex: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare caseId: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare referralId: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare locationId: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare chairId: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare operatorId: number;
  @Column(DataType.INTEGER) declare microscopeId: number | null;
  @Column({ type: DataType.DATE(3), allowNull: false }) declare start: Date;
  @Column({ type: DataType.DATE(3), allowNull: false }) declare end: Date;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare turnoverMinutes: number;
  @Column({ type: DataType.ENUM(...APPOINTMENT_STATES), allowNull: false, defaultValue: 'booked' }) declare state: AppointmentState;
  @Column({ type: DataType.INTEGER, allowNull: false, defaultValue: 1 }) declare version: number;
  @Column(DataType.DATE(3)) declare confirmedAt: Date | null;
  @Column(DataType.STRING(32)) declare confirmedVia: string | null;
  @Column(DataType.DATE(3)) declare cancelledAt: Date | null;
  @Column(DataType.INTEGER) declare cancelledByUserId: number | null;
  @Column(DataType.STRING(160)) declare cancelledByName: string | null;
  @Column(DataType.STRING(500)) declare cancelReason: string | null;
  @Column(DataType.DECIMAL(8, 1)) declare cancelNoticeHours: string | number | null;
  @Column(DataType.DATE(3)) declare seatedAt: Date | null;
  @Column(DataType.DATE(3)) declare dismissedAt: Date | null;
  @Column(DataType.STRING(1000)) declare notes: string | null;
  @Column(DataType.INTEGER) declare createdBy: number | null;
}
