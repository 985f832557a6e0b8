import { Body, Controller, HttpCode, Post } from '@nestjs/common';
import { ApiBearerAuth, ApiOperation, ApiTags } from '@nestjs/swagger';
import type { TimeFinderApiResponse } from '@ostium/shared';
import type { RequestUser } from '../common/context/request-context.js';
import { Allow, CurrentUser } from '../common/decorators/auth.decorators.js';
import { TimeFinderRequestDto } from './dto/time-finder-request.dto.js';
import { TimeFinderService } from './time-finder.service.js';

@ApiTags('scheduling')
@ApiBearerAuth()
@Controller('time-finder')
export class TimeFinderController {
  constructor(private readonly finder: TimeFinderService) {}

  @Post()
  @HttpCode(200)
  @Allow('schedule')
  @ApiOperation({ summary: 'Proposals for a case (its estimate) or a plan: chair ∩ operator ∩ microscope, ranked; or why none' })
  find(@CurrentUser() u: RequestUser, @Body() dto: TimeFinderRequestDto): Promise<TimeFinderApiResponse> {
    return this.finder.find(u.practiceId, dto);
  }
}
