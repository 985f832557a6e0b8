import type { Sequelize } from 'sequelize';
import { SequelizeStorage, Umzug } from 'umzug';
import { MIGRATIONS } from './migrations/index.js';

export function createMigrator(sequelize: Sequelize, logger: Pick<Console, 'info' | 'warn' | 'error' | 'debug'> | undefined = undefined) {
  const q = sequelize.getQueryInterface();
  return new Umzug({
    migrations: MIGRATIONS.map((m) => ({ name: m.name, up: () => m.up(q), down: () => m.down(q) })),
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
    logger,
  });
}
