import { Body, Controller, Get, Param, ParseIntPipe, Patch, Post, Query, UseFilters } from '@nestjs/common';
import { ApiBearerAuth, ApiConflictResponse, ApiOperation, ApiTags } from '@nestjs/swagger';
import { Allow, CurrentUser } from '../common/decorators/auth.decorators.js';
import type { RequestUser } from '../common/context/request-context.js';
import { DuplicatePatientFilter } from '../patients/duplicate-patient.exception.js';
import { ChangeReferralStatusDto } from './dto/change-status.dto.js';
import { CreateReferralDto } from './dto/create-referral.dto.js';
import { ReferralQueryDto } from './dto/referral-query.dto.js';
import { ReferralsService } from './referrals.service.js';

@ApiTags('referrals')
@ApiBearerAuth()
@Controller('referrals')
@UseFilters(DuplicatePatientFilter)
export class ReferralsController {
  constructor(private readonly referrals: ReferralsService) {}

  @Get()
  @Allow('referralsRead')
  @ApiOperation({ summary: 'Referral queue (ReferralQueuePage): filters, counts per status, sort (default: waiting longest first), pages' })
  queue(@CurrentUser() user: RequestUser, @Query() q: ReferralQueryDto) {
    return this.referrals.queue(user.practiceId, q);
  }

  @Get(':id')
  @Allow('referralsRead')
  @ApiOperation({ summary: 'One referral with cases, attachments, status history and letters' })
  get(@CurrentUser() user: RequestUser, @Param('id', ParseIntPipe) id: number) {
    return this.referrals.get(user.practiceId, id);
  }

  @Post()
  @Allow('referralsWrite')
  @ApiOperation({ summary: 'Take a referral: patient and referring dentist (existing or new), teeth (one case each), uploads; acknowledges it by e-mail' })
  @ApiConflictResponse({ description: 'DuplicatePatientBody when a new patient matches an existing one (repeat with patient.confirmNew)' })
  create(@CurrentUser() user: RequestUser, @Body() dto: CreateReferralDto) {
    return this.referrals.create(user.practiceId, { id: user.id, name: user.name }, dto);
  }

  @Patch(':id/status')
  @Allow('referralsWrite')
  @ApiOperation({ summary: 'Next step on the referral’s path, or declined / cancelled with a reason; recorded with who and when' })
  changeStatus(@CurrentUser() user: RequestUser, @Param('id', ParseIntPipe) id: number, @Body() dto: ChangeReferralStatusDto) {
    return this.referrals.changeStatus(user.practiceId, { id: user.id, name: user.name }, id, dto.status, dto.reason);
  }
}
