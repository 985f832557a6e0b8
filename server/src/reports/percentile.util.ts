// Nearest-rank percentiles (report-constants PERCENTILE_METHOD): the P-th percentile of N values is the
// value at rank ⌈P/100 · N⌉ of the ascending list (rank 1 for P = 0). It is always one of the values,
// so "median 12 days" is a lead time some referral really had. Common practice, no source.

/** Nearest-rank percentile of values (any order); null for an empty list. */
export function nearestRank(values: readonly number[], p: number): number | null {
  if (!(p >= 0 && p <= 100)) throw new RangeError(`percentile must be 0–100, got ${p}`);
  if (values.length === 0) return null;
  const sorted = [...values].sort((a, b) => a - b);
  const rank = Math.max(1, Math.ceil((p * sorted.length) / 100));
  return sorted[rank - 1]!;
}

export const median = (values: readonly number[]) => nearestRank(values, 50);
