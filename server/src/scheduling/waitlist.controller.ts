import { Body, Controller, Delete, Get, HttpCode, Param, ParseIntPipe, Post, Query } from '@nestjs/common';
import { ApiBearerAuth, ApiOperation, ApiTags } from '@nestjs/swagger';
import type { WaitlistEntry } from '@ostium/shared';
import type { RequestUser } from '../common/context/request-context.js';
import { Allow, CurrentUser } from '../common/decorators/auth.decorators.js';
import { WaitlistEntryDto, WaitlistFitsQueryDto } from './dto/waitlist.dto.js';
import { WaitlistService } from './waitlist.service.js';

@ApiTags('scheduling')
@ApiBearerAuth()
@Controller('waitlist')
export class WaitlistController {
  constructor(private readonly waitlist: WaitlistService) {}

  @Get()
  @Allow('schedule')
  list(@CurrentUser() u: RequestUser): Promise<WaitlistEntry[]> {
    return this.waitlist.list(u.practiceId);
  }

  @Get('fits')
  @Allow('schedule')
  @ApiOperation({ summary: 'Waitlisted cases whose first visit fits the time a cancelled appointment freed' })
  fits(@CurrentUser() u: RequestUser, @Query() q: WaitlistFitsQueryDto): Promise<WaitlistEntry[]> {
    return this.waitlist.fits(u.practiceId, q.appointmentId);
  }

  @Post()
  @Allow('schedule')
  add(@CurrentUser() u: RequestUser, @Body() dto: WaitlistEntryDto): Promise<WaitlistEntry> {
    return this.waitlist.add(u.practiceId, dto);
  }

  @Delete(':id')
  @Allow('schedule')
  @HttpCode(204)
  remove(@CurrentUser() u: RequestUser, @Param('id', ParseIntPipe) id: number): Promise<void> {
    return this.waitlist.remove(u.practiceId, id);
  }
}
