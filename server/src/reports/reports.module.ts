import { Module } from '@nestjs/common';
import { EstimatesModule } from '../estimates/estimates.module.js';
import { PracticesModule } from '../practices/practices.module.js';
import { ReportsController } from './reports.controller.js';
import { ReportsService } from './reports.service.js';

// Reports read across domains with plain SELECTs and write nothing but the practice's notice setting
// (through PracticesService): nothing imports this module back.
@Module({
  imports: [PracticesModule, EstimatesModule],
  controllers: [ReportsController],
  providers: [ReportsService],
  exports: [ReportsService],
})
export class ReportsModule {}
