import { BelongsTo, Column, DataType, ForeignKey, Model, Table } from 'sequelize-typescript';
import { Location } from './location.model.js';

@Table({ tableName: 'microscopes', underscored: true })
export class Microscope extends Model {
  @Column({ type: DataType.INTEGER, autoIncrement: true, primaryKey: true }) declare id: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare practiceId: number;
  @ForeignKey(() => Location) @Column({ type: DataType.INTEGER, allowNull: false }) declare locationId: number;
  @Column({ type: DataType.STRING(120), allowNull: false }) declare name: string;
  @Column({ type: DataType.BOOLEAN, allowNull: false, defaultValue: false }) declare mobile: boolean;
  @Column({ type: DataType.BOOLEAN, allowNull: false, defaultValue: true }) declare active: boolean;
  @Column({ type: DataType.INTEGER, allowNull: false, defaultValue: 0 }) declare version: number;
  @BelongsTo(() => Location) declare location?: Location | null;
}
