import { Body, Controller, Delete, Get, HttpCode, Param, ParseIntPipe, Post, Req, Res, StreamableFile, UseInterceptors } from '@nestjs/common';
import { ApiBearerAuth, ApiBody, ApiConsumes, ApiOperation, ApiTags } from '@nestjs/swagger';
import type { Request, Response } from 'express';
import { Allow, CurrentUser } from '../common/decorators/auth.decorators.js';
import type { RequestUser } from '../common/context/request-context.js';
import { AttachmentsService } from './attachments.service.js';
import { UploadAttachmentDto } from './dto/upload-attachment.dto.js';
import { contentDisposition } from './file-check.util.js';
import { UploadInterceptor } from './upload.interceptor.js';

@ApiTags('attachments')
@ApiBearerAuth()
@Controller('attachments')
export class AttachmentsController {
  constructor(private readonly attachments: AttachmentsService) {}

  @Post()
  @Allow('referralsWrite')
  @UseInterceptors(UploadInterceptor)
  @ApiOperation({ summary: 'Upload a radiograph (JPEG, PNG) or letter (PDF), at most 20 MB; checked by content: 415 otherwise, 413 when too large' })
  @ApiConsumes('multipart/form-data')
  @ApiBody({
    schema: {
      type: 'object',
      required: ['file'],
      properties: {
        file: { type: 'string', format: 'binary' },
        referralId: { type: 'integer' },
        kind: { type: 'string', enum: ['radiograph', 'letter'] },
      },
    },
  })
  upload(@CurrentUser() user: RequestUser, @Req() req: Request, @Body() dto: UploadAttachmentDto) {
    return this.attachments.upload(user.practiceId, user.id, req.file, dto);
  }

  @Get(':id/content')
  @Allow('referralsRead')
  @ApiOperation({ summary: 'The stored file, with its detected type (inline)' })
  async content(@CurrentUser() user: RequestUser, @Param('id', ParseIntPipe) id: number, @Res({ passthrough: true }) res: Response) {
    const { attachment, stream, size } = await this.attachments.open(user.practiceId, id);
    res.setHeader('X-Content-Type-Options', 'nosniff');
    res.setHeader('Cache-Control', 'private, no-cache');
    return new StreamableFile(stream, { type: attachment.mimeType, disposition: contentDisposition('inline', attachment.originalName), length: size });
  }

  @Delete(':id')
  @HttpCode(204)
  @Allow('referralsWrite')
  @ApiOperation({ summary: 'Delete an upload that is not on a referral yet' })
  async remove(@CurrentUser() user: RequestUser, @Param('id', ParseIntPipe) id: number) {
    await this.attachments.removeUnlinked(user.practiceId, id);
  }
}
