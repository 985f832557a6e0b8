import { Body, Controller, Get, Param, ParseIntPipe, Patch, Post, Query } from '@nestjs/common';
import { ApiBearerAuth, ApiOperation, ApiQuery, ApiTags } from '@nestjs/swagger';
import { ROLES, type Role } from '@ostium/shared';
import { BadRequestException } from '@nestjs/common';
import { Allow, CurrentUser, Roles } from '../common/decorators/auth.decorators.js';
import type { RequestUser } from '../common/context/request-context.js';
import { CreateUserDto, UpdateUserDto } from './dto/user.dto.js';
import { UsersService } from './users.service.js';

@ApiTags('users')
@ApiBearerAuth()
@Controller('users')
export class UsersController {
  constructor(private readonly users: UsersService) {}

  @Get()
  @Roles('admin', 'manager', 'frontdesk', 'endodontist')
  @ApiOperation({ summary: 'Users of the practice (filter by role, e.g. endodontist)' })
  @ApiQuery({ name: 'role', required: false, enum: ROLES })
  list(@CurrentUser() user: RequestUser, @Query('role') role?: string) {
    if (role !== undefined && !(ROLES as readonly string[]).includes(role)) {
      throw new BadRequestException({ message: `role must be one of ${ROLES.join(', ')}`, errors: [{ field: 'role', message: 'unknown role' }] });
    }
    return this.users.list(user.practiceId, role as Role | undefined);
  }

  @Post()
  @Allow('users')
  @ApiOperation({ summary: 'Create a user with a role' })
  create(@CurrentUser() user: RequestUser, @Body() dto: CreateUserDto) {
    return this.users.create(user.practiceId, dto);
  }

  @Patch(':id')
  @Allow('users')
  @ApiOperation({ summary: 'Change a user’s name, role, password or active flag' })
  update(@CurrentUser() user: RequestUser, @Param('id', ParseIntPipe) id: number, @Body() dto: UpdateUserDto) {
    return this.users.update(user.practiceId, user.id, id, dto);
  }
}
