// Small pure pieces of the outbox job: how long to wait before the next attempt, and a bounded pool.

/**
 * Exponential backoff with jitter: base·2^(attempts−1), at most max, then ±25 % so messages that
 * failed together (a provider outage) do not all come back in the same tick; never above max.
 */
export function retryDelayMs(attempts: number, baseMs: number, maxMs: number, random: () => number = Math.random): number {
  const exp = Math.min(maxMs, baseMs * 2 ** Math.max(0, attempts - 1));
  return Math.max(0, Math.min(maxMs, Math.round(exp * (0.75 + 0.5 * random()))));
}

/** Runs `fn` over `items` with at most `limit` at a time; one item's error or slowness does not stop the others. */
export async function forEachLimited<T>(items: readonly T[], limit: number, fn: (item: T) => Promise<void>, onError: (item: T, error: unknown) => void): Promise<void> {
  let next = 0;
  const lane = async () => {
    while (next < items.length) {
      const item = items[next++]!;
      try {
        await fn(item);
      } catch (e) {
        onError(item, e);
      }
    }
  };
  await Promise.all(Array.from({ length: Math.max(0, Math.min(limit, items.length)) }, lane));
}
