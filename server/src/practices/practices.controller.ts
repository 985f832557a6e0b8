import { Body, Controller, Get, Patch } from '@nestjs/common';
import { ApiBearerAuth, ApiOperation, ApiTags } from '@nestjs/swagger';
import { Allow, AnyRole, CurrentUser } from '../common/decorators/auth.decorators.js';
import type { RequestUser } from '../common/context/request-context.js';
import { UpdatePracticeSettingsDto } from './dto/practice-settings.dto.js';
import { PracticesService } from './practices.service.js';

@ApiTags('practice')
@ApiBearerAuth()
@Controller()
export class PracticesController {
  constructor(private readonly practices: PracticesService) {}

  @Get('practice')
  @AnyRole()
  @ApiOperation({ summary: 'The practice and its settings (tooth notation, booking grid)' })
  get(@CurrentUser() user: RequestUser) {
    return this.practices.get(user.practiceId);
  }

  @Patch('practice/settings')
  @Allow('settings')
  @ApiOperation({ summary: 'Change practice settings' })
  updateSettings(@CurrentUser() user: RequestUser, @Body() dto: UpdatePracticeSettingsDto) {
    return this.practices.updateSettings(user.practiceId, dto);
  }

  @Get('locations')
  @AnyRole()
  @ApiOperation({ summary: 'Locations with their chairs and microscopes' })
  locations(@CurrentUser() user: RequestUser) {
    return this.practices.listLocations(user.practiceId);
  }
}
