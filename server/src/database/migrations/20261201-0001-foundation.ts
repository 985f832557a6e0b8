import { DataTypes, type QueryInterface } from 'sequelize';

// Practices, their locations and resources, users and the audit log: what every later table hangs on.
const timestamps = {
  created_at: { type: DataTypes.DATE(3), allowNull: false },
  updated_at: { type: DataTypes.DATE(3), allowNull: false },
};

export async function up(q: QueryInterface) {
  await q.createTable('practices', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    name: { type: DataTypes.STRING(160), allowNull: false },
    phone: { type: DataTypes.STRING(32), allowNull: true },
    email: { type: DataTypes.STRING(254), allowNull: true },
    settings: { type: DataTypes.JSON, allowNull: false },
    ...timestamps,
  });
  await q.createTable('locations', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    practice_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'practices', key: 'id' } },
    name: { type: DataTypes.STRING(120), allowNull: false },
    address: { type: DataTypes.STRING(400), allowNull: true },
    phone: { type: DataTypes.STRING(32), allowNull: true },
    time_zone: { type: DataTypes.STRING(64), allowNull: false },
    opening_hours: { type: DataTypes.JSON, allowNull: false },
    ...timestamps,
  });
  await q.addIndex('locations', ['practice_id', 'name'], { unique: true });
  await q.createTable('microscopes', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    practice_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'practices', key: 'id' } },
    location_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'locations', key: 'id' } },
    name: { type: DataTypes.STRING(120), allowNull: false },
    mobile: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    ...timestamps,
  });
  await q.createTable('chairs', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    practice_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'practices', key: 'id' } },
    location_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'locations', key: 'id' } },
    name: { type: DataTypes.STRING(120), allowNull: false },
    fixed_microscope_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'microscopes', key: 'id' } },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    ...timestamps,
  });
  await q.addIndex('chairs', ['location_id', 'name'], { unique: true });
  await q.createTable('users', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    practice_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'practices', key: 'id' } },
    email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(160), allowNull: false },
    role: { type: DataTypes.ENUM('admin', 'manager', 'endodontist', 'assistant', 'frontdesk'), allowNull: false },
    password_hash: { type: DataTypes.STRING(255), allowNull: false },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    token_version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    last_sign_in_at: { type: DataTypes.DATE(3), allowNull: true },
    ...timestamps,
  });
  await q.createTable('audit_entries', {
    id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
    practice_id: { type: DataTypes.INTEGER, allowNull: true },
    at: { type: DataTypes.DATE(3), allowNull: false },
    user_id: { type: DataTypes.INTEGER, allowNull: true },
    user_email: { type: DataTypes.STRING(254), allowNull: true },
    action: { type: DataTypes.ENUM('create', 'update', 'delete'), allowNull: false },
    entity: { type: DataTypes.STRING(64), allowNull: false },
    entity_id: { type: DataTypes.STRING(64), allowNull: false },
    before: { type: DataTypes.JSON, allowNull: true },
    after: { type: DataTypes.JSON, allowNull: true },
    request_id: { type: DataTypes.STRING(64), allowNull: true },
  });
  await q.addIndex('audit_entries', ['practice_id', 'at']);
  await q.addIndex('audit_entries', ['entity', 'entity_id']);
  await q.addIndex('audit_entries', ['user_id', 'at']);
}

export async function down(q: QueryInterface) {
  for (const t of ['audit_entries', 'users', 'chairs', 'microscopes', 'locations', 'practices']) await q.dropTable(t);
}
