import { Controller, Get, Param, ParseIntPipe, Res, StreamableFile } from '@nestjs/common';
import { ApiBearerAuth, ApiOperation, ApiProduces, ApiTags } from '@nestjs/swagger';
import type { Response } from 'express';
import { contentDisposition } from '../attachments/file-check.util.js';
import { Allow, CurrentUser } from '../common/decorators/auth.decorators.js';
import type { RequestUser } from '../common/context/request-context.js';
import { CompletionService } from './completion.service.js';

@ApiTags('referrals')
@ApiBearerAuth()
@Controller('letters')
export class LettersController {
  constructor(private readonly completion: CompletionService) {}

  @Get(':id/pdf')
  @Allow('referralsRead')
  @ApiProduces('application/pdf')
  @ApiOperation({ summary: 'The completion report’s PDF as it was sent (or, while queued, as it would go now), inline' })
  async pdf(@CurrentUser() user: RequestUser, @Param('id', ParseIntPipe) id: number, @Res({ passthrough: true }) res: Response) {
    const { fileName, content } = await this.completion.letterPdf(user.practiceId, id);
    res.setHeader('X-Content-Type-Options', 'nosniff');
    res.setHeader('Cache-Control', 'private, no-cache');
    return new StreamableFile(content, { type: 'application/pdf', disposition: contentDisposition('inline', fileName), length: content.length });
  }
}
