import { BelongsTo, Column, DataType, ForeignKey, Model, Table } from 'sequelize-typescript';
import { Location } from './location.model.js';
import { Microscope } from './microscope.model.js';

@Table({ tableName: 'chairs', underscored: true })
export class Chair extends Model {
  @Column({ type: DataType.INTEGER, autoIncrement: true, primaryKey: true }) declare id: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare practiceId: number;
  @ForeignKey(() => Location) @Column({ type: DataType.INTEGER, allowNull: false }) declare locationId: number;
  @Column({ type: DataType.STRING(120), allowNull: false }) declare name: string;
  @ForeignKey(() => Microscope) @Column(DataType.INTEGER) declare fixedMicroscopeId: number | null;
  @Column({ type: DataType.BOOLEAN, allowNull: false, defaultValue: true }) declare active: boolean;
  // Bumped by every booking that touches the chair, so concurrent writers collide on this row.
  @Column({ type: DataType.INTEGER, allowNull: false, defaultValue: 0 }) declare version: number;
  @BelongsTo(() => Location) declare location?: Location | null;
  @BelongsTo(() => Microscope) declare fixedMicroscope?: Microscope | null;
}
