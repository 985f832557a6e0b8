import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { PROCEDURES, type EstimateFacts, type EstimateRequest, type FactorKey, type Level, type Procedure } from '@ostium/shared';
import { IsIn, IsInt, IsObject, IsOptional, IsString, Max, MaxLength, Min } from 'class-validator';

export class EstimateRequestDto implements EstimateRequest {
  @ApiProperty({ example: '36', description: 'tooth number in `notation` (default FDI)' })
  @IsString({ message: 'tooth must be a string such as "36" or "19"' }) @MaxLength(4) tooth: string;

  @ApiPropertyOptional({ enum: ['fdi', 'universal'] })
  @IsOptional() @IsIn(['fdi', 'universal'], { message: 'notation must be fdi or universal' }) notation?: 'fdi' | 'universal';

  @ApiProperty({ enum: PROCEDURES })
  @IsIn(PROCEDURES, { message: `procedure must be one of ${PROCEDURES.join(', ')}` }) procedure: Procedure;

  @ApiPropertyOptional({ minimum: 1, maximum: 8 })
  @IsOptional() @IsInt({ message: 'canals must be a whole number' }) @Min(1, { message: 'canals must be at least 1' }) @Max(8, { message: 'canals must be at most 8' }) canals?: number;

  @ApiPropertyOptional({ description: 'factor key → low | moderate | high (see GET /api/estimates/factors)' })
  @IsOptional() @IsObject({ message: 'assessment must be an object of factor → level' }) assessment?: Partial<Record<FactorKey, Level>>;

  @ApiPropertyOptional({ description: 'curvatureDegrees, apicalOpeningMm, toothLengthMm, …' })
  @IsOptional() @IsObject({ message: 'facts must be an object' }) facts?: EstimateFacts;

  @ApiPropertyOptional() @IsOptional() @IsInt() @Min(1) operatorId?: number;
}
