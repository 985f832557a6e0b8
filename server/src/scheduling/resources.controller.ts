import { Body, Controller, Delete, Get, HttpCode, Param, ParseIntPipe, Patch, Post, Put } from '@nestjs/common';
import { ApiBearerAuth, ApiOperation, ApiTags } from '@nestjs/swagger';
import type { SchedulingResourcesView } from '@ostium/shared';
import type { RequestUser } from '../common/context/request-context.js';
import { Allow, CurrentUser } from '../common/decorators/auth.decorators.js';
import { ChairDto, ClosureDto, HoldDto, LocationDto, MicroscopeDto, TimeOffDto, WorkingRuleDto } from './dto/resources.dto.js';
import { ResourcesService } from './resources.service.js';

@ApiTags('scheduling resources')
@ApiBearerAuth()
@Controller()
export class ResourcesController {
  constructor(private readonly resources: ResourcesService) {}

  @Get('scheduling/resources')
  @Allow('schedule')
  @ApiOperation({ summary: 'Locations (hours, closures, chairs, microscopes) and every operator’s working rules, time off and holds' })
  async all(@CurrentUser() u: RequestUser): Promise<SchedulingResourcesView> {
    const [locations, operators] = await Promise.all([this.resources.listLocations(u.practiceId), this.resources.listSchedules(u.practiceId)]);
    return { locations, operators };
  }

  // ---------- locations ----------
  @Get('locations/:id')
  @Allow('schedule')
  @ApiOperation({ summary: 'One location with chairs, microscopes and closures' })
  location(@CurrentUser() u: RequestUser, @Param('id', ParseIntPipe) id: number) {
    return this.resources.getLocation(u.practiceId, id);
  }

  @Post('locations')
  @Allow('settings')
  @ApiOperation({ summary: 'Add a location (IANA time zone, weekly opening hours)' })
  createLocation(@CurrentUser() u: RequestUser, @Body() dto: LocationDto) {
    return this.resources.createLocation(u.practiceId, dto);
  }

  @Put('locations/:id')
  @Allow('settings')
  @ApiOperation({ summary: 'Change a location' })
  updateLocation(@CurrentUser() u: RequestUser, @Param('id', ParseIntPipe) id: number, @Body() dto: LocationDto) {
    return this.resources.updateLocation(u.practiceId, id, dto);
  }

  @Delete('locations/:id')
  @Allow('settings')
  @HttpCode(204)
  @ApiOperation({ summary: 'Remove a location without chairs, referrals, working rules or holds' })
  deleteLocation(@CurrentUser() u: RequestUser, @Param('id', ParseIntPipe) id: number) {
    return this.resources.deleteLocation(u.practiceId, id);
  }

  @Post('locations/:id/closures')
  @Allow('settings')
  @ApiOperation({ summary: 'Close a location on a local date, with a reason' })
  addClosure(@CurrentUser() u: RequestUser, @Param('id', ParseIntPipe) id: number, @Body() dto: ClosureDto) {
    return this.resources.addClosure(u.practiceId, id, dto);
  }

  @Delete('closures/:id')
  @Allow('settings')
  @HttpCode(204)
  deleteClosure(@CurrentUser() u: RequestUser, @Param('id', ParseIntPipe) id: number) {
    return this.resources.deleteClosure(u.practiceId, id);
  }

  // ---------- chairs and microscopes ----------
  @Post('locations/:id/chairs')
  @Allow('settings')
  @ApiOperation({ summary: 'Add a chair (optionally with a mounted microscope of the same location)' })
  createChair(@CurrentUser() u: RequestUser, @Param('id', ParseIntPipe) id: number, @Body() dto: ChairDto) {
    return this.resources.createChair(u.practiceId, id, dto);
  }

  @Put('chairs/:id')
  @Allow('settings')
  updateChair(@CurrentUser() u: RequestUser, @Param('id', ParseIntPipe) id: number, @Body() dto: ChairDto) {
    return this.resources.updateChair(u.practiceId, id, dto);
  }

  @Delete('chairs/:id')
  @Allow('settings')
  @ApiOperation({ summary: 'Remove a chair; one with appointments is retired instead' })
  deleteChair(@CurrentUser() u: RequestUser, @Param('id', ParseIntPipe) id: number) {
    return this.resources.deleteChair(u.practiceId, id);
  }

  @Post('locations/:id/microscopes')
  @Allow('settings')
  @ApiOperation({ summary: 'Add a microscope (mobile within the location, or to be mounted on a chair)' })
  createMicroscope(@CurrentUser() u: RequestUser, @Param('id', ParseIntPipe) id: number, @Body() dto: MicroscopeDto) {
    return this.resources.createMicroscope(u.practiceId, id, dto);
  }

  @Put('microscopes/:id')
  @Allow('settings')
  updateMicroscope(@CurrentUser() u: RequestUser, @Param('id', ParseIntPipe) id: number, @Body() dto: MicroscopeDto) {
    return this.resources.updateMicroscope(u.practiceId, id, dto);
  }

  @Delete('microscopes/:id')
  @Allow('settings')
  deleteMicroscope(@CurrentUser() u: RequestUser, @Param('id', ParseIntPipe) id: number) {
    return this.resources.deleteMicroscope(u.practiceId, id);
  }

  // ---------- operators ----------
  @Get('operators')
  @Allow('schedule')
  @ApiOperation({ summary: 'Every active endodontist with working rules, time off and holds' })
  operators(@CurrentUser() u: RequestUser) {
    return this.resources.listSchedules(u.practiceId);
  }

  @Get('operators/:id/schedule')
  @Allow('schedule')
  schedule(@CurrentUser() u: RequestUser, @Param('id', ParseIntPipe) id: number) {
    return this.resources.getSchedule(u.practiceId, id);
  }

  @Post('operators/:id/working-rules')
  @Allow('settings')
  @ApiOperation({ summary: 'Add a working rule (RFC 5545 RRULE for the days, local times, breaks)' })
  addRule(@CurrentUser() u: RequestUser, @Param('id', ParseIntPipe) id: number, @Body() dto: WorkingRuleDto) {
    return this.resources.addWorkingRule(u.practiceId, id, dto);
  }

  @Put('working-rules/:id')
  @Allow('settings')
  updateRule(@CurrentUser() u: RequestUser, @Param('id', ParseIntPipe) id: number, @Body() dto: WorkingRuleDto) {
    return this.resources.updateWorkingRule(u.practiceId, id, dto);
  }

  @Delete('working-rules/:id')
  @Allow('settings')
  @HttpCode(204)
  deleteRule(@CurrentUser() u: RequestUser, @Param('id', ParseIntPipe) id: number) {
    return this.resources.deleteWorkingRule(u.practiceId, id);
  }

  @Post('operators/:id/time-off')
  @Allow('settings')
  addTimeOff(@CurrentUser() u: RequestUser, @Param('id', ParseIntPipe) id: number, @Body() dto: TimeOffDto) {
    return this.resources.addTimeOff(u.practiceId, id, dto);
  }

  @Delete('time-off/:id')
  @Allow('settings')
  @HttpCode(204)
  deleteTimeOff(@CurrentUser() u: RequestUser, @Param('id', ParseIntPipe) id: number) {
    return this.resources.deleteTimeOff(u.practiceId, id);
  }

  @Get('holds')
  @Allow('schedule')
  holds(@CurrentUser() u: RequestUser) {
    return this.resources.listHolds(u.practiceId);
  }

  @Post('holds')
  @Allow('settings')
  @ApiOperation({ summary: 'Keep a recurring emergency block; only urgent cases take it before it opens' })
  addHold(@CurrentUser() u: RequestUser, @Body() dto: HoldDto) {
    return this.resources.addHold(u.practiceId, dto);
  }

  @Delete('holds/:id')
  @Allow('settings')
  @HttpCode(204)
  deleteHold(@CurrentUser() u: RequestUser, @Param('id', ParseIntPipe) id: number) {
    return this.resources.deleteHold(u.practiceId, id);
  }
}
