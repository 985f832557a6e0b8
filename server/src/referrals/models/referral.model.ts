import { BelongsTo, Column, DataType, ForeignKey, HasMany, Model, Table } from 'sequelize-typescript';
import { REFERRAL_STATUSES, URGENCIES, PROCEDURES, type Procedure, type ReferralStatus, type Urgency } from '@ostium/shared';
import { Location } from '../../practices/models/location.model.js';
import { PatientRow } from '../../patients/models/patient.model.js';
import { ReferringDentistRow } from '../../referring-dentists/models/referring-dentist.model.js';
import { CaseRow } from './case.model.js';

@Table({ tableName: 'referrals', underscored: true })
export class ReferralRow extends Model {
  @Column({ type: DataType.INTEGER, autoIncrement: true, primaryKey: true }) declare id: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare practiceId: number;
  @ForeignKey(() => PatientRow) @Column({ type: DataType.INTEGER, allowNull: false }) declare patientId: number;
  @ForeignKey(() => ReferringDentistRow) @Column({ type: DataType.INTEGER, allowNull: false }) declare referringDentistId: number;
  @ForeignKey(() => Location) @Column({ type: DataType.INTEGER, allowNull: false }) declare locationId: number;
  @Column({ type: DataType.DATEONLY, allowNull: false }) declare receivedOn: string;
  @Column({ type: DataType.ENUM(...URGENCIES), allowNull: false }) declare urgency: Urgency;
  @Column({ type: DataType.ENUM(...PROCEDURES), allowNull: false }) declare procedure: Procedure;
  @Column(DataType.TEXT) declare reason: string | null;
  @Column(DataType.TEXT) declare notes: string | null;
  @Column({ type: DataType.ENUM(...REFERRAL_STATUSES), allowNull: false, defaultValue: 'received' }) declare status: ReferralStatus;
  @Column(DataType.STRING(500)) declare statusReason: string | null;
  @Column({ type: DataType.DATE(3), allowNull: false }) declare statusChangedAt: Date;
  @Column(DataType.INTEGER) declare createdBy: number | null;
  declare createdAt: Date;
  @BelongsTo(() => PatientRow) declare patient?: PatientRow | null;
  @BelongsTo(() => ReferringDentistRow) declare referringDentist?: ReferringDentistRow | null;
  @BelongsTo(() => Location) declare location?: Location | null;
  @HasMany(() => CaseRow) declare cases?: CaseRow[];
}
