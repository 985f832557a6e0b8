import { Column, DataType, Model, Table } from 'sequelize-typescript';

/** The hash of an operator's private calendar feed token (one per operator; replaced on renewal). */
@Table({ tableName: 'operator_feed_tokens', underscored: true })
export class OperatorFeedToken extends Model {
  @Column({ type: DataType.INTEGER, autoIncrement: true, primaryKey: true }) declare id: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare practiceId: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare operatorId: number;
  @Column({ type: DataType.CHAR(64), allowNull: false }) declare tokenHash: string;
}
