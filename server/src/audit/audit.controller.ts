import { Controller, Get, Query } from '@nestjs/common';
import { ApiBearerAuth, ApiOperation, ApiTags } from '@nestjs/swagger';
import { Allow, CurrentUser } from '../common/decorators/auth.decorators.js';
import type { RequestUser } from '../common/context/request-context.js';
import { AuditService } from './audit.service.js';
import { AuditQueryDto } from './dto/audit-query.dto.js';

@ApiTags('audit')
@ApiBearerAuth()
@Controller('audit')
export class AuditController {
  constructor(private readonly audit: AuditService) {}

  @Get()
  @Allow('audit')
  @ApiOperation({ summary: 'Audit log: who changed what, with before and after values' })
  list(@CurrentUser() user: RequestUser, @Query() q: AuditQueryDto) {
    return this.audit.list(user.practiceId, q);
  }
}
