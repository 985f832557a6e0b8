import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { LETTER_CHANNELS, type LetterChannel, type MergeReferringDentistsRequest, type ReferringDentistInput } from '@ostium/shared';
import { Transform, Type } from 'class-transformer';
import { IsEmail, IsIn, IsInt, IsNotEmpty, IsOptional, IsString, MaxLength, Min } from 'class-validator';
import { IsPhone, lowerToNull, trim, trimToNull } from '../../patients/dto/field-validators.util.js';

export class CreateReferringDentistDto implements ReferringDentistInput {
  @ApiProperty({ example: 'Dr. Ottilie Farrow' })
  @Transform(trim) @IsString({ message: 'name must be text' }) @IsNotEmpty({ message: 'name must not be empty' }) @MaxLength(160) name: string;

  @ApiPropertyOptional({ example: 'Larchmere Family Dental' }) @IsOptional() @Transform(trimToNull) @IsString() @MaxLength(160) practiceName?: string | null;

  @ApiPropertyOptional({ example: 'front@larchmere-dental.test' })
  @IsOptional() @Transform(lowerToNull) @IsEmail({}, { message: 'email must be a valid e-mail address' }) @MaxLength(254) email?: string | null;

  @ApiPropertyOptional({ example: '(202) 555-0161', description: 'any input; stored E.164' }) @IsOptional() @Transform(trimToNull) @IsPhone() phone?: string | null;

  @ApiPropertyOptional() @IsOptional() @Transform(trimToNull) @IsString() @MaxLength(400) address?: string | null;

  @ApiPropertyOptional({ enum: LETTER_CHANNELS, description: 'how the dentist wants letters; acknowledgements go by e-mail only when this is email' })
  @IsOptional() @IsIn(LETTER_CHANNELS, { message: `letterChannel must be one of ${LETTER_CHANNELS.join(', ')}` }) letterChannel?: LetterChannel;

  @ApiPropertyOptional() @IsOptional() @Transform(trimToNull) @IsString() @MaxLength(4000) notes?: string | null;
}

export class UpdateReferringDentistDto implements Partial<ReferringDentistInput> {
  @ApiPropertyOptional()
  @IsOptional() @Transform(trim) @IsString({ message: 'name must be text' }) @IsNotEmpty({ message: 'name must not be empty' }) @MaxLength(160) name?: string;

  @ApiPropertyOptional() @IsOptional() @Transform(trimToNull) @IsString() @MaxLength(160) practiceName?: string | null;

  @ApiPropertyOptional()
  @IsOptional() @Transform(lowerToNull) @IsEmail({}, { message: 'email must be a valid e-mail address' }) @MaxLength(254) email?: string | null;

  @ApiPropertyOptional() @IsOptional() @Transform(trimToNull) @IsPhone() phone?: string | null;

  @ApiPropertyOptional() @IsOptional() @Transform(trimToNull) @IsString() @MaxLength(400) address?: string | null;

  @ApiPropertyOptional({ enum: LETTER_CHANNELS })
  @IsOptional() @IsIn(LETTER_CHANNELS, { message: `letterChannel must be one of ${LETTER_CHANNELS.join(', ')}` }) letterChannel?: LetterChannel;

  @ApiPropertyOptional() @IsOptional() @Transform(trimToNull) @IsString() @MaxLength(4000) notes?: string | null;
}

export class MergeReferringDentistsDto implements MergeReferringDentistsRequest {
  @ApiProperty({ description: 'the duplicate record: its referrals move to :id, then it is deleted' })
  @Type(() => Number) @IsInt({ message: 'otherId must be a whole number' }) @Min(1, { message: 'otherId must be a whole number' }) otherId: number;
}
