import { Column, DataType, HasMany, Model, Table } from 'sequelize-typescript';
import type { PracticeSettings } from '@ostium/shared';
import { Location } from './location.model.js';

@Table({ tableName: 'practices', underscored: true })
export class Practice extends Model {
  @Column({ type: DataType.INTEGER, autoIncrement: true, primaryKey: true }) declare id: number;
  @Column({ type: DataType.STRING(160), allowNull: false }) declare name: string;
  @Column(DataType.STRING(32)) declare phone: string | null;
  @Column(DataType.STRING(254)) declare email: string | null;
  @Column({ type: DataType.JSON, allowNull: false }) declare settings: PracticeSettings;
  @HasMany(() => Location) declare locations?: Location[];
}
