import { ApiProperty } from '@nestjs/swagger';
import { Type } from 'class-transformer';
import { IsInt, Min } from 'class-validator';
import { IsCalendarDate } from '../../patients/dto/field-validators.util.js';

export class ChairsideQueryDto {
  @ApiProperty({ example: '2026-12-07', description: 'local date at the location' }) @IsCalendarDate() date: string;
  @ApiProperty() @Type(() => Number) @IsInt() @Min(1) locationId: number;
}
