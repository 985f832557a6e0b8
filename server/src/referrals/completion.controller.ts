import { Body, Controller, Get, Param, ParseIntPipe, Post } from '@nestjs/common';
import { ApiBearerAuth, ApiConflictResponse, ApiOperation, ApiTags } from '@nestjs/swagger';
import { Allow, CurrentUser } from '../common/decorators/auth.decorators.js';
import type { RequestUser } from '../common/context/request-context.js';
import { CompletionService } from './completion.service.js';
import { CompleteCaseDto } from './dto/complete-case.dto.js';

@ApiTags('cases')
@ApiBearerAuth()
@Controller('cases')
export class CompletionController {
  constructor(private readonly completion: CompletionService) {}

  @Get(':id/completion')
  @Allow('cases')
  @ApiOperation({ summary: 'CaseCompletionView: the dismissed visits, what still keeps the case open, the saved findings and recall plan, the report letter’s state' })
  get(@CurrentUser() user: RequestUser, @Param('id', ParseIntPipe) id: number) {
    return this.completion.view(user.practiceId, id);
  }

  @Post(':id/completion')
  @Allow('completionReport')
  @ApiOperation({ summary: 'Complete the case (findings, recall plan) once its visits are done; the referral follows; the completion report is queued to the referring dentist' })
  @ApiConflictResponse({ description: 'A visit is still booked or in progress, none is dismissed, the case is closed, or its report already went' })
  complete(@CurrentUser() user: RequestUser, @Param('id', ParseIntPipe) id: number, @Body() dto: CompleteCaseDto) {
    return this.completion.complete(user, id, dto);
  }
}
