import { Injectable } from '@nestjs/common';

/** The outbox's idea of "now": one provider so tests can fix or move time (quiet hours, backoff). */
@Injectable()
export class MessagingClock {
  now(): Date {
    return new Date();
  }
}
