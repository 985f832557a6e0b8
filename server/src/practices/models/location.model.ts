import { BelongsTo, Column, DataType, ForeignKey, HasMany, Model, Table } from 'sequelize-typescript';
import type { OpeningHours } from '@ostium/shared';
import { Practice } from './practice.model.js';
import { Chair } from './chair.model.js';
import { Microscope } from './microscope.model.js';

@Table({ tableName: 'locations', underscored: true })
export class Location extends Model {
  @Column({ type: DataType.INTEGER, autoIncrement: true, primaryKey: true }) declare id: number;
  @ForeignKey(() => Practice) @Column({ type: DataType.INTEGER, allowNull: false }) declare practiceId: number;
  @Column({ type: DataType.STRING(120), allowNull: false }) declare name: string;
  @Column(DataType.STRING(400)) declare address: string | null;
  @Column(DataType.STRING(32)) declare phone: string | null;
  @Column({ type: DataType.STRING(64), allowNull: false }) declare timeZone: string;
  @Column({ type: DataType.JSON, allowNull: false }) declare openingHours: OpeningHours;
  @BelongsTo(() => Practice) declare practice?: Practice | null;
  @HasMany(() => Chair) declare chairs?: Chair[];
  @HasMany(() => Microscope) declare microscopes?: Microscope[];
}
