import { Body, Controller, Get, Headers, Param, ParseIntPipe, Patch, Post, Query, Res } from '@nestjs/common';
import { ApiBearerAuth, ApiConflictResponse, ApiHeader, ApiOperation, ApiTags } from '@nestjs/swagger';
import type { Appointment, BookAppointmentsResponse } from '@ostium/shared';
import type { Response } from 'express';
import type { RequestUser } from '../common/context/request-context.js';
import { Allow, CurrentUser } from '../common/decorators/auth.decorators.js';
import { AppointmentsService } from './appointments.service.js';
import { AppointmentQueryDto, BookAppointmentsDto, UpdateAppointmentDto } from './dto/appointments.dto.js';

@ApiTags('scheduling')
@ApiBearerAuth()
@Controller('appointments')
export class AppointmentsController {
  constructor(private readonly appointments: AppointmentsService) {}

  @Post()
  @Allow('schedule')
  @ApiHeader({ name: 'Idempotency-Key', required: false, description: 'a retry with the same key returns the same booking' })
  @ApiOperation({ summary: 'Book a whole proposal (one or more visits), all or nothing' })
  @ApiConflictResponse({ description: 'BookingConflictBody: {statusCode: 409, message, conflicts: BookingConflict[]} listing every colliding visit' })
  async book(
    @CurrentUser() u: RequestUser,
    @Body() dto: BookAppointmentsDto,
    @Headers('idempotency-key') key: string | undefined,
    @Res({ passthrough: true }) res: Response,
  ): Promise<BookAppointmentsResponse> {
    const { replayed, body } = await this.appointments.book(u.practiceId, { id: u.id, name: u.name }, dto, key);
    // A replay answers like the first call (201, same body) and says so in a header.
    if (replayed) res.setHeader('Idempotent-Replayed', 'true');
    return body;
  }

  @Get()
  @Allow('schedule')
  @ApiOperation({ summary: 'Appointments overlapping [from, to) for the board, optionally one location, chair or operator' })
  list(@CurrentUser() u: RequestUser, @Query() q: AppointmentQueryDto): Promise<Appointment[]> {
    return this.appointments.list(u.practiceId, q);
  }

  @Get(':id')
  @Allow('schedule')
  get(@CurrentUser() u: RequestUser, @Param('id', ParseIntPipe) id: number): Promise<Appointment> {
    return this.appointments.get(u.practiceId, id);
  }

  @Patch(':id')
  @Allow('schedule')
  @ApiOperation({ summary: 'Move, resize, change chair/operator/microscope or state, with the version read' })
  @ApiConflictResponse({ description: 'BookingConflictBody; `conflicts` is empty when the version is stale' })
  update(@CurrentUser() u: RequestUser, @Param('id', ParseIntPipe) id: number, @Body() dto: UpdateAppointmentDto): Promise<Appointment> {
    return this.appointments.update(u.practiceId, { id: u.id, name: u.name }, id, dto);
  }
}
