/**
 * Estimator benchmark: 10,000 seeded random cases through estimate(), printing cases per second and
 * the p50/p99 latency of one estimate. Run after the build: node server/dist/bench/estimator.bench.js [cases] [seed]
 */
import { performance } from 'node:perf_hooks';
import { COMPLICATIONS, FACTOR_KEYS, LEVELS, PROCEDURES, type EstimateFacts, type FactorKey, type Level } from '@ostium/shared';
import { ALL_FDI_CODES, DEFAULT_ESTIMATE_TABLE, estimate, type EstimateInput } from '../estimates/estimator/index.js';
import { mulberry32, pick } from '../estimates/estimator/seeded-random.util.js';

const count = Number(process.argv[2] ?? 10_000);
const seed = Number(process.argv[3] ?? 20_260_401);
if (!Number.isInteger(count) || count < 1) throw new Error('cases must be a whole number ≥ 1');

function randomCase(rand: () => number): EstimateInput {
  const assessment: Partial<Record<FactorKey, Level>> = {};
  for (const key of FACTOR_KEYS) {
    // About a third of the factors rated, mostly low, as on real case sheets.
    if (rand() < 0.35) assessment[key] = rand() < 0.6 ? 'low' : pick(rand, LEVELS);
  }
  const facts: EstimateFacts = {};
  if (rand() < 0.5) facts.curvatureDegrees = Math.round(rand() * 450) / 10;
  if (rand() < 0.2) facts.apicalOpeningMm = Math.round(rand() * 20) / 10;
  if (rand() < 0.3) facts.toothLengthMm = 18 + Math.round(rand() * 100) / 10;
  if (rand() < 0.1) facts.calcifiedCanals = 1;
  if (rand() < 0.05) facts.complications = [pick(rand, COMPLICATIONS)];
  if (rand() < 0.05) facts.acuteAbscess = true;
  const input: EstimateInput = { toothFdi: pick(rand, ALL_FDI_CODES), procedure: pick(rand, PROCEDURES), assessment, facts };
  if (rand() < 0.3) input.canals = 1 + Math.floor(rand() * 4);
  return input;
}

const rand = mulberry32(seed);
const cases = Array.from({ length: count }, () => randomCase(rand));

// Warm-up so the JIT has compiled the hot path before we time it.
for (let i = 0; i < Math.min(2_000, count); i++) estimate(cases[i]!, DEFAULT_ESTIMATE_TABLE);

const latencies = new Float64Array(count);
let checksum = 0;
const start = performance.now();
for (let i = 0; i < count; i++) {
  const t0 = performance.now();
  const r = estimate(cases[i]!, DEFAULT_ESTIMATE_TABLE);
  latencies[i] = performance.now() - t0;
  // Keeps the result live so the work cannot be optimised away.
  checksum += r.totalMinutes;
}
const elapsedMs = performance.now() - start;

latencies.sort();
const at = (p: number) => latencies[Math.min(count - 1, Math.ceil(p * count) - 1)]!;
console.log(`estimator benchmark: ${count} cases, seed ${seed}`);
console.log(`cases per second: ${Math.round((count / elapsedMs) * 1000)}`);
console.log(`latency p50: ${(at(0.5) * 1000).toFixed(1)} µs`);
console.log(`latency p99: ${(at(0.99) * 1000).toFixed(1)} µs (${at(0.99).toFixed(4)} ms)`);
console.log(`total planned minutes (checksum): ${checksum}`);
