import { Column, DataType, Model, Table } from 'sequelize-typescript';

/** A completed case: the endodontist's findings and recall plan, and the completion report letter. */
@Table({ tableName: 'case_completions', underscored: true })
export class CaseCompletionRow extends Model {
  @Column({ type: DataType.INTEGER, autoIncrement: true, primaryKey: true }) declare id: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare practiceId: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare caseId: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare referralId: number;
  @Column({ type: DataType.TEXT, allowNull: false }) declare findings: string;
  @Column({ type: DataType.JSON, allowNull: false }) declare recallMonths: number[];
  @Column({ type: DataType.DATEONLY, allowNull: false }) declare treatmentEndedOn: string;
  @Column({ type: DataType.BOOLEAN, allowNull: false }) declare sendReport: boolean;
  @Column(DataType.INTEGER) declare reportLetterId: number | null;
  @Column(DataType.INTEGER) declare completedBy: number | null;
  @Column(DataType.STRING(160)) declare completedByName: string | null;
  @Column({ type: DataType.DATE(3), allowNull: false }) declare completedAt: Date;
  declare createdAt: Date;
  declare updatedAt: Date;
}
