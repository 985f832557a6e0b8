import { Module } from '@nestjs/common';
import { EstimatesModule } from '../estimates/estimates.module.js';
import { PatientsModule } from '../patients/patients.module.js';
import { PracticesModule } from '../practices/practices.module.js';
import { ReferralsModule } from '../referrals/referrals.module.js';
import { ReferringDentistsModule } from '../referring-dentists/referring-dentists.module.js';
import { SchedulingModule } from '../scheduling/scheduling.module.js';
import { UsersModule } from '../users/users.module.js';
import { DemoHistoryService } from './demo-history.service.js';
import { SeedsService } from './seeds.service.js';

@Module({
  imports: [PracticesModule, UsersModule, PatientsModule, ReferringDentistsModule, ReferralsModule, SchedulingModule, EstimatesModule],
  providers: [SeedsService, DemoHistoryService],
  exports: [SeedsService],
})
export class SeedsModule {}
