import { Body, Controller, Get, HttpCode, Param, ParseIntPipe, Patch, Post, Query } from '@nestjs/common';
import { ApiBearerAuth, ApiConflictResponse, ApiOperation, ApiParam, ApiTags } from '@nestjs/swagger';
import type { DeskTask, OutboxMessage, ReplyThread, ReplyThreadSummary } from '@ostium/shared';
import type { RequestUser } from '../common/context/request-context.js';
import { Allow, CurrentUser } from '../common/decorators/auth.decorators.js';
import { DeskTasksService } from './desk-tasks.service.js';
import { DeskReplyDto, TasksQueryDto, ThreadsQueryDto, UpdateTaskDto } from './dto/replies.dto.js';
import { parseThreadKey, ThreadsService } from './threads.service.js';

const THREAD_PARAM = { name: 'patientId', description: 'a patient id, or unmatched:<E.164 number> for a sender no patient gave' };

@ApiTags('replies')
@ApiBearerAuth()
@Controller('replies')
export class RepliesController {
  constructor(
    private readonly threads: ThreadsService,
    private readonly tasks: DeskTasksService,
  ) {}

  @Get('threads')
  @Allow('replies')
  @ApiOperation({ summary: 'One thread per patient (and per unknown sender): unread first, then the latest' })
  list(@CurrentUser() u: RequestUser, @Query() q: ThreadsQueryDto): Promise<ReplyThreadSummary[]> {
    return this.threads.list(u.practiceId, q.filter ?? 'all');
  }

  @Get('threads/:patientId')
  @Allow('replies')
  @ApiParam(THREAD_PARAM)
  @ApiOperation({ summary: 'Everything sent to and received from the patient, in time order, with delivery states, tasks and the next visit' })
  get(@CurrentUser() u: RequestUser, @Param('patientId') key: string): Promise<ReplyThread> {
    return this.threads.get(u.practiceId, parseThreadKey(key));
  }

  @Post('threads/:patientId/read')
  @Allow('replies')
  @HttpCode(204)
  @ApiParam(THREAD_PARAM)
  @ApiOperation({ summary: 'Mark the thread’s incoming texts read' })
  async read(@CurrentUser() u: RequestUser, @Param('patientId') key: string): Promise<void> {
    await this.threads.markRead(u.practiceId, parseThreadKey(key), u.id);
  }

  @Post('threads/:patientId/messages')
  @Allow('replies')
  @ApiParam(THREAD_PARAM)
  @ApiOperation({ summary: 'Queue a reply from the desk (a text needs consent and fits one segment with the opt-out hint; an e-mail needs an address)' })
  @ApiConflictResponse({ description: 'no consent to text, or no number / e-mail address on file' })
  send(@CurrentUser() u: RequestUser, @Param('patientId') key: string, @Body() dto: DeskReplyDto): Promise<OutboxMessage> {
    return this.threads.reply(u.practiceId, parseThreadKey(key), dto, u.id);
  }

  @Get('tasks')
  @Allow('replies')
  @ApiOperation({ summary: 'Front-desk tasks (reschedule requests, failed deliveries, unknown senders), open first' })
  listTasks(@CurrentUser() u: RequestUser, @Query() q: TasksQueryDto): Promise<DeskTask[]> {
    return this.tasks.list(u.practiceId, q.status);
  }

  @Patch('tasks/:id')
  @Allow('replies')
  @ApiOperation({ summary: 'Mark a task done (or open again)' })
  updateTask(@CurrentUser() u: RequestUser, @Param('id', ParseIntPipe) id: number, @Body() dto: UpdateTaskDto): Promise<DeskTask> {
    return this.tasks.setStatus(u.practiceId, id, dto.status, u.id);
  }
}
