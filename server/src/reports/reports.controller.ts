import { Body, Controller, Get, HttpCode, Post, Put, Query } from '@nestjs/common';
import { ApiBadRequestResponse, ApiBearerAuth, ApiForbiddenResponse, ApiOkResponse, ApiOperation, ApiTags } from '@nestjs/swagger';
import {
  REPORT_DEFINITIONS,
  type AttendanceReport,
  type BacklogReport,
  type BacklogWhatIfResponse,
  type ChairUseReport,
  type EstimateAccuracyReport,
  type OperatorUseReport,
  type ReferralsReport,
  type ReportSettings,
} from '@ostium/shared';
import type { RequestUser } from '../common/context/request-context.js';
import { Allow, CurrentUser } from '../common/decorators/auth.decorators.js';
import { BacklogQueryDto, BacklogWhatIfDto, ReportQueryDto, ReportSettingsDto } from './dto/report-query.dto.js';
import { ReportsService } from './reports.service.js';

const BAD = 'a field is missing or wrong (from/to not YYYY-MM-DD, from after to, more than 400 days, unknown id); `errors` names it';

@ApiTags('reports')
@ApiBearerAuth()
@ApiForbiddenResponse({ description: 'only managers and administrators see the reports' })
@Controller()
export class ReportsController {
  constructor(private readonly reports: ReportsService) {}

  @Get('reports/chair-use')
  @Allow('reports')
  @ApiOperation({ summary: 'Chair use per chair, location, day, week and weekday × hour', description: `${REPORT_DEFINITIONS.chairUse} ${REPORT_DEFINITIONS.actualChairUse}` })
  @ApiOkResponse({ description: 'ChairUseReport' })
  @ApiBadRequestResponse({ description: BAD })
  chairUse(@CurrentUser() u: RequestUser, @Query() q: ReportQueryDto): Promise<ChairUseReport> {
    return this.reports.chairUse(u.practiceId, q);
  }

  @Get('reports/operator-use')
  @Allow('reports')
  @ApiOperation({ summary: 'Operator use per endodontist and week', description: REPORT_DEFINITIONS.operatorUse })
  @ApiOkResponse({ description: 'OperatorUseReport' })
  @ApiBadRequestResponse({ description: BAD })
  operatorUse(@CurrentUser() u: RequestUser, @Query() q: ReportQueryDto): Promise<OperatorUseReport> {
    return this.reports.operatorUse(u.practiceId, q);
  }

  @Get('reports/attendance')
  @Allow('reports')
  @ApiOperation({ summary: 'No-shows, late cancellations, same-day fills and confirmations', description: `${REPORT_DEFINITIONS.noShow} ${REPORT_DEFINITIONS.lateCancellation} ${REPORT_DEFINITIONS.sameDayFill} ${REPORT_DEFINITIONS.confirmationRate}` })
  @ApiOkResponse({ description: 'AttendanceReport' })
  @ApiBadRequestResponse({ description: BAD })
  attendance(@CurrentUser() u: RequestUser, @Query() q: ReportQueryDto): Promise<AttendanceReport> {
    return this.reports.attendance(u.practiceId, q);
  }

  @Get('reports/referrals')
  @Allow('reports')
  @ApiOperation({ summary: 'Referrals by referring dentist and month, by level, lead time and waiting list', description: REPORT_DEFINITIONS.leadTime })
  @ApiOkResponse({ description: 'ReferralsReport' })
  @ApiBadRequestResponse({ description: BAD })
  referrals(@CurrentUser() u: RequestUser, @Query() q: ReportQueryDto): Promise<ReferralsReport> {
    return this.reports.referrals(u.practiceId, q);
  }

  @Get('reports/estimate-accuracy')
  @Allow('reports')
  @ApiOperation({ summary: 'Estimate error by level and endodontist before and after calibration; overrun days', description: `${REPORT_DEFINITIONS.estimateError} ${REPORT_DEFINITIONS.overrunDay}` })
  @ApiOkResponse({ description: 'EstimateAccuracyReport' })
  @ApiBadRequestResponse({ description: BAD })
  estimateAccuracy(@CurrentUser() u: RequestUser, @Query() q: ReportQueryDto): Promise<EstimateAccuracyReport> {
    return this.reports.estimateAccuracy(u.practiceId, q);
  }

  @Get('reports/backlog')
  @Allow('reports')
  @ApiOperation({ summary: 'Backlog forecast: weeks of backlog by level and location, and the lead time', description: REPORT_DEFINITIONS.backlog })
  @ApiOkResponse({ description: 'BacklogReport' })
  @ApiBadRequestResponse({ description: BAD })
  backlog(@CurrentUser() u: RequestUser, @Query() q: BacklogQueryDto): Promise<BacklogReport> {
    return this.reports.backlog(u.practiceId, q);
  }

  @Post('reports/backlog/what-if')
  @HttpCode(200)
  @Allow('reports')
  @ApiOperation({ summary: 'The backlog forecast with chair days or operator days added or removed per week' })
  @ApiOkResponse({ description: 'BacklogWhatIfResponse: before, after, the change and what one day stands for' })
  @ApiBadRequestResponse({ description: BAD })
  backlogWhatIf(@CurrentUser() u: RequestUser, @Body() dto: BacklogWhatIfDto): Promise<BacklogWhatIfResponse> {
    return this.reports.backlogWhatIf(u.practiceId, dto);
  }

  @Get('settings/reports')
  @Allow('reports')
  @ApiOperation({ summary: 'The late-cancellation notice the attendance report uses' })
  settings(@CurrentUser() u: RequestUser): Promise<ReportSettings> {
    return this.reports.settings(u.practiceId);
  }

  @Put('settings/reports')
  @Allow('reports')
  @ApiOperation({ summary: 'Change the late-cancellation notice (the practice setting lateCancellationHours)' })
  @ApiBadRequestResponse({ description: 'lateCancelNoticeHours missing or outside 0–168' })
  updateSettings(@CurrentUser() u: RequestUser, @Body() dto: ReportSettingsDto): Promise<ReportSettings> {
    return this.reports.updateSettings(u.practiceId, dto);
  }
}
