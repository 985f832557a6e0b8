import { CanActivate, ExecutionContext, ForbiddenException, Injectable } from '@nestjs/common';
import { Reflector } from '@nestjs/core';
import type { Role } from '@ostium/shared';
import { ANY_ROLE, IS_PUBLIC, ROLES_KEY } from '../decorators/auth.decorators.js';
import type { RequestUser } from '../context/request-context.js';

/**
 * Global and deny-by-default: a signed-in route must say who may call it (@Roles, @Allow or
 * @AnyRole); one that says nothing is refused, so a forgotten decorator can never open a route.
 */
@Injectable()
export class RolesGuard implements CanActivate {
  constructor(private readonly reflector: Reflector) {}

  canActivate(context: ExecutionContext): boolean {
    const targets = [context.getHandler(), context.getClass()];
    if (this.reflector.getAllAndOverride<boolean>(IS_PUBLIC, targets)) return true;
    const user: RequestUser | undefined = context.switchToHttp().getRequest().user;
    if (!user) return false;
    if (this.reflector.getAllAndOverride<boolean>(ANY_ROLE, targets)) return true;
    const roles = this.reflector.getAllAndOverride<Role[] | undefined>(ROLES_KEY, targets);
    if (roles && roles.includes(user.role)) return true;
    throw new ForbiddenException(`The ${user.role} role cannot do this`);
  }
}
