import { DynamicModule, MiddlewareConsumer, Module, NestModule } from '@nestjs/common';
import { APP_FILTER, APP_GUARD } from '@nestjs/core';
import { EventEmitterModule } from '@nestjs/event-emitter';
import { SequelizeModule } from '@nestjs/sequelize';
import { LoggerModule } from 'nestjs-pino';
import { randomUUID } from 'node:crypto';
import { AuditModule } from './audit/audit.module.js';
import { AuthModule } from './auth/auth.module.js';
import { requestContext } from './common/context/request-context.js';
import { ApiExceptionFilter } from './common/filters/api-exception.filter.js';
import { JwtAuthGuard } from './common/guards/jwt-auth.guard.js';
import { RolesGuard } from './common/guards/roles.guard.js';
import { AppConfigModule } from './config/config.module.js';
import { loadConfig, type AppConfig } from './config/configuration.js';
import { sequelizeOptions } from './database/sequelize-options.js';
import { CaseSheetsModule } from './case-sheets/case-sheets.module.js';
import { EstimatesModule } from './estimates/estimates.module.js';
import { HealthModule } from './health/health.module.js';
import { PracticesModule } from './practices/practices.module.js';
import { AttachmentsModule } from './attachments/attachments.module.js';
import { MailModule } from './mail/mail.module.js';
import { MessagingModule } from './messaging/messaging.module.js';
import { PatientsModule } from './patients/patients.module.js';
import { LettersModule } from './referrals/letters.module.js';
import { ReferralsModule } from './referrals/referrals.module.js';
import { ReferringDentistsModule } from './referring-dentists/referring-dentists.module.js';
import { ReportsModule } from './reports/reports.module.js';
import { RemindersModule } from './reminders/reminders.module.js';
import { RepliesModule } from './replies/replies.module.js';
import { SchedulingModule } from './scheduling/scheduling.module.js';
import { SeedsModule } from './seeds/seeds.module.js';
import { UsersModule } from './users/users.module.js';

const REQUEST_ID = /^[A-Za-z0-9._-]{8,64}$/;

@Module({})
export class AppModule implements NestModule {
  static forRoot(config: AppConfig = loadConfig()): DynamicModule {
    return {
      module: AppModule,
      imports: [
        AppConfigModule.forRoot(config),
        LoggerModule.forRoot({
          pinoHttp: {
            level: config.logLevel,
            // Reuse a caller's request id when it looks like one; never log tokens, cookies or bodies.
            genReqId: (req, res) => {
              const given = req.headers['x-request-id'];
              const id = typeof given === 'string' && REQUEST_ID.test(given) ? given : randomUUID();
              res.setHeader('X-Request-Id', id);
              return id;
            },
            redact: ['req.headers.authorization', 'req.headers.cookie', 'res.headers["set-cookie"]'],
            serializers: {
              req: (req: { id: string; method: string; url: string }) => ({ id: req.id, method: req.method, url: req.url?.split('?')[0] }),
              res: (res: { statusCode: number }) => ({ statusCode: res.statusCode }),
            },
          },
          exclude: [],
        }),
        SequelizeModule.forRoot(sequelizeOptions(config)),
        EventEmitterModule.forRoot(),
        AuditModule,
        UsersModule,
        AuthModule,
        HealthModule,
        PracticesModule,
        MailModule,
        MessagingModule,
        PatientsModule,
        ReferringDentistsModule,
        AttachmentsModule,
        ReferralsModule,
        EstimatesModule,
        CaseSheetsModule,
        SchedulingModule,
        ReportsModule,
        LettersModule,
        RemindersModule,
        RepliesModule,
        SeedsModule,
      ],
      providers: [
        { provide: APP_GUARD, useClass: JwtAuthGuard },
        { provide: APP_GUARD, useClass: RolesGuard },
        { provide: APP_FILTER, useClass: ApiExceptionFilter },
      ],
    };
  }

  configure(consumer: MiddlewareConsumer) {
    // Opens the request's context (request id; the auth guard adds the user) for the audit hooks.
    consumer
      .apply((req: { id?: string; headers: Record<string, unknown> }, _res: unknown, next: () => void) => {
        requestContext.run({ requestId: String(req.id ?? randomUUID()) }, next);
      })
      .forRoutes('*');
  }
}
