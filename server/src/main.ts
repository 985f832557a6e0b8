import 'reflect-metadata';
import { createApp } from './app.factory.js';
import { loadConfig } from './config/configuration.js';

const config = loadConfig();
const app = await createApp(config);
await app.listen(config.port, '127.0.0.1');
