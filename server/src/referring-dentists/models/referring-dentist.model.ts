import { Column, DataType, Model, Table } from 'sequelize-typescript';
import type { LetterChannel } from '@ostium/shared';

@Table({ tableName: 'referring_dentists', underscored: true })
export class ReferringDentistRow extends Model {
  @Column({ type: DataType.INTEGER, autoIncrement: true, primaryKey: true }) declare id: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare practiceId: number;
  @Column({ type: DataType.STRING(160), allowNull: false }) declare name: string;
  @Column(DataType.STRING(160)) declare practiceName: string | null;
  @Column(DataType.STRING(254)) declare email: string | null;
  @Column(DataType.STRING(32)) declare phone: string | null;
  @Column(DataType.STRING(400)) declare address: string | null;
  @Column({ type: DataType.ENUM('email', 'post', 'fax'), allowNull: false, defaultValue: 'email' }) declare letterChannel: LetterChannel;
  @Column(DataType.TEXT) declare notes: string | null;
  declare createdAt: Date;
}
