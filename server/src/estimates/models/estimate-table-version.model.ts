import type { EstimateTable } from '@ostium/shared';
import { Column, DataType, Model, Table } from 'sequelize-typescript';

@Table({ tableName: 'estimate_tables', underscored: true })
export class EstimateTableVersion extends Model {
  @Column({ type: DataType.INTEGER, autoIncrement: true, primaryKey: true }) declare id: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare practiceId: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare version: number;
  @Column({ type: DataType.JSON, allowNull: false }) declare content: EstimateTable;
  @Column(DataType.INTEGER) declare createdBy: number | null;
  declare createdAt: Date;
}
