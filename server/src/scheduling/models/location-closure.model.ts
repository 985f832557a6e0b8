import { Column, DataType, Model, Table } from 'sequelize-typescript';

/** A whole local day on which a location is shut (holiday, training), with the reason shown. */
@Table({ tableName: 'location_closures', underscored: true })
export class LocationClosure extends Model {
  @Column({ type: DataType.INTEGER, autoIncrement: true, primaryKey: true }) declare id: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare practiceId: number;
  @Column({ type: DataType.INTEGER, allowNull: false }) declare locationId: number;
  @Column({ type: DataType.DATEONLY, allowNull: false }) declare date: string;
  @Column({ type: DataType.STRING(200), allowNull: false }) declare reason: string;
}
