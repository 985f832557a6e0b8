import { Controller, Get, HttpCode, Param, ParseIntPipe, Post, Query } from '@nestjs/common';
import { ApiBearerAuth, ApiOperation, ApiTags } from '@nestjs/swagger';
import type { OutboxMessage } from '@ostium/shared';
import type { RequestUser } from '../common/context/request-context.js';
import { Allow, CurrentUser } from '../common/decorators/auth.decorators.js';
import { OutboxQueryDto } from './dto/outbox-query.dto.js';
import { MessagingClock } from './messaging-clock.service.js';
import { OutboxService } from './outbox.service.js';

@ApiTags('messaging')
@ApiBearerAuth()
@Controller('outbox')
export class OutboxController {
  constructor(
    private readonly outbox: OutboxService,
    private readonly clock: MessagingClock,
  ) {}

  @Get()
  @Allow('replies')
  @ApiOperation({ summary: 'Queued and sent messages, newest due first (at most 500), by status, patient or appointment' })
  list(@CurrentUser() u: RequestUser, @Query() q: OutboxQueryDto): Promise<OutboxMessage[]> {
    return this.outbox.list(u.practiceId, q);
  }

  @Post(':id/retry')
  @HttpCode(200)
  @Allow('replies')
  @ApiOperation({ summary: 'Send a failed message again: back to pending now, attempts counted afresh' })
  retry(@CurrentUser() u: RequestUser, @Param('id', ParseIntPipe) id: number): Promise<OutboxMessage> {
    return this.outbox.retry(u.practiceId, id, this.clock.now());
  }
}
