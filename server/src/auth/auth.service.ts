import { Inject, Injectable, UnauthorizedException } from '@nestjs/common';
import { JwtService } from '@nestjs/jwt';
import type { AuthUser, LoginResponse } from '@ostium/shared';
import { APP_CONFIG, type AppConfig } from '../config/configuration.js';
import type { User } from '../users/models/user.model.js';
import { UsersService } from '../users/users.service.js';
import { currentContext, type RequestUser } from '../common/context/request-context.js';

export interface AccessPayload {
  sub: number;
  tv: number;
  typ: 'access' | 'refresh';
}

// One message for an unknown e-mail and a wrong password, so sign-in does not reveal who has an account.
const BAD_LOGIN = 'The e-mail or password is not right';

export const toAuthUser = (u: User): AuthUser => ({ id: u.id, email: u.email, name: u.name, role: u.role });

@Injectable()
export class AuthService {
  constructor(
    private readonly users: UsersService,
    private readonly jwt: JwtService,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
  ) {}

  async login(email: string, password: string): Promise<{ response: LoginResponse; refreshToken: string }> {
    const user = await this.users.findByEmail(email);
    const ok = user ? await this.users.verifyPassword(user, password) : false;
    if (!user || !ok || !user.active) throw new UnauthorizedException(BAD_LOGIN);
    // The sign-in itself is credited to the user in the audit log.
    const ctx = currentContext();
    if (ctx) ctx.user = { ...toAuthUser(user), practiceId: user.practiceId };
    await this.users.recordSignIn(user);
    return this.issue(user);
  }

  async refresh(refreshToken: string | undefined) {
    if (!refreshToken) throw new UnauthorizedException('Sign in again: there is no session to refresh');
    let payload: AccessPayload;
    try {
      payload = await this.jwt.verifyAsync<AccessPayload>(refreshToken);
    } catch {
      throw new UnauthorizedException('Sign in again: the session has expired');
    }
    const user = payload.typ === 'refresh' ? await this.validate(payload) : null;
    if (!user) throw new UnauthorizedException('Sign in again: the session is no longer valid');
    return this.issue((await this.users.findById(user.id))!);
  }

  /** Used for every request: the user must still exist, be active and hold the token's version. */
  async validate(payload: AccessPayload): Promise<RequestUser | null> {
    const user = await this.users.findById(payload.sub);
    if (!user || !user.active || user.tokenVersion !== payload.tv) return null;
    return { ...toAuthUser(user), practiceId: user.practiceId };
  }

  private async issue(user: User) {
    const accessToken = await this.jwt.signAsync(
      { sub: user.id, tv: user.tokenVersion, typ: 'access' } satisfies AccessPayload,
      { expiresIn: this.config.jwt.accessTtlSeconds },
    );
    const refreshToken = await this.jwt.signAsync(
      { sub: user.id, tv: user.tokenVersion, typ: 'refresh' } satisfies AccessPayload,
      { expiresIn: this.config.jwt.refreshTtlSeconds },
    );
    return { response: { accessToken, user: toAuthUser(user) }, refreshToken };
  }
}
