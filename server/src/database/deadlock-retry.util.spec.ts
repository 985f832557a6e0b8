import { describe, expect, it } from 'vitest';
import { retryOnDeadlock } from './deadlock-retry.util.js';

const deadlock = () => Object.assign(new Error('Deadlock found when trying to get lock; try restarting transaction'), { parent: { errno: 1213 } });

describe('retryOnDeadlock', () => {
  it('runs the work again after a deadlock and returns its result', async () => {
    let calls = 0;
    const r = await retryOnDeadlock(async () => {
      calls++;
      if (calls < 3) throw deadlock();
      return 'done';
    });
    expect([r, calls]).toEqual(['done', 3]);
  });

  it('gives up after the last attempt, and never retries another error', async () => {
    let calls = 0;
    await expect(retryOnDeadlock(async () => { calls++; throw deadlock(); }, 2)).rejects.toThrow(/Deadlock/);
    expect(calls).toBe(2);
    calls = 0;
    await expect(retryOnDeadlock(async () => { calls++; throw new Error('duplicate'); })).rejects.toThrow('duplicate');
    expect(calls).toBe(1);
  });
});
