import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import type { WaitlistEntryInput } from '@ostium/shared';
import { Transform, Type } from 'class-transformer';
import { IsInt, IsOptional, IsString, MaxLength, Min } from 'class-validator';
import { IsCalendarDate, trimToNull } from '../../patients/dto/field-validators.util.js';

export class WaitlistEntryDto implements WaitlistEntryInput {
  @ApiProperty() @IsInt() @Min(1) caseId: number;
  @ApiPropertyOptional({ example: '2026-12-10', description: 'not before this local date' }) @IsOptional() @IsCalendarDate() earliest?: string;
  @ApiPropertyOptional() @IsOptional() @Transform(trimToNull) @IsString() @MaxLength(500) notes?: string;
}

export class WaitlistFitsQueryDto {
  @ApiProperty({ description: 'a cancelled appointment whose time is free again' }) @Type(() => Number) @IsInt() @Min(1) appointmentId: number;
}
