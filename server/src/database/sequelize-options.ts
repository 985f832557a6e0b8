import type { SequelizeModuleOptions } from '@nestjs/sequelize';
import type { AppConfig } from '../config/configuration.js';

// UTC on the wire ('+00:00': named zones fail without MariaDB's zone tables); short connect timeouts so a
// database outage answers 503 quickly and the pool reconnects by itself when it returns. Waiting for a
// free connection is allowed longer: a burst of requests queues (a busy machine) rather than failing.
export function sequelizeOptions(config: AppConfig, database = config.db.name): SequelizeModuleOptions {
  return {
    dialect: 'mariadb',
    host: config.db.host,
    port: config.db.port,
    username: config.db.user,
    password: config.db.password,
    database,
    timezone: '+00:00',
    logging: false,
    pool: { max: config.db.poolMax, min: 0, acquire: 20_000, idle: 10_000, evict: 5_000 },
    dialectOptions: { connectTimeout: 3_000, timezone: '+00:00' },
    define: { underscored: true, timestamps: true },
    autoLoadModels: true,
    synchronize: false,
    retryAttempts: 30,
    retryDelay: 1_000,
  };
}
