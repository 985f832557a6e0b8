import { BadRequestException, ConflictException, Injectable, NotFoundException } from '@nestjs/common';
import { InjectModel } from '@nestjs/sequelize';
import type { Role, UserSummary } from '@ostium/shared';
import argon2 from 'argon2';
import { User } from './models/user.model.js';
import type { CreateUserDto, UpdateUserDto } from './dto/user.dto.js';

export function mapUser(u: User): UserSummary {
  return {
    id: u.id,
    email: u.email,
    name: u.name,
    role: u.role,
    active: u.active,
    lastSignInAt: u.lastSignInAt ? u.lastSignInAt.toISOString() : null,
    createdAt: u.createdAt.toISOString(),
  };
}

@Injectable()
export class UsersService {
  constructor(@InjectModel(User) private readonly users: typeof User) {}

  findByEmail(email: string) {
    return this.users.findOne({ where: { email: email.trim().toLowerCase() } });
  }

  findById(id: number) {
    return this.users.findByPk(id);
  }

  async verifyPassword(user: User, password: string) {
    try {
      return await argon2.verify(user.passwordHash, password);
    } catch {
      return false;
    }
  }

  async recordSignIn(user: User) {
    user.lastSignInAt = new Date();
    await user.save();
  }

  async list(practiceId: number, role?: Role): Promise<UserSummary[]> {
    const rows = await this.users.findAll({ where: { practiceId, ...(role ? { role } : {}) }, order: [['name', 'ASC']] });
    return rows.map(mapUser);
  }

  async create(practiceId: number, dto: CreateUserDto): Promise<UserSummary> {
    if (await this.findByEmail(dto.email)) {
      throw new ConflictException({ message: `A user with e-mail ${dto.email} already exists`, errors: [{ field: 'email', message: 'already in use' }] });
    }
    const user = await this.users.create({
      practiceId,
      email: dto.email,
      name: dto.name,
      role: dto.role,
      passwordHash: await argon2.hash(dto.password),
      active: true,
    });
    return mapUser(user);
  }

  async update(practiceId: number, actingUserId: number, id: number, dto: UpdateUserDto): Promise<UserSummary> {
    const user = await this.users.findOne({ where: { id, practiceId } });
    if (!user) throw new NotFoundException(`User ${id} not found`);
    // An admin cannot lock the practice out by demoting or deactivating themself.
    if (id === actingUserId && (dto.active === false || (dto.role && dto.role !== user.role))) {
      throw new BadRequestException({
        message: 'You cannot deactivate yourself or change your own role; ask another administrator',
        errors: [{ field: dto.active === false ? 'active' : 'role', message: 'cannot change your own account this way' }],
      });
    }
    let revoke = false;
    if (dto.name !== undefined) user.name = dto.name;
    if (dto.role !== undefined && dto.role !== user.role) {
      user.role = dto.role;
      revoke = true;
    }
    if (dto.active !== undefined && dto.active !== user.active) {
      user.active = dto.active;
      revoke = true;
    }
    if (dto.password !== undefined) {
      user.passwordHash = await argon2.hash(dto.password);
      revoke = true;
    }
    if (revoke) user.tokenVersion += 1;
    await user.save();
    return mapUser(user);
  }
}
