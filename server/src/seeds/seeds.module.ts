import { Module } from '@nestjs/common';
import { PatientsModule } from '../patients/patients.module.js';
import { PracticesModule } from '../practices/practices.module.js';
import { ReferralsModule } from '../referrals/referrals.module.js';
import { ReferringDentistsModule } from '../referring-dentists/referring-dentists.module.js';
import { SchedulingModule } from '../scheduling/scheduling.module.js';
import { UsersModule } from '../users/users.module.js';
import { SeedsService } from './seeds.service.js';

@Module({ imports: [PracticesModule, UsersModule, PatientsModule, ReferringDentistsModule, ReferralsModule, SchedulingModule], providers: [SeedsService], exports: [SeedsService] })
export class SeedsModule {}
