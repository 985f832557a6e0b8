import { ExecutionContext, Injectable, UnauthorizedException } from '@nestjs/common';
import { Reflector } from '@nestjs/core';
import { AuthGuard } from '@nestjs/passport';
import { IS_PUBLIC } from '../decorators/auth.decorators.js';
import { currentContext, type RequestUser } from '../context/request-context.js';

/** Global: every route needs a valid access token unless marked @Public(). */
@Injectable()
export class JwtAuthGuard extends AuthGuard('jwt') {
  constructor(private readonly reflector: Reflector) {
    super();
  }

  canActivate(context: ExecutionContext) {
    const isPublic = this.reflector.getAllAndOverride<boolean>(IS_PUBLIC, [context.getHandler(), context.getClass()]);
    if (isPublic) return true;
    return super.canActivate(context);
  }

  handleRequest<TUser = RequestUser>(err: unknown, user: TUser | false): TUser {
    if (err || !user) throw new UnauthorizedException('Sign in first: the access token is missing, expired or no longer valid');
    const ctx = currentContext();
    if (ctx) ctx.user = user as unknown as RequestUser;
    return user;
  }
}
