import { Module } from '@nestjs/common';
import { SequelizeModule } from '@nestjs/sequelize';
import { EstimatesModule } from '../estimates/estimates.module.js';
import { Chair } from '../practices/models/chair.model.js';
import { Location } from '../practices/models/location.model.js';
import { Microscope } from '../practices/models/microscope.model.js';
import { PracticesModule } from '../practices/practices.module.js';
import { ReferralsModule } from '../referrals/referrals.module.js';
import { User } from '../users/models/user.model.js';
import { AppointmentsController } from './appointments.controller.js';
import { AppointmentsService } from './appointments.service.js';
import { ChairsideController } from './chairside.controller.js';
import { ChairsideService } from './chairside.service.js';
import { DemoScheduleService } from './demo-schedule.service.js';
import { FeedsController } from './feeds.controller.js';
import { FeedsService } from './feeds.service.js';
import { AppointmentRow } from './models/appointment.model.js';
import { HoldRow } from './models/hold.model.js';
import { LocationClosure } from './models/location-closure.model.js';
import { OperatorFeedToken } from './models/operator-feed-token.model.js';
import { TimeOffRow } from './models/time-off.model.js';
import { WaitlistEntryRow } from './models/waitlist-entry.model.js';
import { WorkingRuleRow } from './models/working-rule.model.js';
import { ResourcesController } from './resources.controller.js';
import { ResourcesService } from './resources.service.js';
import { TimeFinderController } from './time-finder.controller.js';
import { TimeFinderService } from './time-finder.service.js';
import { WaitlistController } from './waitlist.controller.js';
import { WaitlistService } from './waitlist.service.js';

@Module({
  imports: [
    SequelizeModule.forFeature([Location, Chair, Microscope, User, LocationClosure, WorkingRuleRow, TimeOffRow, HoldRow, AppointmentRow, OperatorFeedToken, WaitlistEntryRow]),
    PracticesModule,
    ReferralsModule,
    EstimatesModule,
  ],
  controllers: [ResourcesController, TimeFinderController, AppointmentsController, ChairsideController, FeedsController, WaitlistController],
  providers: [ResourcesService, TimeFinderService, AppointmentsService, ChairsideService, FeedsService, WaitlistService, DemoScheduleService],
  exports: [ResourcesService, TimeFinderService, AppointmentsService, DemoScheduleService],
})
export class SchedulingModule {}
