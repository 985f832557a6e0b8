import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { PROCEDURES, URGENCIES, type CreateReferralRequest, type Procedure, type ReferralToothInput, type Urgency } from '@ostium/shared';
import { Transform, Type } from 'class-transformer';
import { ArrayMaxSize, ArrayMinSize, IsArray, IsIn, IsInt, IsNotEmpty, IsOptional, IsString, MaxLength, Min, ValidateNested } from 'class-validator';
import { CreatePatientDto } from '../../patients/dto/patient.dto.js';
import { IsCalendarDate, trim, trimToNull } from '../../patients/dto/field-validators.util.js';
import { CreateReferringDentistDto } from '../../referring-dentists/dto/referring-dentist.dto.js';

export class ReferralToothDto implements ReferralToothInput {
  @ApiProperty({ example: '19', description: 'in the request’s notation (default the practice’s)' })
  @Transform(trim) @IsString({ message: 'tooth must be text' }) @IsNotEmpty({ message: 'tooth must not be empty' }) @MaxLength(8) tooth: string;

  @ApiPropertyOptional({ enum: PROCEDURES, description: 'default: the referral’s procedure' })
  @IsOptional() @IsIn(PROCEDURES, { message: `procedure must be one of ${PROCEDURES.join(', ')}` }) procedure?: Procedure;
}

const wholeId = (field: string) => ({ message: `${field} must be a whole number` });

export class CreateReferralDto implements CreateReferralRequest {
  @ApiPropertyOptional({ description: 'an existing patient; or give `patient` to create one' })
  @IsOptional() @Type(() => Number) @IsInt(wholeId('patientId')) @Min(1, wholeId('patientId')) patientId?: number;

  @ApiPropertyOptional({ type: () => CreatePatientDto, description: 'a new patient (409 DuplicatePatientBody when name and date of birth match, unless confirmNew)' })
  @IsOptional() @ValidateNested() @Type(() => CreatePatientDto) patient?: CreatePatientDto;

  @ApiPropertyOptional({ description: 'an existing referring dentist; or give `referringDentist` to create one' })
  @IsOptional() @Type(() => Number) @IsInt(wholeId('referringDentistId')) @Min(1, wholeId('referringDentistId')) referringDentistId?: number;

  @ApiPropertyOptional({ type: () => CreateReferringDentistDto })
  @IsOptional() @ValidateNested() @Type(() => CreateReferringDentistDto) referringDentist?: CreateReferringDentistDto;

  @ApiPropertyOptional({ example: '2026-11-30', description: 'YYYY-MM-DD; default today at the location' })
  @IsOptional() @Transform(trim) @IsCalendarDate() receivedOn?: string;

  @ApiProperty() @Type(() => Number) @IsInt(wholeId('locationId')) @Min(1, wholeId('locationId')) locationId: number;

  @ApiProperty({ enum: URGENCIES }) @IsIn(URGENCIES, { message: `urgency must be one of ${URGENCIES.join(', ')}` }) urgency: Urgency;

  @ApiProperty({ enum: PROCEDURES }) @IsIn(PROCEDURES, { message: `procedure must be one of ${PROCEDURES.join(', ')}` }) procedure: Procedure;

  @ApiPropertyOptional({ description: 'the referrer’s reason' }) @IsOptional() @Transform(trimToNull) @IsString() @MaxLength(4000) reason?: string | null;

  @ApiPropertyOptional() @IsOptional() @Transform(trimToNull) @IsString() @MaxLength(4000) notes?: string | null;

  @ApiPropertyOptional({ enum: ['fdi', 'universal'], description: 'notation of the teeth; default the practice’s setting' })
  @IsOptional() @IsIn(['fdi', 'universal'], { message: 'notation must be fdi or universal' }) notation?: 'fdi' | 'universal';

  @ApiProperty({ type: () => [ReferralToothDto], description: 'each tooth becomes a case' })
  @IsArray({ message: 'teeth must be a list of teeth' })
  @ArrayMinSize(1, { message: 'teeth must list at least one tooth' })
  @ArrayMaxSize(32, { message: 'teeth lists at most 32 teeth' })
  @ValidateNested({ each: true })
  @Type(() => ReferralToothDto)
  teeth: ReferralToothDto[];

  @ApiPropertyOptional({ type: [Number], description: 'uploaded first with POST /api/attachments' })
  @IsOptional() @IsArray({ message: 'attachmentIds must be a list of ids' }) @ArrayMaxSize(50) @Type(() => Number) @IsInt({ each: true, message: 'attachmentIds must be whole numbers' }) attachmentIds?: number[];
}
