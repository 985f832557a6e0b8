import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { APPOINTMENT_STATES, type AppointmentQuery, type AppointmentState, type BookAppointmentsRequest, type ProposedVisitSlot, type UpdateAppointmentRequest } from '@ostium/shared';
import { Transform, Type } from 'class-transformer';
import { ArrayMaxSize, ArrayMinSize, IsArray, IsBoolean, IsDateString, IsIn, IsInt, IsOptional, IsString, MaxLength, Min, ValidateIf, ValidateNested } from 'class-validator';
import { trimToNull } from '../../patients/dto/field-validators.util.js';

const isoInstant = (field: string) => ({ message: `${field} must be an ISO date-time` });

export class VisitSlotDto implements ProposedVisitSlot {
  @ApiProperty({ example: '2026-12-07T14:00:00.000Z' }) @IsDateString({ strict: true }, isoInstant('start')) start: string;
  @ApiProperty({ example: '2026-12-07T15:30:00.000Z' }) @IsDateString({ strict: true }, isoInstant('end')) end: string;
  @ApiProperty() @IsInt() @Min(1) chairId: number;
  @ApiProperty() @IsInt() @Min(1) operatorId: number;
  @ApiPropertyOptional() @IsOptional() @IsInt() @Min(1) microscopeId?: number;
}

export class BookAppointmentsDto implements BookAppointmentsRequest {
  @ApiProperty() @IsInt() @Min(1) caseId: number;
  @ApiProperty({ type: [VisitSlotDto] }) @IsArray() @ArrayMinSize(1) @ArrayMaxSize(6) @ValidateNested({ each: true }) @Type(() => VisitSlotDto) visits: VisitSlotDto[];
  @ApiPropertyOptional() @IsOptional() @Transform(trimToNull) @IsString() @MaxLength(1000) notes?: string;
}

export class UpdateAppointmentDto implements UpdateAppointmentRequest {
  @ApiProperty({ description: 'the version that was read; a stale one gets 409' }) @IsInt() @Min(1) version: number;
  @ApiPropertyOptional() @IsOptional() @IsDateString({ strict: true }, isoInstant('start')) start?: string;
  @ApiPropertyOptional() @IsOptional() @IsDateString({ strict: true }, isoInstant('end')) end?: string;
  @ApiPropertyOptional() @IsOptional() @IsInt() @Min(1) chairId?: number;
  @ApiPropertyOptional() @IsOptional() @IsInt() @Min(1) operatorId?: number;
  @ApiPropertyOptional({ nullable: true }) @IsOptional() @ValidateIf((_, v) => v !== null) @IsInt() @Min(1) microscopeId?: number | null;
  @ApiPropertyOptional({ enum: APPOINTMENT_STATES }) @IsOptional() @IsIn(APPOINTMENT_STATES, { message: `state must be one of ${APPOINTMENT_STATES.join(', ')}` }) state?: AppointmentState;
  @ApiPropertyOptional({ description: 'required when cancelling' }) @IsOptional() @IsString() @MaxLength(500) reason?: string;
}

const toBool = ({ value }: { value: unknown }) => (value === 'true' || value === true ? true : value === 'false' || value === false ? false : value);

export class AppointmentQueryDto implements AppointmentQuery {
  @ApiProperty() @IsDateString({ strict: true }, isoInstant('from')) from: string;
  @ApiProperty() @IsDateString({ strict: true }, isoInstant('to')) to: string;
  @ApiPropertyOptional() @IsOptional() @Type(() => Number) @IsInt() @Min(1) locationId?: number;
  @ApiPropertyOptional() @IsOptional() @Type(() => Number) @IsInt() @Min(1) chairId?: number;
  @ApiPropertyOptional() @IsOptional() @Type(() => Number) @IsInt() @Min(1) operatorId?: number;
  @ApiPropertyOptional({ description: 'also cancelled and no-show appointments' }) @IsOptional() @Transform(toBool) @IsBoolean() includeCancelled?: boolean;
}
