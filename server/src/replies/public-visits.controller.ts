import { Body, Controller, Get, HttpCode, Param, Post, UseGuards } from '@nestjs/common';
import { ApiGoneResponse, ApiNotFoundResponse, ApiOperation, ApiTags } from '@nestjs/swagger';
import { ThrottlerGuard } from '@nestjs/throttler';
import type { PublicVisitView } from '@ostium/shared';
import { Public } from '../common/decorators/auth.decorators.js';
import { PublicVisitActionDto } from './dto/replies.dto.js';
import { PublicVisitsService } from './public-visits.service.js';

/** No sign-in: the signed token in the path is the only key, and the calls are rate-limited like sign-in. */
@ApiTags('public visit page')
@Controller('public/visits')
@Public()
@UseGuards(ThrottlerGuard)
export class PublicVisitsController {
  constructor(private readonly visits: PublicVisitsService) {}

  @Get(':token')
  @ApiOperation({ summary: 'What the visit link shows: practice, phone, location, local date and time, and what the patient may do' })
  @ApiNotFoundResponse({ description: 'the link is not valid' })
  @ApiGoneResponse({ description: 'the link has expired' })
  get(@Param('token') token: string): Promise<PublicVisitView> {
    return this.visits.get(token);
  }

  @Post(':token')
  @HttpCode(200)
  @ApiOperation({ summary: 'Confirm the visit, or ask for another time (a task for the front desk)' })
  act(@Param('token') token: string, @Body() dto: PublicVisitActionDto): Promise<PublicVisitView> {
    return this.visits.act(token, dto);
  }
}
