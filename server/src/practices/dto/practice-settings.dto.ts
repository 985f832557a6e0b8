import { ApiPropertyOptional } from '@nestjs/swagger';
import type { PracticeSettings } from '@ostium/shared';
import { IsIn, IsInt, IsOptional, Max, Min } from 'class-validator';

export class UpdatePracticeSettingsDto implements Partial<PracticeSettings> {
  @ApiPropertyOptional({ enum: ['fdi', 'universal'] })
  @IsOptional() @IsIn(['fdi', 'universal'], { message: 'toothNotation must be fdi or universal' }) toothNotation?: 'fdi' | 'universal';

  @ApiPropertyOptional({ description: 'minutes; booking lengths round up to this' })
  @IsOptional() @IsInt() @IsIn([5, 10, 15], { message: 'bookingGridMinutes must be 5, 10 or 15' }) bookingGridMinutes?: number;

  @ApiPropertyOptional() @IsOptional() @IsInt() @Min(0) @Max(168) lateCancellationHours?: number;
}
