import { Module } from '@nestjs/common';
import { SequelizeModule } from '@nestjs/sequelize';
import { ReferralRow } from '../referrals/models/referral.model.js';
import { ReferringDentistRow } from './models/referring-dentist.model.js';
import { ReferringDentistsController } from './referring-dentists.controller.js';
import { ReferringDentistsService } from './referring-dentists.service.js';

@Module({
  imports: [SequelizeModule.forFeature([ReferringDentistRow, ReferralRow])],
  controllers: [ReferringDentistsController],
  providers: [ReferringDentistsService],
  exports: [ReferringDentistsService],
})
export class ReferringDentistsModule {}
