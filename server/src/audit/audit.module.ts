import { Module } from '@nestjs/common';
import { SequelizeModule } from '@nestjs/sequelize';
import { AuditController } from './audit.controller.js';
import { AuditService } from './audit.service.js';
import { AuditEntryRow } from './models/audit-entry.model.js';

@Module({
  imports: [SequelizeModule.forFeature([AuditEntryRow])],
  controllers: [AuditController],
  providers: [AuditService],
  exports: [AuditService],
})
export class AuditModule {}
