import { NestFactory } from '@nestjs/core';
import type { NestExpressApplication } from '@nestjs/platform-express';
import { DocumentBuilder, SwaggerModule } from '@nestjs/swagger';
import cookieParser from 'cookie-parser';
import helmet from 'helmet';
import { Logger } from 'nestjs-pino';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { AppModule } from './app.module.js';
import { validationPipe } from './common/validation.js';
import { loadConfig, type AppConfig } from './config/configuration.js';

/** Builds the whole application; main.ts listens on it, the API tests drive it with supertest. */
export async function createApp(config: AppConfig = loadConfig()) {
  const app = await NestFactory.create<NestExpressApplication>(AppModule.forRoot(config), { bufferLogs: true });
  app.useLogger(app.get(Logger));
  app.setGlobalPrefix('api');
  app.set('trust proxy', 'loopback');
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: { defaultSrc: ["'self'"], imgSrc: ["'self'", 'data:', 'blob:'], styleSrc: ["'self'", "'unsafe-inline'"], scriptSrc: ["'self'"] },
      },
    }),
  );
  app.use(cookieParser());
  // The provider's webhooks post flat forms; keep every field name as sent (the signature covers them).
  app.useBodyParser('urlencoded', { extended: false });
  app.useGlobalPipes(validationPipe());
  app.enableShutdownHooks();
  // CORS stays closed: the client is served from the same origin.

  const doc = SwaggerModule.createDocument(
    app,
    new DocumentBuilder().setTitle('Ostium API').setDescription('Referrals, case sheets, scheduling and reminders for endodontic practices').setVersion('0.1.0').addBearerAuth().build(),
  );
  SwaggerModule.setup('api/docs', app, doc, { jsonDocumentUrl: 'api/docs/json' });

  if (config.clientDist && existsSync(join(config.clientDist, 'index.html'))) {
    const dist = config.clientDist;
    app.useStaticAssets(dist, { index: false, maxAge: '1h' });
    // Client-side routes: any non-API GET gets the app shell.
    app.use((req: { method: string; path: string }, res: { sendFile: (p: string) => void }, next: () => void) => {
      if (req.method === 'GET' && !req.path.startsWith('/api')) return res.sendFile(join(dist, 'index.html'));
      next();
    });
  }
  return app;
}
