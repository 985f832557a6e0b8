import { DataTypes, type QueryInterface } from 'sequelize';

// Messaging: the practice's reminder settings, the outbox every text and e-mail goes through, the
// replies that come back, front-desk tasks, and waitlist offers for freed time.
const timestamps = {
  created_at: { type: DataTypes.DATE(3), allowNull: false },
  updated_at: { type: DataTypes.DATE(3), allowNull: false },
};
const practiceRef = { type: DataTypes.INTEGER, allowNull: false, references: { model: 'practices', key: 'id' } };
const OUTBOX_STATUSES = ['pending', 'sending', 'sent', 'delivered', 'failed', 'skipped', 'cancelled'];

export async function up(q: QueryInterface) {
  await q.createTable('reminder_settings', {
    practice_id: { ...practiceRef, primaryKey: true },
    // ReminderSettings from @ostium/shared (rules, templates, quiet hours, caps), validated on save.
    settings: { type: DataTypes.JSON, allowNull: false },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
    updated_by: { type: DataTypes.INTEGER, allowNull: true },
    ...timestamps,
  });

  await q.createTable('outbox_messages', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    practice_id: practiceRef,
    channel: { type: DataTypes.ENUM('sms', 'email'), allowNull: false },
    // reminder | booking_email | keyword_reply | desk_reply | waitlist_offer | letter
    purpose: { type: DataTypes.STRING(32), allowNull: false },
    // Unique per (appointment, channel, rule) for reminders, per letter for letters; null for one-offs.
    dedupe_key: { type: DataTypes.STRING(191), allowNull: true, unique: true },
    rule_id: { type: DataTypes.STRING(40), allowNull: true },
    appointment_id: { type: DataTypes.INTEGER, allowNull: true },
    patient_id: { type: DataTypes.INTEGER, allowNull: true },
    referral_id: { type: DataTypes.INTEGER, allowNull: true },
    letter_id: { type: DataTypes.INTEGER, allowNull: true },
    to_address: { type: DataTypes.STRING(254), allowNull: true },
    subject: { type: DataTypes.STRING(255), allowNull: true },
    // Rendered at send time for reminders (the appointment is re-read); fixed for one-offs.
    body: { type: DataTypes.TEXT, allowNull: true },
    payload: { type: DataTypes.JSON, allowNull: true },
    status: { type: DataTypes.ENUM(...OUTBOX_STATUSES), allowNull: false, defaultValue: 'pending' },
    due_at: { type: DataTypes.DATE(3), allowNull: false },
    // When the rule wanted it; differs from due_at when quiet hours or caps moved it.
    planned_at: { type: DataTypes.DATE(3), allowNull: false },
    defer_reason: { type: DataTypes.STRING(255), allowNull: true },
    attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    last_error: { type: DataTypes.STRING(500), allowNull: true },
    claimed_by: { type: DataTypes.STRING(64), allowNull: true },
    claimed_until: { type: DataTypes.DATE(3), allowNull: true },
    provider_id: { type: DataTypes.STRING(64), allowNull: true },
    provider_status: { type: DataTypes.STRING(32), allowNull: true },
    sent_at: { type: DataTypes.DATE(3), allowNull: true },
    delivered_at: { type: DataTypes.DATE(3), allowNull: true },
    failed_at: { type: DataTypes.DATE(3), allowNull: true },
    created_by: { type: DataTypes.INTEGER, allowNull: true },
    ...timestamps,
  });
  await q.addIndex('outbox_messages', ['status', 'due_at']);
  await q.addIndex('outbox_messages', ['practice_id', 'patient_id', 'created_at']);
  await q.addIndex('outbox_messages', ['appointment_id']);
  await q.addIndex('outbox_messages', ['provider_id']);

  await q.createTable('inbound_messages', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    practice_id: practiceRef,
    channel: { type: DataTypes.ENUM('sms', 'email', 'link'), allowNull: false },
    patient_id: { type: DataTypes.INTEGER, allowNull: true },
    appointment_id: { type: DataTypes.INTEGER, allowNull: true },
    from_address: { type: DataTypes.STRING(254), allowNull: false },
    to_address: { type: DataTypes.STRING(254), allowNull: true },
    body: { type: DataTypes.TEXT, allowNull: false },
    // The provider's message id; unique so a retried webhook is handled once.
    provider_id: { type: DataTypes.STRING(64), allowNull: true, unique: true },
    // confirm | reschedule | opt_out | opt_in | help | other | waitlist_accept
    kind: { type: DataTypes.STRING(24), allowNull: false },
    // What the reply did, in words for the front desk ("Confirmed the visit on 3 Dec 09:00").
    effect: { type: DataTypes.STRING(500), allowNull: true },
    read_at: { type: DataTypes.DATE(3), allowNull: true },
    read_by: { type: DataTypes.INTEGER, allowNull: true },
    received_at: { type: DataTypes.DATE(3), allowNull: false },
    ...timestamps,
  });
  await q.addIndex('inbound_messages', ['practice_id', 'patient_id', 'received_at']);
  await q.addIndex('inbound_messages', ['practice_id', 'read_at']);

  await q.createTable('desk_tasks', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    practice_id: practiceRef,
    // reschedule_request | delivery_failed | unmatched_reply
    kind: { type: DataTypes.STRING(32), allowNull: false },
    patient_id: { type: DataTypes.INTEGER, allowNull: true },
    appointment_id: { type: DataTypes.INTEGER, allowNull: true },
    inbound_message_id: { type: DataTypes.INTEGER, allowNull: true },
    outbox_message_id: { type: DataTypes.INTEGER, allowNull: true },
    detail: { type: DataTypes.STRING(500), allowNull: false },
    status: { type: DataTypes.ENUM('open', 'done'), allowNull: false, defaultValue: 'open' },
    done_at: { type: DataTypes.DATE(3), allowNull: true },
    done_by: { type: DataTypes.INTEGER, allowNull: true },
    ...timestamps,
  });
  await q.addIndex('desk_tasks', ['practice_id', 'status', 'created_at']);

  // Freed time offered to waitlisted patients: the slot row is taken once (first reply wins).
  await q.createTable('waitlist_offer_slots', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    practice_id: practiceRef,
    freed_appointment_id: { type: DataTypes.INTEGER, allowNull: true },
    location_id: { type: DataTypes.INTEGER, allowNull: false },
    chair_id: { type: DataTypes.INTEGER, allowNull: false },
    operator_id: { type: DataTypes.INTEGER, allowNull: false },
    microscope_id: { type: DataTypes.INTEGER, allowNull: true },
    start: { type: DataTypes.DATE(3), allowNull: false },
    end: { type: DataTypes.DATE(3), allowNull: false },
    status: { type: DataTypes.ENUM('open', 'taken', 'expired'), allowNull: false, defaultValue: 'open' },
    taken_by_offer_id: { type: DataTypes.INTEGER, allowNull: true },
    booked_appointment_id: { type: DataTypes.INTEGER, allowNull: true },
    expires_at: { type: DataTypes.DATE(3), allowNull: false },
    ...timestamps,
  });
  await q.createTable('waitlist_offers', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    practice_id: practiceRef,
    slot_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'waitlist_offer_slots', key: 'id' }, onDelete: 'CASCADE' },
    waitlist_entry_id: { type: DataTypes.INTEGER, allowNull: false },
    patient_id: { type: DataTypes.INTEGER, allowNull: false },
    case_id: { type: DataTypes.INTEGER, allowNull: false },
    outbox_message_id: { type: DataTypes.INTEGER, allowNull: true },
    status: { type: DataTypes.ENUM('offered', 'accepted', 'gone', 'expired'), allowNull: false, defaultValue: 'offered' },
    answered_at: { type: DataTypes.DATE(3), allowNull: true },
    ...timestamps,
  });
  await q.addIndex('waitlist_offers', ['practice_id', 'patient_id', 'status']);
  await q.addIndex('waitlist_offers', ['slot_id', 'waitlist_entry_id'], { unique: true });
}

export async function down(q: QueryInterface) {
  await q.dropTable('waitlist_offers');
  await q.dropTable('waitlist_offer_slots');
  await q.dropTable('desk_tasks');
  await q.dropTable('inbound_messages');
  await q.dropTable('outbox_messages');
  await q.dropTable('reminder_settings');
}
