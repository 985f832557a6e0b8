import { createParamDecorator, ExecutionContext, SetMetadata } from '@nestjs/common';
import type { Capability, Role } from '@ostium/shared';
import { ACCESS } from '@ostium/shared';
import type { RequestUser } from '../context/request-context.js';

export const IS_PUBLIC = 'ostium:isPublic';
export const ROLES_KEY = 'ostium:roles';
export const ANY_ROLE = 'ostium:anyRole';

/** No sign-in needed (health, login, signed public links). */
export const Public = () => SetMetadata(IS_PUBLIC, true);

/** Only these roles may call the route. */
export const Roles = (...roles: Role[]) => SetMetadata(ROLES_KEY, roles);

/** Only the roles the shared access table gives this capability. */
export const Allow = (capability: Capability) => SetMetadata(ROLES_KEY, [...ACCESS[capability]]);

/** Any signed-in user (own profile, sign-out). Routes without Roles/Allow/AnyRole are refused. */
export const AnyRole = () => SetMetadata(ANY_ROLE, true);

export const CurrentUser = createParamDecorator((_: unknown, ctx: ExecutionContext): RequestUser => {
  return ctx.switchToHttp().getRequest().user;
});
