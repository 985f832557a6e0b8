import { Column, DataType, Model, Table } from 'sequelize-typescript';

@Table({ tableName: 'audit_entries', underscored: true, timestamps: false })
export class AuditEntryRow extends Model {
  @Column({ type: DataType.BIGINT, autoIncrement: true, primaryKey: true }) declare id: number;
  @Column(DataType.INTEGER) declare practiceId: number | null;
  @Column({ type: DataType.DATE(3), allowNull: false }) declare at: Date;
  @Column(DataType.INTEGER) declare userId: number | null;
  @Column(DataType.STRING(254)) declare userEmail: string | null;
  @Column({ type: DataType.ENUM('create', 'update', 'delete'), allowNull: false }) declare action: 'create' | 'update' | 'delete';
  @Column({ type: DataType.STRING(64), allowNull: false }) declare entity: string;
  @Column({ type: DataType.STRING(64), allowNull: false }) declare entityId: string;
  @Column(DataType.JSON) declare before: Record<string, unknown> | null;
  @Column(DataType.JSON) declare after: Record<string, unknown> | null;
  @Column(DataType.STRING(64)) declare requestId: string | null;
}
