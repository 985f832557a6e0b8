import type { WallClockRange } from '@ostium/shared';
import { Column, DataType, Model, Table } from 'sequelize-typescript';

/** An operator's recurring working block at one location: RRULE for the days, wall-clock times. */
@Table({ tableName: 'working_rules', underscored: true })
export class WorkingRuleRow extends Model {
  @Column({ type: DataType.INTEGER, autoIncrement: true, primaryKey: true }) declare id: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare practiceId: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare operatorId: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare locationId: number;
  @Column({ type: DataType.STRING(500), allowNull: false }) declare rrule: string;
  @Column({ type: DataType.CHAR(5), allowNull: false }) declare startLocal: string;
  @Column({ type: DataType.CHAR(5), allowNull: false }) declare endLocal: string;
  @Column(DataType.JSON) declare breaks: WallClockRange[] | null;
}
