import type { Level, Procedure, ToothGroup } from '@ostium/shared';
import { Column, DataType, Model, Table } from 'sequelize-typescript';

/** One real visit: how long the table said, how long it took. Imported or recorded at dismissal. */
@Table({ tableName: 'visit_history', underscored: true })
export class VisitRecord extends Model {
  @Column({ type: DataType.INTEGER, autoIncrement: true, primaryKey: true }) declare id: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare practiceId: number;
  @Column({ type: DataType.DATEONLY, allowNull: false }) declare visitDate: string;
  @Column({ type: DataType.STRING(2), allowNull: false }) declare toothFdi: string;
  @Column({ type: DataType.STRING(16), allowNull: false }) declare procedure: Procedure;
  @Column({ type: DataType.STRING(16), allowNull: false }) declare toothGroup: ToothGroup;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare canals: number;
  @Column({ type: DataType.STRING(10), allowNull: false }) declare level: Level;
  @Column(DataType.INTEGER) declare operatorId: number | null;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare estimatedMinutes: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare actualMinutes: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare tableVersion: number;
  @Column({ type: DataType.STRING(16), allowNull: false }) declare source: 'import' | 'visit';
  @Column(DataType.INTEGER) declare appointmentId: number | null;
}
