import { Column, DataType, Model, Table } from 'sequelize-typescript';

/** An operator away between two instants (stored UTC). */
@Table({ tableName: 'time_off', underscored: true })
export class TimeOffRow extends Model {
  @Column({ type: DataType.INTEGER, autoIncrement: true, primaryKey: true }) declare id: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare practiceId: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare operatorId: number;
  @Column({ type: DataType.DATE(3), allowNull: false }) declare start: Date;
  @Column({ type: DataType.DATE(3), allowNull: false }) declare end: Date;
  @Column(DataType.STRING(200)) declare reason: string | null;
}
