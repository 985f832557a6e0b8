import { DataTypes, type QueryInterface } from 'sequelize';

// Scheduling: closures, operators' working rules, time off and emergency holds; appointments with the
// occupancy grid that makes double booking impossible in the database; idempotency keys; feed tokens;
// the waitlist.
const timestamps = {
  created_at: { type: DataTypes.DATE(3), allowNull: false },
  updated_at: { type: DataTypes.DATE(3), allowNull: false },
};
const practiceRef = { type: DataTypes.INTEGER, allowNull: false, references: { model: 'practices', key: 'id' } };
const userRef = { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' } };
const locationRef = { type: DataTypes.INTEGER, allowNull: false, references: { model: 'locations', key: 'id' } };
const STATES = ['booked', 'confirmed', 'arrived', 'seated', 'dismissed', 'cancelled', 'no_show'];

export async function up(q: QueryInterface) {
  await q.createTable('location_closures', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    practice_id: practiceRef,
    location_id: { ...locationRef, onDelete: 'CASCADE' },
    date: { type: DataTypes.DATEONLY, allowNull: false },
    reason: { type: DataTypes.STRING(200), allowNull: false },
    ...timestamps,
  });
  await q.addIndex('location_closures', ['location_id', 'date'], { unique: true });

  await q.createTable('working_rules', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    practice_id: practiceRef,
    operator_id: { ...userRef, onDelete: 'CASCADE' },
    location_id: locationRef,
    rrule: { type: DataTypes.STRING(500), allowNull: false },
    start_local: { type: DataTypes.CHAR(5), allowNull: false },
    end_local: { type: DataTypes.CHAR(5), allowNull: false },
    breaks: { type: DataTypes.JSON, allowNull: true },
    ...timestamps,
  });
  await q.addIndex('working_rules', ['practice_id', 'operator_id']);

  await q.createTable('time_off', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    practice_id: practiceRef,
    operator_id: { ...userRef, onDelete: 'CASCADE' },
    start: { type: DataTypes.DATE(3), allowNull: false },
    end: { type: DataTypes.DATE(3), allowNull: false },
    reason: { type: DataTypes.STRING(200), allowNull: true },
    ...timestamps,
  });
  await q.addIndex('time_off', ['practice_id', 'operator_id', 'start']);

  await q.createTable('holds', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    practice_id: practiceRef,
    operator_id: { ...userRef, onDelete: 'CASCADE' },
    location_id: locationRef,
    rrule: { type: DataTypes.STRING(500), allowNull: false },
    start_local: { type: DataTypes.CHAR(5), allowNull: false },
    end_local: { type: DataTypes.CHAR(5), allowNull: false },
    opens_evening_before_at: { type: DataTypes.CHAR(5), allowNull: true },
    ...timestamps,
  });
  await q.addIndex('holds', ['practice_id', 'operator_id']);

  await q.createTable('appointments', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    practice_id: practiceRef,
    series_id: { type: DataTypes.CHAR(36), allowNull: false },
    visit_index: { type: DataTypes.INTEGER, allowNull: false },
    case_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'cases', key: 'id' } },
    referral_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'referrals', key: 'id' } },
    location_id: locationRef,
    chair_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'chairs', key: 'id' } },
    operator_id: userRef,
    microscope_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'microscopes', key: 'id' } },
    start: { type: DataTypes.DATE(3), allowNull: false },
    end: { type: DataTypes.DATE(3), allowNull: false },
    turnover_minutes: { type: DataTypes.INTEGER, allowNull: false },
    state: { type: DataTypes.ENUM(...STATES), allowNull: false, defaultValue: 'booked' },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
    confirmed_at: { type: DataTypes.DATE(3), allowNull: true },
    confirmed_via: { type: DataTypes.STRING(32), allowNull: true },
    cancelled_at: { type: DataTypes.DATE(3), allowNull: true },
    cancelled_by_user_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' } },
    cancelled_by_name: { type: DataTypes.STRING(160), allowNull: true },
    cancel_reason: { type: DataTypes.STRING(500), allowNull: true },
    cancel_notice_hours: { type: DataTypes.DECIMAL(8, 1), allowNull: true },
    seated_at: { type: DataTypes.DATE(3), allowNull: true },
    dismissed_at: { type: DataTypes.DATE(3), allowNull: true },
    notes: { type: DataTypes.STRING(1000), allowNull: true },
    created_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' } },
    ...timestamps,
  });
  // The busy read of the time finder and the board both scan by practice and time.
  await q.addIndex('appointments', ['practice_id', 'start']);
  await q.addIndex('appointments', ['chair_id', 'start']);
  await q.addIndex('appointments', ['operator_id', 'start']);
  await q.addIndex('appointments', ['series_id']);
  await q.addIndex('appointments', ['case_id']);

  // The booking guard: one row per resource and 5-minute cell; the primary key is the unique key two
  // writers collide on (also across Galera nodes, where certification catches the same key).
  await q.createTable('appointment_cells', {
    resource_kind: { type: DataTypes.ENUM('chair', 'operator', 'microscope'), allowNull: false, primaryKey: true },
    resource_id: { type: DataTypes.INTEGER, allowNull: false, primaryKey: true },
    cell_start: { type: DataTypes.DATE, allowNull: false, primaryKey: true },
    practice_id: practiceRef,
    appointment_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'appointments', key: 'id' }, onDelete: 'CASCADE' },
  });
  await q.addIndex('appointment_cells', ['appointment_id']);

  await q.createTable('booking_idempotency_keys', {
    practice_id: { ...practiceRef, primaryKey: true },
    key_value: { type: DataTypes.STRING(128), allowNull: false, primaryKey: true },
    series_id: { type: DataTypes.CHAR(36), allowNull: false },
    created_at: { type: DataTypes.DATE(3), allowNull: false },
  });

  await q.createTable('operator_feed_tokens', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    practice_id: practiceRef,
    operator_id: { ...userRef, unique: true, onDelete: 'CASCADE' },
    // Only the hash is kept: a leaked table does not reveal working feed URLs.
    token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
    ...timestamps,
  });

  await q.createTable('waitlist_entries', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    practice_id: practiceRef,
    case_id: { type: DataTypes.INTEGER, allowNull: false, unique: true, references: { model: 'cases', key: 'id' }, onDelete: 'CASCADE' },
    earliest: { type: DataTypes.DATEONLY, allowNull: true },
    notes: { type: DataTypes.STRING(500), allowNull: true },
    ...timestamps,
  });
  await q.addIndex('waitlist_entries', ['practice_id', 'created_at']);
}

export async function down(q: QueryInterface) {
  for (const t of [
    'waitlist_entries',
    'operator_feed_tokens',
    'booking_idempotency_keys',
    'appointment_cells',
    'appointments',
    'holds',
    'time_off',
    'working_rules',
    'location_closures',
  ]) {
    await q.dropTable(t);
  }
}
