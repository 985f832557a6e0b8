import { Controller, Get, HttpStatus, Res } from '@nestjs/common';
import { ApiOperation, ApiTags } from '@nestjs/swagger';
import type { HealthResponse } from '@ostium/shared';
import type { Response } from 'express';
import { Public } from '../common/decorators/auth.decorators.js';
import { HealthService } from './health.service.js';

@ApiTags('health')
@Controller('health')
export class HealthController {
  constructor(private readonly health: HealthService) {}

  @Get()
  @Public()
  @ApiOperation({ summary: '200 while the database answers, 503 while it does not' })
  async check(@Res({ passthrough: true }) res: Response): Promise<HealthResponse> {
    const up = await this.health.databaseUp();
    if (!up) res.status(HttpStatus.SERVICE_UNAVAILABLE);
    return { status: up ? 'ok' : 'degraded', database: up ? 'up' : 'down' };
  }
}
