import { Column, DataType, Model, Table } from 'sequelize-typescript';
import type { PreferredChannel } from '@ostium/shared';

@Table({ tableName: 'patients', underscored: true })
export class PatientRow extends Model {
  @Column({ type: DataType.INTEGER, autoIncrement: true, primaryKey: true }) declare id: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare practiceId: number;
  @Column({ type: DataType.STRING(80), allowNull: false }) declare firstName: string;
  @Column({ type: DataType.STRING(80), allowNull: false }) declare lastName: string;
  @Column({ type: DataType.DATEONLY, allowNull: false }) declare dateOfBirth: string;
  @Column(DataType.STRING(16)) declare phone: string | null;
  @Column(DataType.STRING(254)) declare email: string | null;
  @Column({ type: DataType.ENUM('text', 'email', 'phone'), allowNull: false, defaultValue: 'text' }) declare preferredChannel: PreferredChannel;
  @Column({ type: DataType.BOOLEAN, allowNull: false, defaultValue: false }) declare smsConsent: boolean;
  @Column(DataType.DATE(3)) declare smsConsentAt: Date | null;
  @Column(DataType.STRING(160)) declare smsConsentSource: string | null;
  @Column(DataType.STRING(64)) declare timeZone: string | null;
  @Column(DataType.TEXT) declare notes: string | null;
  declare createdAt: Date;
}
