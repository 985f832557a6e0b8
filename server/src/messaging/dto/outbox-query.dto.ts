import { ApiPropertyOptional } from '@nestjs/swagger';
import { OUTBOX_STATUSES, type OutboxStatus } from '@ostium/shared';
import { Type } from 'class-transformer';
import { IsIn, IsInt, IsOptional, Min } from 'class-validator';
import type { OutboxListQuery } from '../outbox.service.js';

export class OutboxQueryDto implements OutboxListQuery {
  @ApiPropertyOptional({ enum: OUTBOX_STATUSES })
  @IsOptional()
  @IsIn(OUTBOX_STATUSES, { message: `status must be one of ${OUTBOX_STATUSES.join(', ')}` })
  status?: OutboxStatus;

  @ApiPropertyOptional() @IsOptional() @Type(() => Number) @IsInt({ message: 'patientId must be a whole number' }) @Min(1) patientId?: number;
  @ApiPropertyOptional() @IsOptional() @Type(() => Number) @IsInt({ message: 'appointmentId must be a whole number' }) @Min(1) appointmentId?: number;
}
