import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import type { TimeFinderApiRequest, TimeFinderPlanVisit } from '@ostium/shared';
import { Type } from 'class-transformer';
import { ArrayMaxSize, ArrayMinSize, IsArray, IsBoolean, IsDateString, IsIn, IsInt, IsOptional, Max, Min, ValidateNested } from 'class-validator';

export class PlanVisitDto implements TimeFinderPlanVisit {
  @ApiProperty({ example: 90 }) @IsInt() @Min(5) @Max(600) minutes: number;
  @ApiProperty() @IsBoolean() needsMicroscope: boolean;
  @ApiPropertyOptional({ example: 7 }) @IsOptional() @IsInt() @Min(0) @Max(365) earliestDaysAfterPrevious?: number;
  @ApiPropertyOptional({ example: 21 }) @IsOptional() @IsInt() @Min(0) @Max(365) latestDaysAfterPrevious?: number;
}

export class PlanDto {
  @ApiProperty({ type: [PlanVisitDto] }) @IsArray() @ArrayMinSize(1) @ArrayMaxSize(6) @ValidateNested({ each: true }) @Type(() => PlanVisitDto) visits: PlanVisitDto[];
}

export class PreferencesDto {
  @ApiPropertyOptional({ description: '1 = Monday … 7 = Sunday' }) @IsOptional() @IsArray() @ArrayMaxSize(7) @IsInt({ each: true }) @Min(1, { each: true }) @Max(7, { each: true }) weekdays?: number[];
  @ApiPropertyOptional({ enum: ['morning', 'afternoon'] }) @IsOptional() @IsIn(['morning', 'afternoon']) partOfDay?: 'morning' | 'afternoon';
}

export class TimeFinderRequestDto implements TimeFinderApiRequest {
  @ApiPropertyOptional({ description: 'a case: its stored estimate (or the endodontist’s override) sets the plan' }) @IsOptional() @IsInt() @Min(1) caseId?: number;
  @ApiPropertyOptional({ type: () => PlanDto }) @IsOptional() @ValidateNested() @Type(() => PlanDto) plan?: PlanDto;
  @ApiPropertyOptional() @IsOptional() @IsInt() @Min(1) locationId?: number;
  @ApiPropertyOptional() @IsOptional() @IsInt() @Min(1) operatorId?: number;
  @ApiPropertyOptional({ description: 'ISO instant; default now' }) @IsOptional() @IsDateString({ strict: true }, { message: 'from must be an ISO date-time' }) from?: string;
  @ApiPropertyOptional({ description: 'ISO instant; default 12 weeks after from' }) @IsOptional() @IsDateString({ strict: true }, { message: 'to must be an ISO date-time' }) to?: string;
  @ApiPropertyOptional({ type: () => PreferencesDto }) @IsOptional() @ValidateNested() @Type(() => PreferencesDto) preferences?: PreferencesDto;
  @ApiPropertyOptional({ description: 'default: the referral’s urgency is urgent' }) @IsOptional() @IsBoolean() urgent?: boolean;
  @ApiPropertyOptional({ example: 5 }) @IsOptional() @IsInt() @Min(1) @Max(20) limit?: number;
}
