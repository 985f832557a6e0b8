import { Body, Controller, Delete, Get, HttpCode, Param, ParseIntPipe, Patch, Post, Query } from '@nestjs/common';
import { ApiBearerAuth, ApiOperation, ApiTags } from '@nestjs/swagger';
import { Allow, CurrentUser } from '../common/decorators/auth.decorators.js';
import type { RequestUser } from '../common/context/request-context.js';
import { SearchQueryDto } from '../patients/dto/patient.dto.js';
import { CreateReferringDentistDto, MergeReferringDentistsDto, UpdateReferringDentistDto } from './dto/referring-dentist.dto.js';
import { ReferringDentistsService } from './referring-dentists.service.js';

@ApiTags('referring dentists')
@ApiBearerAuth()
@Controller('referring-dentists')
export class ReferringDentistsController {
  constructor(private readonly dentists: ReferringDentistsService) {}

  @Get()
  @Allow('referralsRead')
  @ApiOperation({ summary: 'Search referring dentists by name, practice, e-mail or phone (ReferringDentist[], at most `limit`)' })
  search(@CurrentUser() user: RequestUser, @Query() q: SearchQueryDto) {
    return this.dentists.search(user.practiceId, q.q, q.limit);
  }

  @Get(':id')
  @Allow('referralsRead')
  @ApiOperation({ summary: 'One referring dentist with the number of referrals' })
  get(@CurrentUser() user: RequestUser, @Param('id', ParseIntPipe) id: number) {
    return this.dentists.get(user.practiceId, id);
  }

  @Post()
  @Allow('referralsWrite')
  @ApiOperation({ summary: 'Add a referring dentist' })
  create(@CurrentUser() user: RequestUser, @Body() dto: CreateReferringDentistDto) {
    return this.dentists.create(user.practiceId, dto);
  }

  @Patch(':id')
  @Allow('referralsWrite')
  @ApiOperation({ summary: 'Change a referring dentist' })
  update(@CurrentUser() user: RequestUser, @Param('id', ParseIntPipe) id: number, @Body() dto: UpdateReferringDentistDto) {
    return this.dentists.update(user.practiceId, id, dto);
  }

  @Delete(':id')
  @HttpCode(204)
  @Allow('referralsWrite')
  @ApiOperation({ summary: 'Delete a referring dentist without referrals (merge duplicates instead)' })
  async remove(@CurrentUser() user: RequestUser, @Param('id', ParseIntPipe) id: number) {
    await this.dentists.remove(user.practiceId, id);
  }

  @Post(':id/merge')
  @HttpCode(200)
  @Allow('referralsWrite')
  @ApiOperation({ summary: 'Merge a duplicate into this record: its referrals move here and it is deleted' })
  merge(@CurrentUser() user: RequestUser, @Param('id', ParseIntPipe) id: number, @Body() dto: MergeReferringDentistsDto) {
    return this.dentists.merge(user.practiceId, id, dto.otherId);
  }
}
