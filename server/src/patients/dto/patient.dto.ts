import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { PREFERRED_CHANNELS, type PatientInput, type PreferredChannel } from '@ostium/shared';
import { Transform, Type } from 'class-transformer';
import { IsBoolean, IsEmail, IsIn, IsInt, IsNotEmpty, IsOptional, IsString, Max, MaxLength, Min } from 'class-validator';
import { IsCalendarDate, IsPhone, IsTimeZone, lowerToNull, trim, trimToNull } from './field-validators.util.js';

const EARLIEST_BIRTH = '1900-01-01';

export class CreatePatientDto implements PatientInput {
  @ApiProperty({ example: 'Wren' })
  @Transform(trim) @IsString({ message: 'firstName must be text' }) @IsNotEmpty({ message: 'firstName must not be empty' }) @MaxLength(80) firstName: string;

  @ApiProperty({ example: 'Halloway' })
  @Transform(trim) @IsString({ message: 'lastName must be text' }) @IsNotEmpty({ message: 'lastName must not be empty' }) @MaxLength(80) lastName: string;

  @ApiProperty({ example: '1984-03-17', description: 'YYYY-MM-DD' })
  @Transform(trim) @IsCalendarDate({ notFuture: true, earliest: EARLIEST_BIRTH }) dateOfBirth: string;

  @ApiPropertyOptional({ example: '(202) 555-0143', description: 'any input; stored E.164' })
  @IsOptional() @Transform(trimToNull) @IsPhone() phone?: string | null;

  @ApiPropertyOptional({ example: 'wren.halloway@example.com' })
  @IsOptional() @Transform(lowerToNull) @IsEmail({}, { message: 'email must be a valid e-mail address' }) @MaxLength(254) email?: string | null;

  @ApiPropertyOptional({ enum: PREFERRED_CHANNELS })
  @IsOptional() @IsIn(PREFERRED_CHANNELS, { message: `preferredChannel must be one of ${PREFERRED_CHANNELS.join(', ')}` }) preferredChannel?: PreferredChannel;

  @ApiPropertyOptional({ description: 'the patient agreed to text messages; the server records when' })
  @IsOptional() @IsBoolean({ message: 'smsConsent must be true or false' }) smsConsent?: boolean;

  @ApiPropertyOptional({ example: 'intake form', description: 'how consent was given' })
  @IsOptional() @Transform(trimToNull) @IsString() @MaxLength(160) smsConsentSource?: string | null;

  @ApiPropertyOptional({ example: 'America/New_York', description: 'IANA; defaults to the referral location’s' })
  @IsOptional() @Transform(trimToNull) @IsTimeZone() timeZone?: string | null;

  @ApiPropertyOptional() @IsOptional() @Transform(trimToNull) @IsString() @MaxLength(4000) notes?: string | null;

  @ApiPropertyOptional({ description: 'create even though a patient with the same name and date of birth exists' })
  @IsOptional() @IsBoolean({ message: 'confirmNew must be true or false' }) confirmNew?: boolean;
}

export class UpdatePatientDto implements Partial<PatientInput> {
  @ApiPropertyOptional()
  @IsOptional() @Transform(trim) @IsString({ message: 'firstName must be text' }) @IsNotEmpty({ message: 'firstName must not be empty' }) @MaxLength(80) firstName?: string;

  @ApiPropertyOptional()
  @IsOptional() @Transform(trim) @IsString({ message: 'lastName must be text' }) @IsNotEmpty({ message: 'lastName must not be empty' }) @MaxLength(80) lastName?: string;

  @ApiPropertyOptional({ description: 'YYYY-MM-DD' })
  @IsOptional() @Transform(trim) @IsCalendarDate({ notFuture: true, earliest: EARLIEST_BIRTH }) dateOfBirth?: string;

  @ApiPropertyOptional() @IsOptional() @Transform(trimToNull) @IsPhone() phone?: string | null;

  @ApiPropertyOptional()
  @IsOptional() @Transform(lowerToNull) @IsEmail({}, { message: 'email must be a valid e-mail address' }) @MaxLength(254) email?: string | null;

  @ApiPropertyOptional({ enum: PREFERRED_CHANNELS })
  @IsOptional() @IsIn(PREFERRED_CHANNELS, { message: `preferredChannel must be one of ${PREFERRED_CHANNELS.join(', ')}` }) preferredChannel?: PreferredChannel;

  @ApiPropertyOptional() @IsOptional() @IsBoolean({ message: 'smsConsent must be true or false' }) smsConsent?: boolean;

  @ApiPropertyOptional() @IsOptional() @Transform(trimToNull) @IsString() @MaxLength(160) smsConsentSource?: string | null;

  @ApiPropertyOptional() @IsOptional() @Transform(trimToNull) @IsTimeZone() timeZone?: string | null;

  @ApiPropertyOptional() @IsOptional() @Transform(trimToNull) @IsString() @MaxLength(4000) notes?: string | null;

  @ApiPropertyOptional({ description: 'save even though another patient has the same name and date of birth' })
  @IsOptional() @IsBoolean({ message: 'confirmNew must be true or false' }) confirmNew?: boolean;
}

export class SearchQueryDto {
  @ApiPropertyOptional({ description: 'name, e-mail or phone' }) @IsOptional() @Transform(trim) @IsString() @MaxLength(120) q?: string;

  @ApiPropertyOptional({ description: 'at most this many rows (default 50)' })
  @IsOptional() @Type(() => Number) @IsInt({ message: 'limit must be a whole number' }) @Min(1) @Max(200) limit?: number;
}
