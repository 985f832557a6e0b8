// Attendance on the fixture week (reports.fixtures.util.ts, fixtureAttendance), notice 48 h.
import { describe, expect, it } from 'vitest';
import { attendance, channelOf } from './attendance.util.js';
import { fixtureAttendance, FROM, NY, TO } from './reports.fixtures.util.js';

const report = (notice = 48) => attendance({ from: FROM, to: TO, lateCancelNoticeHours: notice, zones: new Map([[1, NY]]), visits: fixtureAttendance() });

describe('attendance on the fixture week', () => {
  it('counts outcomes of the visits that started in the range (local days)', () => {
    // attended b1 b2 b3 b8 b10; no-show b4; late b11 (6.5 h) b14 (2.5 h); early b5 (72 h) b13 (48 real h);
    // open b6 b7 b9 b12 b16; b15 is on 10-28 New York time.
    const t = report().totals;
    expect(t).toMatchObject({ visits: 8, attended: 5, noShows: 1, lateCancellations: 2, earlyCancellations: 2, open: 5, sameDayFills: 1 });
    expect(t.attendedShare! + t.noShowShare! + t.lateCancellationShare!).toBeCloseTo(1, 12);
    expect(t.noShowShare).toBe(1 / 8);
  });

  it('the notice is the practice setting: at 72 h the early 48-hour one becomes late', () => {
    const t = report(72.5).totals;
    expect([t.lateCancellations, t.earlyCancellations, t.visits]).toEqual([4, 0, 10]);
  });

  it('confirmation by channel over the visits that took place or were missed, and by reminders before it', () => {
    const r = report();
    // Base = 5 attended + 1 no-show = 6; sms b1 b8 b10 ('text'), link b2, desk b4, unconfirmed b3.
    expect(r.confirmationByChannel.map((c) => [c.channel, c.visits])).toEqual([
      ['sms', 3],
      ['email', 0],
      ['link', 1],
      ['desk', 1],
      ['unconfirmed', 1],
    ]);
    expect(r.confirmationRate).toBe(5 / 6);
    expect(r.confirmationByChannel.reduce((s, c) => s + c.share!, 0)).toBeCloseTo(1, 12);
    // Reminders before the confirmation: b4 0; b1 b10 1; b2 2; b8 3 → 3+.
    expect(r.confirmationByReminders.map((c) => [c.reminders, c.visits])).toEqual([
      ['0', 1],
      ['1', 2],
      ['2', 1],
      ['3+', 1],
    ]);
    expect(r.confirmationByReminders.reduce((s, c) => s + c.share!, 0)).toBeCloseTo(1, 12);
  });

  it('an empty range has no shares rather than ÷ 0', () => {
    const r = attendance({ from: '2027-01-01', to: '2027-01-02', lateCancelNoticeHours: 48, zones: new Map([[1, NY]]), visits: fixtureAttendance() });
    expect(r.totals.visits).toBe(0);
    expect([r.totals.attendedShare, r.confirmationRate, r.confirmationByChannel[0]!.share]).toEqual([null, null, null]);
  });

  it('reads the confirmation channel', () => {
    expect([channelOf('sms'), channelOf('TEXT'), channelOf('email'), channelOf('link'), channelOf('desk'), channelOf(null)]).toEqual(['sms', 'sms', 'email', 'link', 'desk', 'desk']);
  });
});
