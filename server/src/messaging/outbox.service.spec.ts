import { describe, expect, it } from 'vitest';
import type { OutboxMessageRow } from './models/outbox-message.model.js';
import { defaultComposer, deliveryFailureReason } from './outbox.service.js';

const row = (over: Partial<OutboxMessageRow>) => ({ toAddress: '+12025550142', subject: null, body: 'hi', ...over }) as OutboxMessageRow;

describe('defaultComposer', () => {
  it("sends the row's own address and text, and skips with the reason when either is missing", async () => {
    const now = new Date();
    expect(await defaultComposer.compose(row({}), now)).toEqual({ action: 'send', to: '+12025550142', subject: null, body: 'hi' });
    expect(await defaultComposer.compose(row({ toAddress: null }), now)).toEqual({ action: 'skip', reason: 'there is no address to send to' });
    expect(await defaultComposer.compose(row({ body: null }), now)).toEqual({ action: 'skip', reason: 'the message has no text' });
  });
});

describe('deliveryFailureReason', () => {
  it("puts the provider's delivery error code in words", () => {
    // Provider error codes from memory (the provider's error dictionary).
    expect(deliveryFailureReason('undelivered', '30003')).toBe('the carrier could not deliver the text: the phone was unreachable (off or out of coverage) (error 30003)');
    expect(deliveryFailureReason('failed', '30007')).toBe('the text provider could not send the text: the carrier filtered the text (error 30007)');
    expect(deliveryFailureReason('undelivered', '39999')).toBe('the carrier could not deliver the text (error 39999)');
    expect(deliveryFailureReason('failed', null)).toBe('the text provider could not send the text');
  });
});
