import type { DeskTask, LocationSummary, OutboxMessage, ReplyThread, ReplyThreadSummary, ThreadItem } from '@ostium/shared';

// Test data for Replies in the server's shapes; names are invented, numbers in the 555-01xx fictional range.

export function location(over: Partial<LocationSummary> = {}): LocationSummary {
  return { id: 1, name: 'Riverside', address: '1 Example Row', phone: '+12025550100', timeZone: 'America/New_York', openingHours: [1, 2, 3, 4, 5].map((weekday) => ({ weekday, open: '08:00', close: '17:00' })), chairs: [], microscopes: [], ...over };
}

export function summary(over: Partial<ReplyThreadSummary> = {}): ReplyThreadSummary {
  return { patientId: 3, patientName: 'Robin Example', address: null, unread: 0, openTasks: 0, failed: 0, lastAt: '2026-12-01T15:00:00.000Z', lastPreview: 'See you then', smsConsent: true, ...over };
}

export function outbox(over: Partial<OutboxMessage> = {}): Extract<ThreadItem, { direction: 'out' }> {
  return {
    direction: 'out',
    id: 100,
    channel: 'sms',
    purpose: 'reminder',
    ruleId: 'text-48h',
    appointmentId: 41,
    patientId: 3,
    referralId: 12,
    to: '+12025550142',
    subject: null,
    body: 'Quillfern Endodontics: visit Thu 3 Dec 09:30 at Riverside. Reply C to confirm, R for another time. STOP to opt out.',
    status: 'delivered',
    dueAt: '2026-12-01T14:30:00.000Z',
    plannedAt: '2026-12-01T14:30:00.000Z',
    deferReason: null,
    attempts: 1,
    lastError: null,
    providerId: 'SM0001',
    providerStatus: 'delivered',
    sentAt: '2026-12-01T14:30:05.000Z',
    deliveredAt: '2026-12-01T14:30:09.000Z',
    failedAt: null,
    createdAt: '2026-11-28T10:00:00.000Z',
    ...over,
  };
}

export function inbound(over: Partial<Extract<ThreadItem, { direction: 'in' }>> = {}): Extract<ThreadItem, { direction: 'in' }> {
  return { direction: 'in', id: 200, channel: 'sms', from: '+12025550142', body: 'C', kind: 'confirm', effect: 'Confirmed the visit on Thu 3 Dec', appointmentId: 41, receivedAt: '2026-12-01T14:40:00.000Z', readAt: null, ...over };
}

export function task(over: Partial<DeskTask> = {}): DeskTask {
  return { id: 7, kind: 'reschedule_request', patientId: 3, patientName: 'Robin Example', appointmentId: 41, detail: 'Replied R to the reminder for Thu 3 Dec 09:30', status: 'open', createdAt: '2026-12-01T14:41:00.000Z', doneAt: null, doneBy: null, ...over };
}

export function thread(over: Partial<ReplyThread> = {}): ReplyThread {
  return {
    patientId: 3,
    patientName: 'Robin Example',
    phone: '+12025550142',
    email: 'robin@example.com',
    smsConsent: true,
    // 14:30 UTC on 3 Dec 2026 is 09:30 in New York (EST, UTC−5).
    nextAppointment: { id: 41, start: '2026-12-03T14:30:00.000Z', state: 'booked', locationName: 'Riverside' },
    items: [outbox(), inbound()],
    tasks: [],
    ...over,
  };
}
