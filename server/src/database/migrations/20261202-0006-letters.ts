import { DataTypes, QueryTypes, type QueryInterface } from 'sequelize';

// Letters go through the outbox: a letter is queued with its outbox row and settles to sent / failed /
// skipped from that row. Completing a case stores the endodontist's findings and recall plan.
const timestamps = {
  created_at: { type: DataTypes.DATE(3), allowNull: false },
  updated_at: { type: DataTypes.DATE(3), allowNull: false },
};
const practiceRef = { type: DataTypes.INTEGER, allowNull: false, references: { model: 'practices', key: 'id' } };

export async function up(q: QueryInterface) {
  await q.changeColumn('letters', 'status', { type: DataTypes.ENUM('queued', 'sent', 'failed', 'skipped'), allowNull: false });
  // The tooth a booking notice or completion report is about (null for the acknowledgement).
  await q.addColumn('letters', 'case_id', { type: DataTypes.INTEGER, allowNull: true, references: { model: 'cases', key: 'id' }, onDelete: 'SET NULL' });
  // One acknowledgement and one booking notice per referral, whoever queues it and however often.
  await q.addColumn('letters', 'dedupe_key', { type: DataTypes.STRING(191), allowNull: true, unique: true });
  await q.addColumn('letters', 'outbox_message_id', { type: DataTypes.INTEGER, allowNull: true });
  await q.addColumn('letters', 'sent_at', { type: DataTypes.DATE(3), allowNull: true });
  // What the letter said when it was composed for sending (the PDF is rendered again from this).
  await q.addColumn('letters', 'content', { type: DataTypes.JSON, allowNull: true });
  await q.addIndex('letters', ['outbox_message_id']);
  await q.addIndex('letters', ['status']);

  await q.createTable('case_completions', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    practice_id: practiceRef,
    case_id: { type: DataTypes.INTEGER, allowNull: false, unique: true, references: { model: 'cases', key: 'id' }, onDelete: 'CASCADE' },
    referral_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'referrals', key: 'id' }, onDelete: 'CASCADE' },
    findings: { type: DataTypes.TEXT, allowNull: false },
    // Months after treatment ended, ascending.
    recall_months: { type: DataTypes.JSON, allowNull: false },
    treatment_ended_on: { type: DataTypes.DATEONLY, allowNull: false },
    send_report: { type: DataTypes.BOOLEAN, allowNull: false },
    report_letter_id: { type: DataTypes.INTEGER, allowNull: true },
    completed_by: { type: DataTypes.INTEGER, allowNull: true },
    completed_by_name: { type: DataTypes.STRING(160), allowNull: true },
    completed_at: { type: DataTypes.DATE(3), allowNull: false },
    ...timestamps,
  });
}

export async function down(q: QueryInterface) {
  await q.dropTable('case_completions');
  // Plain ALTERs: the dialect's removeColumn reads foreign keys in a way the mariadb connector's result breaks.
  const fks = await q.sequelize.query<{ name: string }>(
    `SELECT CONSTRAINT_NAME AS name FROM information_schema.KEY_COLUMN_USAGE
      WHERE TABLE_SCHEMA = DATABASE() AND TABLE_NAME = 'letters' AND COLUMN_NAME = 'case_id' AND REFERENCED_TABLE_NAME IS NOT NULL`,
    { type: QueryTypes.SELECT },
  );
  for (const fk of fks) await q.sequelize.query(`ALTER TABLE letters DROP FOREIGN KEY \`${fk.name}\``);
  // Dropping a column drops the indexes on it.
  await q.sequelize.query('ALTER TABLE letters DROP INDEX letters_status, DROP COLUMN content, DROP COLUMN sent_at, DROP COLUMN outbox_message_id, DROP COLUMN dedupe_key, DROP COLUMN case_id');
  // A letter still waiting had not gone out: the old schema calls that failed.
  await q.sequelize.query("UPDATE letters SET status = 'failed', detail = 'still queued when the letters migration was undone' WHERE status = 'queued'");
  await q.changeColumn('letters', 'status', { type: DataTypes.ENUM('sent', 'failed', 'skipped'), allowNull: false });
}
