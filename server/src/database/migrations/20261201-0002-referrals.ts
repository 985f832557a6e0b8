import { DataTypes, type QueryInterface } from 'sequelize';

// Referral intake: referring dentists, patients, referrals, their cases (one per tooth), status history,
// uploaded attachments and the letters sent about each referral.
const timestamps = {
  created_at: { type: DataTypes.DATE(3), allowNull: false },
  updated_at: { type: DataTypes.DATE(3), allowNull: false },
};

const STATUSES = ['received', 'triaged', 'planned', 'booked', 'in_treatment', 'completed', 'report_sent', 'declined', 'cancelled'];
const PROCEDURES = ['initial', 'retreatment', 'surgery', 'consult', 'emergency'];
const practiceRef = { type: DataTypes.INTEGER, allowNull: false, references: { model: 'practices', key: 'id' } };

export async function up(q: QueryInterface) {
  await q.createTable('referring_dentists', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    practice_id: practiceRef,
    name: { type: DataTypes.STRING(160), allowNull: false },
    practice_name: { type: DataTypes.STRING(160), allowNull: true },
    email: { type: DataTypes.STRING(254), allowNull: true },
    phone: { type: DataTypes.STRING(32), allowNull: true },
    address: { type: DataTypes.STRING(400), allowNull: true },
    letter_channel: { type: DataTypes.ENUM('email', 'post', 'fax'), allowNull: false, defaultValue: 'email' },
    notes: { type: DataTypes.TEXT, allowNull: true },
    ...timestamps,
  });
  await q.addIndex('referring_dentists', ['practice_id', 'name']);

  await q.createTable('patients', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    practice_id: practiceRef,
    first_name: { type: DataTypes.STRING(80), allowNull: false },
    last_name: { type: DataTypes.STRING(80), allowNull: false },
    date_of_birth: { type: DataTypes.DATEONLY, allowNull: false },
    phone: { type: DataTypes.STRING(16), allowNull: true },
    email: { type: DataTypes.STRING(254), allowNull: true },
    preferred_channel: { type: DataTypes.ENUM('text', 'email', 'phone'), allowNull: false, defaultValue: 'text' },
    sms_consent: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    sms_consent_at: { type: DataTypes.DATE(3), allowNull: true },
    sms_consent_source: { type: DataTypes.STRING(160), allowNull: true },
    time_zone: { type: DataTypes.STRING(64), allowNull: true },
    notes: { type: DataTypes.TEXT, allowNull: true },
    ...timestamps,
  });
  // The duplicate check (name + date of birth) and the name search both start here.
  await q.addIndex('patients', ['practice_id', 'last_name', 'first_name', 'date_of_birth']);

  await q.createTable('referrals', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    practice_id: practiceRef,
    patient_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'patients', key: 'id' } },
    referring_dentist_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'referring_dentists', key: 'id' } },
    location_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'locations', key: 'id' } },
    received_on: { type: DataTypes.DATEONLY, allowNull: false },
    urgency: { type: DataTypes.ENUM('routine', 'soon', 'urgent'), allowNull: false },
    procedure: { type: DataTypes.ENUM(...PROCEDURES), allowNull: false },
    reason: { type: DataTypes.TEXT, allowNull: true },
    notes: { type: DataTypes.TEXT, allowNull: true },
    status: { type: DataTypes.ENUM(...STATUSES), allowNull: false, defaultValue: 'received' },
    status_reason: { type: DataTypes.STRING(500), allowNull: true },
    status_changed_at: { type: DataTypes.DATE(3), allowNull: false },
    created_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' } },
    ...timestamps,
  });
  await q.addIndex('referrals', ['practice_id', 'status', 'received_on']);
  await q.addIndex('referrals', ['practice_id', 'received_on']);
  await q.addIndex('referrals', ['referring_dentist_id']);
  await q.addIndex('referrals', ['patient_id']);

  await q.createTable('cases', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    practice_id: practiceRef,
    referral_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'referrals', key: 'id' }, onDelete: 'CASCADE' },
    tooth_fdi: { type: DataTypes.CHAR(2), allowNull: false },
    procedure: { type: DataTypes.ENUM(...PROCEDURES), allowNull: false },
    status: { type: DataTypes.ENUM(...STATUSES), allowNull: false, defaultValue: 'received' },
    // Filled by the case sheet (assessment and chair-time estimate) later; created now so no later migration is needed.
    assessment: { type: DataTypes.JSON, allowNull: true },
    facts: { type: DataTypes.JSON, allowNull: true },
    estimate: { type: DataTypes.JSON, allowNull: true },
    table_version: { type: DataTypes.INTEGER, allowNull: true },
    override: { type: DataTypes.JSON, allowNull: true },
    level: { type: DataTypes.STRING(16), allowNull: true },
    estimated_minutes: { type: DataTypes.INTEGER, allowNull: true },
    visit_count: { type: DataTypes.INTEGER, allowNull: true },
    canals: { type: DataTypes.INTEGER, allowNull: true },
    operator_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' } },
    updated_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' } },
    ...timestamps,
  });
  await q.addIndex('cases', ['referral_id', 'tooth_fdi'], { unique: true });
  await q.addIndex('cases', ['practice_id', 'status']);

  await q.createTable('referral_status_events', {
    id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
    practice_id: practiceRef,
    referral_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'referrals', key: 'id' }, onDelete: 'CASCADE' },
    status: { type: DataTypes.ENUM(...STATUSES), allowNull: false },
    reason: { type: DataTypes.STRING(500), allowNull: true },
    by_user_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' } },
    // Kept as written at the time so the history still reads right after a user is renamed.
    by_name: { type: DataTypes.STRING(160), allowNull: true },
    at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await q.addIndex('referral_status_events', ['referral_id', 'at']);

  await q.createTable('attachments', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    practice_id: practiceRef,
    referral_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'referrals', key: 'id' } },
    kind: { type: DataTypes.ENUM('radiograph', 'letter'), allowNull: false },
    original_name: { type: DataTypes.STRING(255), allowNull: false },
    mime_type: { type: DataTypes.STRING(64), allowNull: false },
    size_bytes: { type: DataTypes.INTEGER, allowNull: false },
    sha256: { type: DataTypes.CHAR(64), allowNull: false },
    storage_name: { type: DataTypes.STRING(64), allowNull: false, unique: true },
    uploaded_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' } },
    ...timestamps,
  });
  await q.addIndex('attachments', ['referral_id']);
  await q.addIndex('attachments', ['practice_id', 'created_at']);

  await q.createTable('letters', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    practice_id: practiceRef,
    referral_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'referrals', key: 'id' }, onDelete: 'CASCADE' },
    kind: { type: DataTypes.ENUM('acknowledgement', 'booking_notice', 'completion_report'), allowNull: false },
    to_address: { type: DataTypes.STRING(254), allowNull: false },
    subject: { type: DataTypes.STRING(255), allowNull: false },
    status: { type: DataTypes.ENUM('sent', 'failed', 'skipped'), allowNull: false },
    detail: { type: DataTypes.STRING(1000), allowNull: true },
    message_id: { type: DataTypes.STRING(255), allowNull: true },
    at: { type: DataTypes.DATE(3), allowNull: false },
    ...timestamps,
  });
  await q.addIndex('letters', ['referral_id', 'at']);
}

export async function down(q: QueryInterface) {
  for (const t of ['letters', 'attachments', 'referral_status_events', 'cases', 'referrals', 'patients', 'referring_dentists']) await q.dropTable(t);
}
