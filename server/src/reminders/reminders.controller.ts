import { Body, Controller, Get, HttpCode, Post, Put } from '@nestjs/common';
import { ApiBearerAuth, ApiOperation, ApiTags } from '@nestjs/swagger';
import type { RequestUser } from '../common/context/request-context.js';
import { Allow, CurrentUser } from '../common/decorators/auth.decorators.js';
import { SaveReminderSettingsDto, TemplatePreviewDto } from './dto/reminder-settings.dto.js';
import { ReminderSettingsService } from './reminder-settings.service.js';

@ApiTags('reminders')
@ApiBearerAuth()
@Controller('settings/reminders')
export class RemindersController {
  constructor(private readonly settings: ReminderSettingsService) {}

  @Get()
  @Allow('reminderSettings')
  @ApiOperation({ summary: 'Reminder rules, templates, quiet hours and caps, with the version to save over' })
  get(@CurrentUser() user: RequestUser) {
    return this.settings.get(user.practiceId);
  }

  @Put()
  @Allow('reminderSettings')
  @ApiOperation({ summary: 'Save the reminder settings (409 when someone saved since they were read)' })
  save(@CurrentUser() user: RequestUser, @Body() dto: SaveReminderSettingsDto) {
    return this.settings.save(user.practiceId, user, dto);
  }

  @Post('preview')
  @HttpCode(200)
  @Allow('reminderSettings')
  @ApiOperation({ summary: 'A template filled with the practice’s names and next visit, with its length by encoding' })
  preview(@CurrentUser() user: RequestUser, @Body() dto: TemplatePreviewDto) {
    return this.settings.preview(user.practiceId, dto);
  }
}
