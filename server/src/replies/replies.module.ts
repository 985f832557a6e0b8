import { Module } from '@nestjs/common';
import { SequelizeModule } from '@nestjs/sequelize';
import { OutboxMessageRow } from '../messaging/models/outbox-message.model.js';
import { ReminderSettingsRow } from '../messaging/models/reminder-settings.model.js';
import { PatientsModule } from '../patients/patients.module.js';
import { PracticesModule } from '../practices/practices.module.js';
import { SchedulingModule } from '../scheduling/scheduling.module.js';
import { DeskTasksService } from './desk-tasks.service.js';
import { InboundController } from './inbound.controller.js';
import { InboundService } from './inbound.service.js';
import { DeskTaskRow } from './models/desk-task.model.js';
import { InboundMessageRow } from './models/inbound-message.model.js';
import { WaitlistOfferSlotRow } from './models/waitlist-offer-slot.model.js';
import { WaitlistOfferRow } from './models/waitlist-offer.model.js';
import { PublicVisitsController } from './public-visits.controller.js';
import { PublicVisitsService } from './public-visits.service.js';
import { RepliesController } from './replies.controller.js';
import { ReplyContextService } from './reply-context.service.js';
import { ThreadsService } from './threads.service.js';
import { VisitActionsService } from './visit-actions.service.js';
import { WaitlistOffersService } from './waitlist-offers.service.js';

/** What comes back from patients (texts, the visit page) and the front desk's side of it (docs/messaging.md "Replies"). */
@Module({
  imports: [
    SequelizeModule.forFeature([InboundMessageRow, DeskTaskRow, WaitlistOfferSlotRow, WaitlistOfferRow, OutboxMessageRow, ReminderSettingsRow]),
    PatientsModule,
    PracticesModule,
    SchedulingModule,
  ],
  controllers: [InboundController, RepliesController, PublicVisitsController],
  providers: [ReplyContextService, VisitActionsService, DeskTasksService, WaitlistOffersService, InboundService, ThreadsService, PublicVisitsService],
})
export class RepliesModule {}
