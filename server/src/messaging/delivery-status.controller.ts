import { BadRequestException, Body, Controller, HttpCode, Post, UseGuards } from '@nestjs/common';
import { ApiOperation, ApiTags } from '@nestjs/swagger';
import { Public } from '../common/decorators/auth.decorators.js';
import { MessagingClock } from './messaging-clock.service.js';
import { OutboxService } from './outbox.service.js';
import { TwilioSignatureGuard } from './twilio-signature.guard.js';

const field = (body: Record<string, unknown>, name: string, required: boolean): string | null => {
  const v = body[name];
  if (typeof v === 'string' && v.trim() !== '') return v.trim();
  if (required) throw new BadRequestException({ message: `${name} is required`, errors: [{ field: name, message: 'is required' }] });
  return null;
};

/** The provider's delivery status callback (the StatusCallback each text is sent with). */
@ApiTags('messaging')
@Controller('sms')
export class DeliveryStatusController {
  constructor(
    private readonly outbox: OutboxService,
    private readonly clock: MessagingClock,
  ) {}

  @Post('status')
  @Public()
  @UseGuards(TwilioSignatureGuard)
  @HttpCode(204)
  @ApiOperation({ summary: "The text provider's delivery status callback (signed form post; 403 unless the signature verifies)" })
  // The provider posts many form fields; the signature covers them all, so the body is not reshaped by a DTO.
  async status(@Body() body: Record<string, unknown>): Promise<void> {
    await this.outbox.recordDeliveryStatus(
      { messageSid: field(body, 'MessageSid', true)!, messageStatus: field(body, 'MessageStatus', true)!, errorCode: field(body, 'ErrorCode', false) },
      this.clock.now(),
    );
  }
}
