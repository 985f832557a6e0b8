// Catches a query made inside a transaction's callback without that transaction: it needs a second pool
// connection while the first is held, so a burst of such requests can starve the pool (every connection
// held, every holder waiting for one more). Installed for the API tests by test-app.ts; createTestApp's
// close() fails the file that made one, naming where.
import { AsyncLocalStorage } from 'node:async_hooks';
import { Sequelize } from 'sequelize';

const open = new AsyncLocalStorage<{ finished?: string }>();
const found = new Map<string, string>();
let installed = false;

export function installTransactionGuard(): void {
  if (installed) return;
  installed = true;
  const proto = Sequelize.prototype as unknown as Record<'transaction' | 'query', (...args: unknown[]) => unknown>;
  const transaction = proto.transaction;
  proto.transaction = function (this: unknown, options?: unknown, work?: unknown) {
    if (typeof options === 'function') [options, work] = [{}, options];
    if (typeof work !== 'function') return transaction.call(this, options);
    const run = work as (t: { finished?: string }) => unknown;
    return transaction.call(this, options, (t: { finished?: string }) => open.run(t, () => run(t)));
  };
  const query = proto.query;
  proto.query = function (this: unknown, sql: unknown, raw?: unknown) {
    const options = raw as { transaction?: unknown } | undefined;
    const t = open.getStore();
    if (t && !t.finished && !options?.transaction) {
      const where = (new Error().stack ?? '').split('\n').filter((l) => l.includes('/src/') && !l.includes('node_modules')).slice(0, 4).map((l) => l.trim()).join(' ← ');
      const text = String((sql as { query?: string })?.query ?? sql).replace(/\s+/g, ' ').slice(0, 80);
      if (!found.has(where)) found.set(where, text);
    }
    return query.call(this, sql, options);
  };
}

/** What the guard saw so far (and forgets it), one line per place. */
export function takeTransactionLeaks(): string[] {
  const lines = [...found].map(([where, sql]) => `${sql} … at ${where}`);
  found.clear();
  return lines;
}
