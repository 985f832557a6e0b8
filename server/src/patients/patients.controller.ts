import { Body, Controller, Delete, Get, HttpCode, Param, ParseIntPipe, Patch, Post, Query, UseFilters } from '@nestjs/common';
import { ApiBearerAuth, ApiConflictResponse, ApiOperation, ApiTags } from '@nestjs/swagger';
import { Allow, CurrentUser } from '../common/decorators/auth.decorators.js';
import type { RequestUser } from '../common/context/request-context.js';
import { DuplicatePatientFilter } from './duplicate-patient.exception.js';
import { CreatePatientDto, SearchQueryDto, UpdatePatientDto } from './dto/patient.dto.js';
import { PatientsService } from './patients.service.js';

@ApiTags('patients')
@ApiBearerAuth()
@Controller('patients')
@UseFilters(DuplicatePatientFilter)
export class PatientsController {
  constructor(private readonly patients: PatientsService) {}

  @Get()
  @Allow('referralsRead')
  @ApiOperation({ summary: 'Search patients by name, e-mail or phone (Patient[], at most `limit`)' })
  search(@CurrentUser() user: RequestUser, @Query() q: SearchQueryDto) {
    return this.patients.search(user.practiceId, q.q, q.limit);
  }

  @Get(':id')
  @Allow('referralsRead')
  @ApiOperation({ summary: 'One patient' })
  get(@CurrentUser() user: RequestUser, @Param('id', ParseIntPipe) id: number) {
    return this.patients.get(user.practiceId, id);
  }

  @Post()
  @Allow('referralsWrite')
  @ApiOperation({ summary: 'Create a patient; 409 with the existing records when name and date of birth match (repeat with confirmNew)' })
  @ApiConflictResponse({ description: 'DuplicatePatientBody: {statusCode: 409, message, existing: Patient[]}' })
  create(@CurrentUser() user: RequestUser, @Body() dto: CreatePatientDto) {
    return this.patients.create(user.practiceId, dto);
  }

  @Patch(':id')
  @Allow('referralsWrite')
  @ApiOperation({ summary: 'Change a patient; SMS consent records the server time when given' })
  update(@CurrentUser() user: RequestUser, @Param('id', ParseIntPipe) id: number, @Body() dto: UpdatePatientDto) {
    return this.patients.update(user.practiceId, id, dto);
  }

  @Delete(':id')
  @HttpCode(204)
  @Allow('referralsWrite')
  @ApiOperation({ summary: 'Delete a patient without referrals' })
  async remove(@CurrentUser() user: RequestUser, @Param('id', ParseIntPipe) id: number) {
    await this.patients.remove(user.practiceId, id);
  }
}
