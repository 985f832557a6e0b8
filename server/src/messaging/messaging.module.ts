import { Global, Module } from '@nestjs/common';
import { ScheduleModule } from '@nestjs/schedule';
import { SequelizeModule } from '@nestjs/sequelize';
import { APP_CONFIG, type AppConfig } from '../config/configuration.js';
import { DeliveryStatusController } from './delivery-status.controller.js';
import { EmailSenderService } from './email-sender.service.js';
import { MessagingClock } from './messaging-clock.service.js';
import { OutboxMessageRow } from './models/outbox-message.model.js';
import { OutboxDispatcherService } from './outbox-dispatcher.service.js';
import { OutboxController } from './outbox.controller.js';
import { OutboxService } from './outbox.service.js';
import { SmsSenderService, TWILIO_CLIENT } from './sms-sender.service.js';
import { createTwilioClient } from './twilio-client.util.js';
import { TwilioSignatureGuard } from './twilio-signature.guard.js';

/** The outbox every text and e-mail goes through, its job, the provider clients and the status callback. */
@Global()
@Module({
  imports: [SequelizeModule.forFeature([OutboxMessageRow]), ScheduleModule.forRoot()],
  controllers: [OutboxController, DeliveryStatusController],
  providers: [
    { provide: TWILIO_CLIENT, useFactory: (config: AppConfig) => createTwilioClient(config), inject: [APP_CONFIG] },
    MessagingClock,
    SmsSenderService,
    EmailSenderService,
    OutboxService,
    OutboxDispatcherService,
    TwilioSignatureGuard,
  ],
  exports: [OutboxService, MessagingClock, TwilioSignatureGuard],
})
export class MessagingModule {}
