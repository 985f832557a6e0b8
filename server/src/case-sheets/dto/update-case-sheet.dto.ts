import { ApiPropertyOptional } from '@nestjs/swagger';
import { PROCEDURES, type EstimateFacts, type FactorKey, type Level, type Procedure, type UpdateCaseSheetRequest } from '@ostium/shared';
import { Type } from 'class-transformer';
import { ArrayMaxSize, ArrayMinSize, IsArray, IsBoolean, IsIn, IsInt, IsNotEmpty, IsObject, IsOptional, IsString, Max, MaxLength, Min, ValidateIf, ValidateNested } from 'class-validator';

export class CaseOverrideDto {
  @ApiPropertyOptional({ type: [Number] })
  @IsArray({ message: 'override.minutesPerVisit must be a list of minutes' })
  @ArrayMinSize(1) @ArrayMaxSize(10)
  @IsInt({ each: true, message: 'override.minutesPerVisit must hold whole minutes' })
  @Min(5, { each: true, message: 'override.minutesPerVisit: each visit at least 5 minutes' })
  @Max(480, { each: true, message: 'override.minutesPerVisit: each visit at most 480 minutes' })
  minutesPerVisit: number[];

  @ApiPropertyOptional()
  @IsString() @IsNotEmpty({ message: 'override.reason is required: say why the time differs from the estimate' }) @MaxLength(500)
  reason: string;
}

export class UpdateCaseSheetDto implements UpdateCaseSheetRequest {
  @ApiPropertyOptional({ enum: PROCEDURES }) @IsOptional() @IsIn(PROCEDURES, { message: `procedure must be one of ${PROCEDURES.join(', ')}` }) procedure?: Procedure;

  @ApiPropertyOptional() @IsOptional() @ValidateIf((_, v) => v !== null) @IsInt({ message: 'canals must be a whole number' }) @Min(1) @Max(8) canals?: number | null;

  @ApiPropertyOptional() @IsOptional() @IsObject({ message: 'assessment must be an object of factor → level' }) assessment?: Partial<Record<FactorKey, Level>>;

  @ApiPropertyOptional() @IsOptional() @IsObject({ message: 'facts must be an object' }) facts?: EstimateFacts;

  @ApiPropertyOptional() @IsOptional() @ValidateIf((_, v) => v !== null) @IsInt() @Min(1) operatorId?: number | null;

  @ApiPropertyOptional({ type: CaseOverrideDto, nullable: true })
  @IsOptional() @ValidateIf((_, v) => v !== null) @ValidateNested() @Type(() => CaseOverrideDto) override?: CaseOverrideDto | null;

  @ApiPropertyOptional() @IsOptional() @IsBoolean({ message: 'markPlanned must be true or false' }) markPlanned?: boolean;
}
