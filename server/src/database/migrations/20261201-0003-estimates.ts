import { DataTypes, type QueryInterface } from 'sequelize';

// Versioned estimate tables and the log of real visit lengths the estimates learn from.
export async function up(q: QueryInterface) {
  await q.createTable('estimate_tables', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    practice_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'practices', key: 'id' } },
    version: { type: DataTypes.INTEGER, allowNull: false },
    content: { type: DataTypes.JSON, allowNull: false },
    created_by: { type: DataTypes.INTEGER, allowNull: true },
    created_at: { type: DataTypes.DATE(3), allowNull: false },
    updated_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await q.addIndex('estimate_tables', ['practice_id', 'version'], { unique: true });
  await q.createTable('visit_history', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    practice_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'practices', key: 'id' } },
    visit_date: { type: DataTypes.DATEONLY, allowNull: false },
    tooth_fdi: { type: DataTypes.STRING(2), allowNull: false },
    procedure: { type: DataTypes.STRING(16), allowNull: false },
    tooth_group: { type: DataTypes.STRING(16), allowNull: false },
    canals: { type: DataTypes.INTEGER, allowNull: false },
    level: { type: DataTypes.STRING(10), allowNull: false },
    operator_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' } },
    estimated_minutes: { type: DataTypes.INTEGER, allowNull: false },
    actual_minutes: { type: DataTypes.INTEGER, allowNull: false },
    table_version: { type: DataTypes.INTEGER, allowNull: false },
    source: { type: DataTypes.STRING(16), allowNull: false },
    appointment_id: { type: DataTypes.INTEGER, allowNull: true },
    created_at: { type: DataTypes.DATE(3), allowNull: false },
    updated_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await q.addIndex('visit_history', ['practice_id', 'procedure', 'tooth_group', 'level']);
  await q.addIndex('visit_history', ['practice_id', 'operator_id']);
}

export async function down(q: QueryInterface) {
  await q.dropTable('visit_history');
  await q.dropTable('estimate_tables');
}
