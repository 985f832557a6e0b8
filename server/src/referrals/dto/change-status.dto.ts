import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { REFERRAL_STATUSES, type ChangeReferralStatusRequest, type ReferralStatus } from '@ostium/shared';
import { Transform } from 'class-transformer';
import { IsIn, IsOptional, IsString, MaxLength } from 'class-validator';
import { trimToNull } from '../../patients/dto/field-validators.util.js';

export class ChangeReferralStatusDto implements ChangeReferralStatusRequest {
  @ApiProperty({ enum: REFERRAL_STATUSES })
  @IsIn(REFERRAL_STATUSES, { message: `status must be one of ${REFERRAL_STATUSES.join(', ')}` }) status: ReferralStatus;

  @ApiPropertyOptional({ description: 'required for declined and cancelled' })
  @IsOptional() @Transform(trimToNull) @IsString({ message: 'reason must be text' }) @MaxLength(500) reason?: string;
}
