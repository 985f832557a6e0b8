import { Module } from '@nestjs/common';
import { AuditModule } from '../audit/audit.module.js';
import { EstimatesModule } from '../estimates/estimates.module.js';
import { PatientsModule } from '../patients/patients.module.js';
import { ReferralsModule } from '../referrals/referrals.module.js';
import { CaseSheetsController } from './case-sheets.controller.js';
import { CaseSheetsService } from './case-sheets.service.js';

@Module({
  imports: [ReferralsModule, EstimatesModule, PatientsModule, AuditModule],
  controllers: [CaseSheetsController],
  providers: [CaseSheetsService],
})
export class CaseSheetsModule {}
