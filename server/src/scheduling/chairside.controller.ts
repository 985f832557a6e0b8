import { Controller, Get, Query } from '@nestjs/common';
import { ApiBearerAuth, ApiOperation, ApiTags } from '@nestjs/swagger';
import type { ChairsideDay } from '@ostium/shared';
import type { RequestUser } from '../common/context/request-context.js';
import { Allow, CurrentUser } from '../common/decorators/auth.decorators.js';
import { ChairsideService } from './chairside.service.js';
import { ChairsideQueryDto } from './dto/chairside-query.dto.js';

@ApiTags('scheduling')
@ApiBearerAuth()
@Controller('chairside')
export class ChairsideController {
  constructor(private readonly chairside: ChairsideService) {}

  @Get()
  @Allow('chairside')
  @ApiOperation({ summary: 'The day per chair of a location: visits in order with minutes, microscope and tray list' })
  day(@CurrentUser() u: RequestUser, @Query() q: ChairsideQueryDto): Promise<ChairsideDay> {
    return this.chairside.day(u.practiceId, q.date, q.locationId);
  }
}
