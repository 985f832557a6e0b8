import type { QueryInterface } from 'sequelize';

// The manager's reports read appointments by referral (lead time to the first visit), reminders by
// appointment (how many went before a confirmation) and cases by practice and level (the backlog).
// The late-cancellation notice is the practice setting `lateCancellationHours` that already lives in
// practices.settings (default 48), so no new column: one setting, one place.
export async function up(q: QueryInterface) {
  await q.addIndex('appointments', ['referral_id', 'start'], { name: 'appointments_referral_start' });
  await q.addIndex('outbox_messages', ['appointment_id', 'purpose', 'status', 'sent_at'], { name: 'outbox_messages_appointment_purpose_sent' });
  await q.addIndex('cases', ['practice_id', 'level'], { name: 'cases_practice_level' });
}

export async function down(q: QueryInterface) {
  await q.removeIndex('cases', 'cases_practice_level');
  await q.removeIndex('outbox_messages', 'outbox_messages_appointment_purpose_sent');
  // MariaDB let the foreign key on referral_id use the new index; give it its own before dropping it.
  await q.addIndex('appointments', ['referral_id'], { name: 'appointments_referral_id' });
  await q.removeIndex('appointments', 'appointments_referral_start');
}
