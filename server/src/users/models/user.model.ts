import { Column, DataType, Model, Table } from 'sequelize-typescript';
import type { Role } from '@ostium/shared';

@Table({ tableName: 'users', underscored: true })
export class User extends Model {
  @Column({ type: DataType.INTEGER, autoIncrement: true, primaryKey: true }) declare id: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare practiceId: number;
  @Column({ type: DataType.STRING(254), allowNull: false, unique: true }) declare email: string;
  @Column({ type: DataType.STRING(160), allowNull: false }) declare name: string;
  @Column({ type: DataType.ENUM('admin', 'manager', 'endodontist', 'assistant', 'frontdesk'), allowNull: false }) declare role: Role;
  @Column({ type: DataType.STRING(255), allowNull: false }) declare passwordHash: string;
  @Column({ type: DataType.BOOLEAN, allowNull: false, defaultValue: true }) declare active: boolean;
  // Bumped on deactivation, role change or password change: older tokens stop working at once.
  @Column({ type: DataType.INTEGER, allowNull: false, defaultValue: 0 }) declare tokenVersion: number;
  @Column(DataType.DATE(3)) declare lastSignInAt: Date | null;
  declare createdAt: Date;
}
