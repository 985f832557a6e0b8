import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { MESSAGE_CHANNELS, type DeskReplyRequest, type MessageChannel, type PublicVisitAction } from '@ostium/shared';
import { Transform } from 'class-transformer';
import { IsIn, IsNotEmpty, IsOptional, IsString, MaxLength } from 'class-validator';
import { trim } from '../../patients/dto/field-validators.util.js';

export const THREAD_FILTERS = ['all', 'unread', 'tasks', 'failed'] as const;
export const TASK_STATUSES = ['open', 'done'] as const;

export class ThreadsQueryDto {
  @ApiPropertyOptional({ enum: THREAD_FILTERS, description: 'default all' })
  @IsOptional() @IsIn(THREAD_FILTERS, { message: `filter must be one of ${THREAD_FILTERS.join(', ')}` }) filter?: (typeof THREAD_FILTERS)[number];
}

export class TasksQueryDto {
  @ApiPropertyOptional({ enum: TASK_STATUSES, description: 'default: both' })
  @IsOptional() @IsIn(TASK_STATUSES, { message: `status must be one of ${TASK_STATUSES.join(', ')}` }) status?: (typeof TASK_STATUSES)[number];
}

export class UpdateTaskDto {
  @ApiProperty({ enum: TASK_STATUSES }) @IsIn(TASK_STATUSES, { message: `status must be one of ${TASK_STATUSES.join(', ')}` }) status: (typeof TASK_STATUSES)[number];
}

export class DeskReplyDto implements DeskReplyRequest {
  @ApiProperty({ enum: MESSAGE_CHANNELS }) @IsIn(MESSAGE_CHANNELS, { message: `channel must be one of ${MESSAGE_CHANNELS.join(', ')}` }) channel: MessageChannel;

  @ApiPropertyOptional({ description: 'e-mail only; default "A message from <practice>"' })
  @IsOptional() @Transform(trim) @IsString({ message: 'subject must be text' }) @MaxLength(200, { message: 'subject must be at most 200 characters' }) subject?: string;

  @ApiProperty({ description: 'a text must fit one segment (160 GSM-7 / 70 UCS-2) with the opt-out hint added' })
  @Transform(trim) @IsString({ message: 'body must be text' }) @IsNotEmpty({ message: 'body must not be empty' }) @MaxLength(5000, { message: 'body must be at most 5000 characters' }) body: string;
}

export const VISIT_ACTIONS = ['confirm', 'reschedule'] as const;

export class PublicVisitActionDto implements PublicVisitAction {
  @ApiProperty({ enum: VISIT_ACTIONS }) @IsIn(VISIT_ACTIONS, { message: `action must be one of ${VISIT_ACTIONS.join(', ')}` }) action: PublicVisitAction['action'];
}
