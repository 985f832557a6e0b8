import { Column, DataType, Model, Table } from 'sequelize-typescript';
import type { AttachmentSummary } from '@ostium/shared';

@Table({ tableName: 'attachments', underscored: true })
export class AttachmentRow extends Model {
  @Column({ type: DataType.INTEGER, autoIncrement: true, primaryKey: true }) declare id: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare practiceId: number;
  @Column(DataType.INTEGER) declare referralId: number | null;
  @Column({ type: DataType.ENUM('radiograph', 'letter'), allowNull: false }) declare kind: AttachmentSummary['kind'];
  @Column({ type: DataType.STRING(255), allowNull: false }) declare originalName: string;
  @Column({ type: DataType.STRING(64), allowNull: false }) declare mimeType: AttachmentSummary['mimeType'];
  @Column({ type: DataType.INTEGER, allowNull: false }) declare sizeBytes: number;
  @Column({ type: DataType.CHAR(64), allowNull: false }) declare sha256: string;
  // Random file name under the upload folder; never derived from anything the uploader sent.
  @Column({ type: DataType.STRING(64), allowNull: false }) declare storageName: string;
  @Column(DataType.INTEGER) declare uploadedBy: number | null;
  declare createdAt: Date;
}
