import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { MESSAGE_CHANNELS, type MessageChannel, type ReminderSettings, type TemplatePreviewRequest } from '@ostium/shared';
import { IsIn, IsInt, IsObject, IsOptional, IsString, MaxLength, Min, MinLength } from 'class-validator';

/** PUT /api/settings/reminders: the whole settings object over the version that was read. */
export class SaveReminderSettingsDto {
  // Checked field by field by reminderSettingsProblems (errors like `rules.1.hoursBefore`).
  @ApiProperty({ description: 'the whole ReminderSettings object, as returned by GET' })
  @IsObject()
  settings: ReminderSettings;

  @ApiProperty({ example: 1, description: 'the version the settings were read at' })
  @IsInt()
  @Min(1)
  version: number;
}

export class TemplatePreviewDto implements TemplatePreviewRequest {
  @ApiProperty({ enum: MESSAGE_CHANNELS })
  @IsIn(MESSAGE_CHANNELS)
  channel: MessageChannel;

  @ApiPropertyOptional({ nullable: true, description: 'e-mail only' })
  @IsOptional()
  @IsString()
  @MaxLength(200)
  subject?: string | null;

  @ApiProperty({ example: '{practice}: visit {date} at {time}, {location}. {confirmHint}. {optOut}' })
  @IsString()
  @MinLength(1)
  @MaxLength(5000)
  body: string;
}
