import { ApiPropertyOptional } from '@nestjs/swagger';
import type { AttachmentSummary } from '@ostium/shared';
import { Type } from 'class-transformer';
import { IsIn, IsInt, IsOptional, Min } from 'class-validator';

const KINDS = ['radiograph', 'letter'] as const;

/** The text fields beside the `file` part of POST /api/attachments. */
export class UploadAttachmentDto {
  @ApiPropertyOptional({ description: 'link at once to this referral; otherwise linked when the referral is saved' })
  @IsOptional() @Type(() => Number) @IsInt({ message: 'referralId must be a whole number' }) @Min(1, { message: 'referralId must be a whole number' }) referralId?: number;

  @ApiPropertyOptional({ enum: KINDS, description: 'default: radiograph for images, letter for PDFs' })
  @IsOptional() @IsIn(KINDS, { message: `kind must be one of ${KINDS.join(', ')}` }) kind?: AttachmentSummary['kind'];
}
