import { Body, Controller, Get, Param, ParseIntPipe, Patch } from '@nestjs/common';
import { ApiBearerAuth, ApiOperation, ApiTags } from '@nestjs/swagger';
import { Allow, CurrentUser } from '../common/decorators/auth.decorators.js';
import type { RequestUser } from '../common/context/request-context.js';
import { CaseSheetsService } from './case-sheets.service.js';
import { UpdateCaseSheetDto } from './dto/update-case-sheet.dto.js';

@ApiTags('cases')
@ApiBearerAuth()
@Controller('cases')
export class CaseSheetsController {
  constructor(private readonly sheets: CaseSheetsService) {}

  @Get(':id')
  @Allow('cases')
  @ApiOperation({ summary: 'The case sheet: assessment, stored estimate with its table version, override, history' })
  get(@CurrentUser() user: RequestUser, @Param('id', ParseIntPipe) id: number) {
    return this.sheets.get(user.practiceId, id);
  }

  @Patch(':id')
  @Allow('cases')
  @ApiOperation({ summary: 'Save the assessment (the estimate is recomputed and stored); endodontists may override minutes with a reason' })
  update(@CurrentUser() user: RequestUser, @Param('id', ParseIntPipe) id: number, @Body() dto: UpdateCaseSheetDto) {
    return this.sheets.update(user, id, dto);
  }
}
