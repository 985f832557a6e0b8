import { BadRequestException, Body, Controller, HttpCode, Post, Res, UseGuards } from '@nestjs/common';
import { ApiConsumes, ApiForbiddenResponse, ApiOperation, ApiProduces, ApiTags } from '@nestjs/swagger';
import type { Response } from 'express';
import { Public } from '../common/decorators/auth.decorators.js';
import { TwilioSignatureGuard } from '../messaging/twilio-signature.guard.js';
import { InboundService, type InboundSms } from './inbound.service.js';

/** An empty TwiML answer: our own replies go through the outbox (consent, caps, one record), never TwiML. */
export const EMPTY_TWIML = '<?xml version="1.0" encoding="UTF-8"?><Response/>';

const text = (v: unknown) => (typeof v === 'string' ? v : Array.isArray(v) ? String(v[0] ?? '') : '');

/** The provider's form (Twilio Messaging webhook): MessageSid, From, To, Body; anything else is ignored. */
export function inboundForm(body: Record<string, unknown>): InboundSms {
  const messageSid = text(body.MessageSid ?? body.SmsMessageSid ?? body.SmsSid).trim();
  const from = text(body.From).trim();
  const missing = [...(messageSid ? [] : ['MessageSid']), ...(from ? [] : ['From'])];
  if (missing.length) {
    throw new BadRequestException({ message: `${missing.join(' and ')} must be given`, errors: missing.map((field) => ({ field, message: 'must be given' })) });
  }
  if (messageSid.length > 64) throw new BadRequestException({ message: 'MessageSid is too long', errors: [{ field: 'MessageSid', message: 'at most 64 characters' }] });
  return { messageSid, from, to: text(body.To).trim().slice(0, 254) || null, body: text(body.Body).slice(0, 2000) };
}

@ApiTags('replies')
@Controller('sms')
export class InboundController {
  constructor(private readonly inbound: InboundService) {}

  @Post('inbound')
  @Public()
  @UseGuards(TwilioSignatureGuard)
  @HttpCode(200)
  @ApiConsumes('application/x-www-form-urlencoded')
  @ApiProduces('text/xml')
  @ApiOperation({ summary: "The text provider's inbound webhook: a patient's reply, stored once and acted on (signed; answers empty TwiML)" })
  @ApiForbiddenResponse({ description: 'the signature does not verify over the configured public URL, or the AccountSid is not ours' })
  async receive(@Body() body: Record<string, unknown>, @Res({ passthrough: true }) res: Response): Promise<string> {
    await this.inbound.receive(inboundForm(body ?? {}));
    // Set only on success: an error keeps the JSON body of the error filter.
    res.type('text/xml; charset=utf-8');
    return EMPTY_TWIML;
  }
}
