import { Controller, Delete, Get, HttpCode, NotFoundException, Param, ParseIntPipe, Post, Res } from '@nestjs/common';
import { ApiBearerAuth, ApiOperation, ApiTags } from '@nestjs/swagger';
import type { FeedTokenResponse } from '@ostium/shared';
import type { Response } from 'express';
import type { RequestUser } from '../common/context/request-context.js';
import { Allow, CurrentUser, Public } from '../common/decorators/auth.decorators.js';
import { FeedsService } from './feeds.service.js';

@ApiTags('scheduling')
@Controller()
export class FeedsController {
  constructor(private readonly feeds: FeedsService) {}

  @Post('operators/:id/feed-token')
  @Allow('feeds')
  @ApiBearerAuth()
  @ApiOperation({ summary: 'A new private iCalendar address for the operator (themself or an administrator); the old one stops working' })
  issue(@CurrentUser() u: RequestUser, @Param('id', ParseIntPipe) id: number): Promise<FeedTokenResponse> {
    return this.feeds.issue(u, id);
  }

  @Delete('operators/:id/feed-token')
  @Allow('feeds')
  @ApiBearerAuth()
  @HttpCode(204)
  @ApiOperation({ summary: 'Revoke the operator’s feed address' })
  revoke(@CurrentUser() u: RequestUser, @Param('id', ParseIntPipe) id: number): Promise<void> {
    return this.feeds.revoke(u, id);
  }

  @Get('feeds/:file')
  @Public()
  @ApiOperation({ summary: 'The operator’s schedule as text/calendar (RFC 5545); the token is the credential' })
  async feed(@Param('file') file: string, @Res() res: Response) {
    const token = file.endsWith('.ics') ? file.slice(0, -4) : file;
    const text = await this.feeds.feed(token);
    if (text === null) throw new NotFoundException('No such feed');
    res.setHeader('Content-Type', 'text/calendar; charset=utf-8');
    res.setHeader('Cache-Control', 'private, max-age=300');
    res.send(text);
  }
}
