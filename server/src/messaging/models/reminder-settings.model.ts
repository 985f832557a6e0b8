import type { ReminderSettings } from '@ostium/shared';
import { Column, DataType, Model, Table } from 'sequelize-typescript';

/** One row per practice; each save bumps the version. */
@Table({ tableName: 'reminder_settings', underscored: true })
export class ReminderSettingsRow extends Model {
  @Column({ type: DataType.INTEGER, primaryKey: true }) declare practiceId: number;
  @Column({ type: DataType.JSON, allowNull: false }) declare settings: ReminderSettings;
  @Column({ type: DataType.INTEGER, allowNull: false, defaultValue: 1 }) declare version: number;
  @Column(DataType.INTEGER) declare updatedBy: number | null;
  declare createdAt: Date;
  declare updatedAt: Date;
}
