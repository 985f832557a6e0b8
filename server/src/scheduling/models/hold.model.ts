import { Column, DataType, Model, Table } from 'sequelize-typescript';

/** A recurring emergency block of an operator; only urgent cases take it before it opens. */
@Table({ tableName: 'holds', underscored: true })
export class HoldRow extends Model {
  @Column({ type: DataType.INTEGER, autoIncrement: true, primaryKey: true }) declare id: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare practiceId: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare operatorId: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare locationId: number;
  @Column({ type: DataType.STRING(500), allowNull: false }) declare rrule: string;
  @Column({ type: DataType.CHAR(5), allowNull: false }) declare startLocal: string;
  @Column({ type: DataType.CHAR(5), allowNull: false }) declare endLocal: string;
  @Column(DataType.CHAR(5)) declare opensEveningBeforeAt: string | null;
}
