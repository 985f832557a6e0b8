import { Module } from '@nestjs/common';
import { SequelizeModule } from '@nestjs/sequelize';
import { PracticesModule } from '../practices/practices.module.js';
import { UsersModule } from '../users/users.module.js';
import { EstimatesController } from './estimates.controller.js';
import { EstimatesService } from './estimates.service.js';
import { EstimateTableVersion } from './models/estimate-table-version.model.js';
import { VisitRecord } from './models/visit-record.model.js';

@Module({
  imports: [SequelizeModule.forFeature([EstimateTableVersion, VisitRecord]), PracticesModule, UsersModule],
  controllers: [EstimatesController],
  providers: [EstimatesService],
  exports: [EstimatesService],
})
export class EstimatesModule {}
