import { Column, DataType, Model, Table } from 'sequelize-typescript';

export type OfferStatus = 'offered' | 'accepted' | 'gone' | 'expired';

/** One waitlisted patient's text offer of a freed slot. */
@Table({ tableName: 'waitlist_offers', underscored: true })
export class WaitlistOfferRow extends Model {
  @Column({ type: DataType.INTEGER, autoIncrement: true, primaryKey: true }) declare id: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare practiceId: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare slotId: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare waitlistEntryId: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare patientId: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare caseId: number;
  @Column(DataType.INTEGER) declare outboxMessageId: number | null;
  @Column({ type: DataType.ENUM('offered', 'accepted', 'gone', 'expired'), allowNull: false, defaultValue: 'offered' }) declare status: OfferStatus;
  @Column(DataType.DATE(3)) declare answeredAt: Date | null;
  declare createdAt: Date;
  declare updatedAt: Date;
}
