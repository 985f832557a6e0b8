import { QueryTypes } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createMigrator } from '../src/database/migrator.js';
import { createDatabase, dropDatabase, testConfig } from './helpers/test-app.js';

const LETTERS = '20261202-0006-letters';

describe(`migration ${LETTERS}`, () => {
  const probe = testConfig();
  let name: string;
  let s: Sequelize;

  beforeAll(async () => {
    name = await createDatabase(probe);
    s = new Sequelize({ dialect: 'mariadb', host: probe.db.host, port: probe.db.port, username: probe.db.user, password: probe.db.password, database: name, timezone: '+00:00', logging: false });
  });
  afterAll(async () => {
    await s?.close();
    if (name) await dropDatabase(probe, name);
  });

  const columns = async () => (await s.query<{ Field: string; Type: string }>('SHOW COLUMNS FROM letters', { type: QueryTypes.SELECT })).map((c) => `${c.Field} ${c.Type}`);
  const hasCompletions = async () => (await s.query("SHOW TABLES LIKE 'case_completions'", { type: QueryTypes.SELECT })).length === 1;

  it('goes up, down (a queued letter becomes failed) and up again', async () => {
    const m = createMigrator(s);
    await m.up({ to: LETTERS });
    expect(await columns()).toEqual(expect.arrayContaining(["status enum('queued','sent','failed','skipped')", 'outbox_message_id int(11)', 'case_id int(11)', 'content longtext']));
    expect(await hasCompletions()).toBe(true);

    await s.query("INSERT INTO practices (id, name, settings, created_at, updated_at) VALUES (1, 'Quillfern Endodontics', '{}', NOW(), NOW())");
    await s.query(`INSERT INTO referring_dentists (id, practice_id, name, letter_channel, created_at, updated_at) VALUES (1, 1, 'Dr. Ottilie Farrow', 'email', NOW(), NOW())`);
    await s.query(`INSERT INTO patients (id, practice_id, first_name, last_name, date_of_birth, created_at, updated_at) VALUES (1, 1, 'Wren', 'Halloway', '1984-03-17', NOW(), NOW())`);
    await s.query(`INSERT INTO locations (id, practice_id, name, time_zone, opening_hours, created_at, updated_at) VALUES (1, 1, 'Riverside', 'America/New_York', '[]', NOW(), NOW())`);
    await s.query(`INSERT INTO referrals (id, practice_id, patient_id, referring_dentist_id, location_id, received_on, urgency, \`procedure\`, status, status_changed_at, created_at, updated_at)
                   VALUES (1, 1, 1, 1, 1, '2026-11-30', 'routine', 'initial', 'received', NOW(), NOW(), NOW())`);
    await s.query(`INSERT INTO letters (practice_id, referral_id, kind, to_address, subject, status, at, created_at, updated_at)
                   VALUES (1, 1, 'acknowledgement', 'office@example.com', 'Referral received', 'queued', NOW(), NOW(), NOW())`);

    await m.down({ step: 1 });
    expect(await columns()).not.toEqual(expect.arrayContaining(['outbox_message_id int(11)']));
    expect(await columns()).toContain("status enum('sent','failed','skipped')");
    expect(await hasCompletions()).toBe(false);
    expect(await s.query('SELECT status, detail FROM letters', { type: QueryTypes.SELECT })).toEqual([{ status: 'failed', detail: 'still queued when the letters migration was undone' }]);

    await m.up({ to: LETTERS });
    expect(await hasCompletions()).toBe(true);
    expect((await m.executed()).at(-1)?.name).toBe(LETTERS);
  });
});
