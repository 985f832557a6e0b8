import { Column, DataType, Model, Table } from 'sequelize-typescript';

/** A case whose patient would take an earlier time if one frees up. */
@Table({ tableName: 'waitlist_entries', underscored: true })
export class WaitlistEntryRow extends Model {
  @Column({ type: DataType.INTEGER, autoIncrement: true, primaryKey: true }) declare id: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare practiceId: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare caseId: number;
  @Column(DataType.DATEONLY) declare earliest: string | null;
  @Column(DataType.STRING(500)) declare notes: string | null;
  declare createdAt: Date;
}
