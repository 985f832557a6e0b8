import { Module } from '@nestjs/common';
import { SequelizeModule } from '@nestjs/sequelize';
import { AttachmentsModule } from '../attachments/attachments.module.js';
import { PatientsModule } from '../patients/patients.module.js';
import { Location } from '../practices/models/location.model.js';
import { PracticesModule } from '../practices/practices.module.js';
import { ReferringDentistsModule } from '../referring-dentists/referring-dentists.module.js';
import { LettersService } from './letters.service.js';
import { CaseRow } from './models/case.model.js';
import { LetterRow } from './models/letter.model.js';
import { ReferralRow } from './models/referral.model.js';
import { StatusEventRow } from './models/status-event.model.js';
import { ReferralsController } from './referrals.controller.js';
import { ReferralsService } from './referrals.service.js';

@Module({
  imports: [
    SequelizeModule.forFeature([ReferralRow, CaseRow, StatusEventRow, LetterRow, Location]),
    PracticesModule,
    PatientsModule,
    ReferringDentistsModule,
    AttachmentsModule,
  ],
  controllers: [ReferralsController],
  providers: [ReferralsService, LettersService],
  exports: [ReferralsService, LettersService],
})
export class ReferralsModule {}
