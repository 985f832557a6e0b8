import { BadRequestException, Body, Controller, Get, HttpCode, Post, Put, Query, UploadedFile, UseInterceptors } from '@nestjs/common';
import { FileInterceptor } from '@nestjs/platform-express';
import { ApiBearerAuth, ApiBody, ApiConsumes, ApiOperation, ApiTags } from '@nestjs/swagger';
import { Allow, CurrentUser } from '../common/decorators/auth.decorators.js';
import type { RequestUser } from '../common/context/request-context.js';
import { EstimateRequestDto } from './dto/estimate-request.dto.js';
import { EstimatesService } from './estimates.service.js';

@ApiTags('estimates')
@ApiBearerAuth()
@Controller()
export class EstimatesController {
  constructor(private readonly estimates: EstimatesService) {}

  @Get('estimates/factors')
  @Allow('estimates')
  @ApiOperation({ summary: 'The difficulty factors: keys, labels, groups and what each level means' })
  async factors(@CurrentUser() user: RequestUser) {
    return this.estimates.factors(await this.estimates.currentTable(user.practiceId));
  }

  @Post('estimates')
  @HttpCode(200)
  @Allow('estimates')
  @ApiOperation({ summary: 'Preview a difficulty level and chair-time estimate for one tooth (stores nothing)' })
  preview(@CurrentUser() user: RequestUser, @Body() dto: EstimateRequestDto) {
    return this.estimates.preview(user.practiceId, dto);
  }

  @Get('estimates/accuracy')
  @Allow('estimateAccuracy')
  @ApiOperation({ summary: 'Estimated vs actual per cell (procedure × tooth group × level), before and after calibration' })
  accuracy(@CurrentUser() user: RequestUser) {
    return this.estimates.accuracy(user.practiceId);
  }

  @Get('settings/estimate-table')
  @Allow('settings')
  @ApiOperation({ summary: 'The current estimate table and its version history' })
  table(@CurrentUser() user: RequestUser) {
    return this.estimates.tableInfo(user.practiceId);
  }

  @Put('settings/estimate-table')
  @Allow('settings')
  @ApiOperation({ summary: 'Save the estimate table as a new version' })
  @ApiBody({ description: 'the whole table (as returned in `table` by GET)' })
  saveTable(@CurrentUser() user: RequestUser, @Body() body: unknown) {
    return this.estimates.saveTable(user.practiceId, user.id, body);
  }

  @Post('visit-history/import')
  @Allow('visitHistoryImport')
  @ApiOperation({ summary: 'Import past visits (CSV: date, tooth, procedure, canals, level, operator_email, actual_minutes)' })
  @ApiConsumes('multipart/form-data')
  @UseInterceptors(FileInterceptor('file', { limits: { fileSize: 5 * 1024 * 1024 } }))
  importHistory(@CurrentUser() user: RequestUser, @UploadedFile() file: Express.Multer.File | undefined, @Query('notation') notation?: string) {
    if (!file) throw new BadRequestException({ message: 'Attach the CSV file as the form field "file"', errors: [{ field: 'file', message: 'missing' }] });
    if (notation !== undefined && notation !== 'fdi' && notation !== 'universal') {
      throw new BadRequestException({ message: 'notation must be fdi or universal', errors: [{ field: 'notation', message: 'fdi or universal' }] });
    }
    return this.estimates.importHistory(user.practiceId, file.buffer.toString('utf8'), notation as 'fdi' | 'universal' | undefined);
  }
}
