import { Column, DataType, Model, Table } from 'sequelize-typescript';

export type OfferSlotStatus = 'open' | 'taken' | 'expired';

/** Time a cancellation or a move freed, offered to waitlisted patients; taken once (first reply wins). */
@Table({ tableName: 'waitlist_offer_slots', underscored: true })
export class WaitlistOfferSlotRow extends Model {
  @Column({ type: DataType.INTEGER, autoIncrement: true, primaryKey: true }) declare id: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare practiceId: number;
  @Column(DataType.INTEGER) declare freedAppointmentId: number | null;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare locationId: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare chairId: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare operatorId: number;
  @Column(DataType.INTEGER) declare microscopeId: number | null;
  @Column({ type: DataType.DATE(3), allowNull: false }) declare start: Date;
  @Column({ type: DataType.DATE(3), allowNull: false }) declare end: Date;
  @Column({ type: DataType.ENUM('open', 'taken', 'expired'), allowNull: false, defaultValue: 'open' }) declare status: OfferSlotStatus;
  @Column(DataType.INTEGER) declare takenByOfferId: number | null;
  @Column(DataType.INTEGER) declare bookedAppointmentId: number | null;
  @Column({ type: DataType.DATE(3), allowNull: false }) declare expiresAt: Date;
  declare createdAt: Date;
  declare updatedAt: Date;
}
