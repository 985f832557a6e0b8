import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import type { CompleteCaseRequest } from '@ostium/shared';
import { ArrayMaxSize, ArrayUnique, IsArray, IsBoolean, IsInt, IsOptional, IsString, Matches, Max, MaxLength, Min } from 'class-validator';

export class CompleteCaseDto implements CompleteCaseRequest {
  @ApiProperty({ maxLength: 4000, description: 'The endodontist’s findings for the referring dentist' })
  @IsString({ message: 'findings must be text' })
  @Matches(/\S/, { message: 'findings is required: write what the referring dentist should know' })
  @MaxLength(4000, { message: 'findings must be at most 4000 characters' })
  findings: string;

  @ApiPropertyOptional({ type: [Number], description: 'Recall reviews, months after treatment ended (default: the case estimate’s)' })
  @IsOptional()
  @IsArray({ message: 'recallPlan must be a list of months' })
  @ArrayMaxSize(6, { message: 'recallPlan holds at most 6 reviews' })
  @ArrayUnique({ message: 'recallPlan lists a month twice' })
  @IsInt({ each: true, message: 'recallPlan must hold whole months' })
  @Min(1, { each: true, message: 'recallPlan: each review at least 1 month after treatment' })
  @Max(120, { each: true, message: 'recallPlan: each review at most 120 months after treatment' })
  recallPlan?: number[];

  @ApiPropertyOptional({ default: true }) @IsOptional() @IsBoolean({ message: 'sendReport must be true or false' }) sendReport?: boolean;
}
