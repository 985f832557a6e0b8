import { CanActivate, ExecutionContext, ForbiddenException, Inject, Injectable, Logger } from '@nestjs/common';
import type { Request } from 'express';
import { APP_CONFIG, type AppConfig } from '../config/configuration.js';
import { checkTwilioRequest, signedUrl } from './twilio-signature.util.js';

/**
 * For the provider's webhooks (@Public routes): 403 unless X-Twilio-Signature verifies over the
 * configured public URL and the form body, and the AccountSid is ours. Runs before the handler, so a
 * refused request changes nothing.
 */
@Injectable()
export class TwilioSignatureGuard implements CanActivate {
  private readonly logger = new Logger('TwilioSignature');

  constructor(@Inject(APP_CONFIG) private readonly config: AppConfig) {}

  canActivate(context: ExecutionContext): boolean {
    const req = context.switchToHttp().getRequest<Request>();
    const body: unknown = req.body;
    const params = body && typeof body === 'object' && !Array.isArray(body) ? (body as Record<string, unknown>) : {};
    const check = checkTwilioRequest(this.config.sms.authToken, this.config.sms.accountSid, {
      signature: req.header('x-twilio-signature'),
      url: signedUrl(this.config.publicUrl, req.originalUrl),
      params,
    });
    if (check.ok) return true;
    this.logger.warn(`refused ${req.method} ${req.originalUrl.split('?')[0]}: ${check.reason}`);
    throw new ForbiddenException(`Refused: ${check.reason}`);
  }
}
