import 'reflect-metadata';
import { NestFactory } from '@nestjs/core';
import { Sequelize } from 'sequelize-typescript';
import { AppModule } from './app.module.js';
import { loadConfig } from './config/configuration.js';
import { createMigrator } from './database/migrator.js';
import { SeedsService } from './seeds/seeds.service.js';

// `node dist/cli.js migrate | migrate:down | seed [--if-empty] [--no-history]`
const [command, ...flags] = process.argv.slice(2);
const config = { ...loadConfig(), logLevel: 'warn' };

async function main() {
  if (command === 'migrate' || command === 'migrate:down') {
    const sequelize = new Sequelize({
      dialect: 'mariadb', host: config.db.host, port: config.db.port, username: config.db.user,
      password: config.db.password, database: config.db.name, timezone: '+00:00', logging: false,
    });
    const migrator = createMigrator(sequelize);
    const done = command === 'migrate' ? await migrator.up() : await migrator.down();
    console.log(`[ostium] ${command}: ${done.length ? done.map((m) => m.name).join(', ') : 'nothing to do'}`);
    await sequelize.close();
    return;
  }
  if (command === 'seed') {
    const app = await NestFactory.createApplicationContext(AppModule.forRoot(config), { logger: ['error', 'warn'] });
    const seeds = app.get(SeedsService);
    // The demo with its past months of visits, unless --no-history.
    const summary = await seeds.loadDemo({ ifEmpty: flags.includes('--if-empty'), dir: config.seedsDir ?? undefined, history: !flags.includes('--no-history') });
    console.log(`[ostium] seed: ${summary}`);
    await app.close();
    return;
  }
  console.error('usage: cli.js migrate | migrate:down | seed [--if-empty] [--no-history]');
  process.exit(2);
}

main().catch((e) => {
  console.error(e);
  process.exit(1);
});
