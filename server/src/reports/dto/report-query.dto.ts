import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import type { BacklogWhatIfRequest, ReportQuery, ReportSettings } from '@ostium/shared';
import { Transform, Type } from 'class-transformer';
import { IsInt, IsNumber, IsOptional, Max, Min } from 'class-validator';
import { IsCalendarDate, trim } from '../../patients/dto/field-validators.util.js';
import { MAX_RANGE_DAYS } from '../report-constants.js';

const id = (field: string) => ({ message: `${field} must be a whole number` });

/** from ≤ to and at most MAX_RANGE_DAYS days are checked by ReportsService.checkRange (400 naming the field). */
export class ReportQueryDto implements ReportQuery {
  @ApiProperty({ description: 'first local day, YYYY-MM-DD (in each location’s zone)', example: '2026-10-05' })
  @Transform(trim) @IsCalendarDate() from: string;

  @ApiProperty({ description: `last local day, YYYY-MM-DD, inclusive; at most ${MAX_RANGE_DAYS} days after from`, example: '2026-11-29' })
  @Transform(trim) @IsCalendarDate() to: string;

  @ApiPropertyOptional() @IsOptional() @Type(() => Number) @IsInt(id('locationId')) @Min(1, { message: 'locationId must be 1 or more' }) locationId?: number;

  @ApiPropertyOptional({ description: 'chair reports only' }) @IsOptional() @Type(() => Number) @IsInt(id('chairId')) @Min(1, { message: 'chairId must be 1 or more' }) chairId?: number;

  @ApiPropertyOptional() @IsOptional() @Type(() => Number) @IsInt(id('operatorId')) @Min(1, { message: 'operatorId must be 1 or more' }) operatorId?: number;
}

/** The backlog looks ahead from tomorrow; from/to (optional) are the past days its average minutes per level come from. */
export class BacklogQueryDto {
  @ApiPropertyOptional({ description: 'first past day the averages per level come from (default: 365 days ago)' })
  @IsOptional() @Transform(trim) @IsCalendarDate() from?: string;

  @ApiPropertyOptional({ description: 'last past day the averages per level come from (default: yesterday)' })
  @IsOptional() @Transform(trim) @IsCalendarDate() to?: string;

  @ApiPropertyOptional() @IsOptional() @Type(() => Number) @IsInt(id('locationId')) @Min(1, { message: 'locationId must be 1 or more' }) locationId?: number;

  @ApiPropertyOptional({ description: 'accepted for the shared filters; the backlog is per location' }) @IsOptional() @Type(() => Number) @IsInt(id('chairId')) @Min(1) chairId?: number;

  @ApiPropertyOptional({ description: 'accepted for the shared filters; the backlog is per location' }) @IsOptional() @Type(() => Number) @IsInt(id('operatorId')) @Min(1) operatorId?: number;
}

export class BacklogWhatIfDto implements BacklogWhatIfRequest {
  @ApiPropertyOptional({ description: 'add the days at this location (default: shared by the locations by open chair time)' })
  @IsOptional() @IsInt(id('locationId')) @Min(1, { message: 'locationId must be 1 or more' }) locationId?: number;

  @ApiPropertyOptional() @IsOptional() @Transform(trim) @IsCalendarDate() from?: string;
  @ApiPropertyOptional() @IsOptional() @Transform(trim) @IsCalendarDate() to?: string;

  @ApiProperty({ description: 'chair days added (positive) or removed (negative) per week; a chair day comes with an endodontist', example: 1 })
  @IsNumber({ allowNaN: false, allowInfinity: false }, { message: 'chairDaysPerWeek must be a number' })
  @Min(-50, { message: 'chairDaysPerWeek must be between -50 and 50' })
  @Max(50, { message: 'chairDaysPerWeek must be between -50 and 50' })
  chairDaysPerWeek: number;

  @ApiProperty({ description: 'operator days added or removed per week (in chairs already open)', example: 0 })
  @IsNumber({ allowNaN: false, allowInfinity: false }, { message: 'operatorDaysPerWeek must be a number' })
  @Min(-50, { message: 'operatorDaysPerWeek must be between -50 and 50' })
  @Max(50, { message: 'operatorDaysPerWeek must be between -50 and 50' })
  operatorDaysPerWeek: number;
}

export class ReportSettingsDto implements ReportSettings {
  @ApiProperty({ description: 'a cancellation with less notice than this many hours is late (default 48)', example: 48 })
  @IsInt({ message: 'lateCancelNoticeHours must be a whole number of hours' })
  @Min(0, { message: 'lateCancelNoticeHours must be between 0 and 168' })
  @Max(168, { message: 'lateCancelNoticeHours must be between 0 and 168' })
  lateCancelNoticeHours: number;
}
