import { Module, OnModuleInit } from '@nestjs/common';
import { SequelizeModule } from '@nestjs/sequelize';
import { OutboxMessageRow } from '../messaging/models/outbox-message.model.js';
import { ReminderSettingsRow } from '../messaging/models/reminder-settings.model.js';
import { OutboxService } from '../messaging/outbox.service.js';
import { PracticesModule } from '../practices/practices.module.js';
import { ReminderComposerService } from './reminder-composer.service.js';
import { ReminderPlannerService } from './reminder-planner.service.js';
import { ReminderSettingsService } from './reminder-settings.service.js';
import { ReminderVisitsService } from './reminder-visits.service.js';
import { RemindersController } from './reminders.controller.js';

/**
 * Reminder rules and templates, the planner that turns bookings into outbox rows and the composer that
 * writes each reminder at send time. Listens to scheduling's events; scheduling never imports it.
 */
@Module({
  imports: [SequelizeModule.forFeature([ReminderSettingsRow, OutboxMessageRow]), PracticesModule],
  controllers: [RemindersController],
  providers: [ReminderVisitsService, ReminderSettingsService, ReminderComposerService, ReminderPlannerService],
  exports: [ReminderSettingsService, ReminderPlannerService],
})
export class RemindersModule implements OnModuleInit {
  constructor(
    private readonly outbox: OutboxService,
    private readonly composer: ReminderComposerService,
  ) {}

  onModuleInit() {
    this.outbox.registerComposer('reminder', this.composer);
    this.outbox.registerComposer('booking_email', this.composer);
  }
}
