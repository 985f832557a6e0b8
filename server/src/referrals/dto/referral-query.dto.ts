import { ApiPropertyOptional } from '@nestjs/swagger';
import { REFERRAL_STATUSES, URGENCIES, type ReferralQuery, type ReferralStatus, type Urgency } from '@ostium/shared';
import { Transform, Type } from 'class-transformer';
import { IsIn, IsInt, IsOptional, IsString, Max, MaxLength, Min } from 'class-validator';
import { IsCalendarDate, trim } from '../../patients/dto/field-validators.util.js';

export const QUEUE_SORTS = ['waiting', 'received', 'urgency', 'patient'] as const;

// `?status=a&status=b` and `?status=a,b` both mean "either".
const list = ({ value }: { value: unknown }) =>
  value === undefined ? undefined : (Array.isArray(value) ? value : [value]).flatMap((v) => String(v).split(',')).map((v) => v.trim()).filter(Boolean);

export class ReferralQueryDto implements ReferralQuery {
  @ApiPropertyOptional({ enum: REFERRAL_STATUSES, isArray: true, description: 'one or several (repeat the parameter or separate with commas)' })
  @IsOptional() @Transform(list) @IsIn(REFERRAL_STATUSES, { each: true, message: `status must be one of ${REFERRAL_STATUSES.join(', ')}` }) status?: ReferralStatus[];

  @ApiPropertyOptional({ enum: URGENCIES }) @IsOptional() @IsIn(URGENCIES, { message: `urgency must be one of ${URGENCIES.join(', ')}` }) urgency?: Urgency;

  @ApiPropertyOptional() @IsOptional() @Type(() => Number) @IsInt({ message: 'referringDentistId must be a whole number' }) @Min(1) referringDentistId?: number;

  @ApiPropertyOptional() @IsOptional() @Type(() => Number) @IsInt({ message: 'locationId must be a whole number' }) @Min(1) locationId?: number;

  @ApiPropertyOptional({ description: 'received on or after, YYYY-MM-DD' }) @IsOptional() @Transform(trim) @IsCalendarDate() from?: string;

  @ApiPropertyOptional({ description: 'received on or before, YYYY-MM-DD' }) @IsOptional() @Transform(trim) @IsCalendarDate() to?: string;

  @ApiPropertyOptional({ description: 'patient name' }) @IsOptional() @Transform(trim) @IsString() @MaxLength(120) q?: string;

  @ApiPropertyOptional({ enum: QUEUE_SORTS, description: 'default waiting: open referrals first, the one waiting longest at the top' })
  @IsOptional() @IsIn(QUEUE_SORTS, { message: `sort must be one of ${QUEUE_SORTS.join(', ')}` }) sort?: (typeof QUEUE_SORTS)[number];

  @ApiPropertyOptional({ enum: ['asc', 'desc'], description: 'default: asc for waiting and patient, desc for received and urgency' })
  @IsOptional() @IsIn(['asc', 'desc'], { message: 'order must be asc or desc' }) order?: 'asc' | 'desc';

  @ApiPropertyOptional({ default: 1 }) @IsOptional() @Type(() => Number) @IsInt({ message: 'page must be a whole number' }) @Min(1, { message: 'page must be 1 or more' }) page?: number;

  @ApiPropertyOptional({ default: 25 })
  @IsOptional() @Type(() => Number) @IsInt({ message: 'pageSize must be a whole number' }) @Min(1, { message: 'pageSize must be between 1 and 100' }) @Max(100, { message: 'pageSize must be between 1 and 100' }) pageSize?: number;
}
