import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import type { ChairInput, ClosureInput, HoldInput, LocationInput, MicroscopeInput, TimeOffInput, WallClockRange, WorkingRuleInput } from '@ostium/shared';
import { Transform, Type } from 'class-transformer';
import { ArrayMaxSize, IsArray, IsBoolean, IsDateString, IsInt, IsNotEmpty, IsOptional, IsString, Max, MaxLength, Min, ValidateNested } from 'class-validator';
import { IsCalendarDate, trim, trimToNull } from '../../patients/dto/field-validators.util.js';
import { IsIanaZone, IsRrule, IsWallClock } from './scheduling-validators.util.js';

export class OpeningHoursDayDto {
  @ApiProperty({ description: '1 = Monday … 7 = Sunday' }) @IsInt() @Min(1) @Max(7) weekday: number;
  @ApiProperty({ example: '08:00' }) @IsWallClock() open: string;
  @ApiProperty({ example: '17:00' }) @IsWallClock() close: string;
}

export class LocationDto implements LocationInput {
  @ApiProperty() @Transform(trim) @IsString() @IsNotEmpty({ message: 'name must not be empty' }) @MaxLength(120) name: string;
  @ApiPropertyOptional() @IsOptional() @Transform(trimToNull) @IsString() @MaxLength(400) address?: string | null;
  @ApiPropertyOptional() @IsOptional() @Transform(trimToNull) @IsString() @MaxLength(32) phone?: string | null;
  @ApiProperty({ example: 'America/New_York' }) @IsIanaZone() timeZone: string;
  @ApiProperty({ type: [OpeningHoursDayDto] }) @IsArray() @ArrayMaxSize(21) @ValidateNested({ each: true }) @Type(() => OpeningHoursDayDto) openingHours: OpeningHoursDayDto[];
}

export class ClosureDto implements ClosureInput {
  @ApiProperty({ example: '2026-12-25' }) @IsCalendarDate() date: string;
  @ApiProperty() @Transform(trim) @IsString() @IsNotEmpty({ message: 'reason must not be empty' }) @MaxLength(200) reason: string;
}

export class ChairDto implements ChairInput {
  @ApiProperty() @Transform(trim) @IsString() @IsNotEmpty({ message: 'name must not be empty' }) @MaxLength(120) name: string;
  @ApiPropertyOptional({ nullable: true }) @IsOptional() @IsInt() @Min(1) fixedMicroscopeId?: number | null;
  @ApiPropertyOptional() @IsOptional() @IsBoolean() active?: boolean;
}

export class MicroscopeDto implements MicroscopeInput {
  @ApiProperty() @Transform(trim) @IsString() @IsNotEmpty({ message: 'name must not be empty' }) @MaxLength(120) name: string;
  @ApiProperty({ description: 'mobile within its location, or fixed to a chair' }) @IsBoolean() mobile: boolean;
  @ApiPropertyOptional() @IsOptional() @IsBoolean() active?: boolean;
}

export class WallClockRangeDto implements WallClockRange {
  @ApiProperty({ example: '12:00' }) @IsWallClock() start: string;
  @ApiProperty({ example: '12:45' }) @IsWallClock() end: string;
}

export class WorkingRuleDto implements WorkingRuleInput {
  @ApiProperty() @IsInt() @Min(1) locationId: number;
  @ApiProperty({ example: 'FREQ=WEEKLY;BYDAY=MO,WE,TH' }) @Transform(trim) @IsRrule() rrule: string;
  @ApiProperty({ example: '08:00' }) @IsWallClock() start: string;
  @ApiProperty({ example: '16:30' }) @IsWallClock() end: string;
  @ApiPropertyOptional({ type: [WallClockRangeDto] }) @IsOptional() @IsArray() @ArrayMaxSize(6) @ValidateNested({ each: true }) @Type(() => WallClockRangeDto) breaks?: WallClockRangeDto[];
}

export class TimeOffDto implements TimeOffInput {
  @ApiProperty({ description: 'ISO instant' }) @IsDateString({ strict: true }, { message: 'start must be an ISO date-time' }) start: string;
  @ApiProperty({ description: 'ISO instant' }) @IsDateString({ strict: true }, { message: 'end must be an ISO date-time' }) end: string;
  @ApiPropertyOptional() @IsOptional() @Transform(trimToNull) @IsString() @MaxLength(200) reason?: string;
}

export class HoldDto implements HoldInput {
  @ApiProperty() @IsInt() @Min(1) operatorId: number;
  @ApiProperty() @IsInt() @Min(1) locationId: number;
  @ApiProperty({ example: 'FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR' }) @Transform(trim) @IsRrule() rrule: string;
  @ApiProperty({ example: '15:30' }) @IsWallClock() start: string;
  @ApiProperty({ example: '16:00' }) @IsWallClock() end: string;
  @ApiPropertyOptional({ example: '18:00', description: 'local time the day before when an unused hold opens to everyone' })
  @IsOptional() @IsWallClock() opensEveningBeforeAt?: string;
}
