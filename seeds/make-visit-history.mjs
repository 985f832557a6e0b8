// Writes demo/visit-history.csv: invented past visits of the demo practice for the CSV import.
// 240 treatments, one row per visit. Deterministic (seeded), so the file is the same every time. Hidden truths the import should learn:
// endo2 works about 30 % slower than the table, endo3 about 10 % faster, high-difficulty molars
// run about 20 % over, with lognormal noise.
import { writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

let seed = 20261201;
const rnd = () => ((seed = (seed * 1664525 + 1013904223) % 2 ** 32) / 2 ** 32);
const normal = () => Math.sqrt(-2 * Math.log(1 - rnd())) * Math.cos(2 * Math.PI * rnd());
const pick = (a) => a[Math.floor(rnd() * a.length)];

// Universal numbers (the demo practice's notation) by group, with the usual canal count.
const teeth = [
  ...[6, 7, 8, 9, 10, 11, 22, 23, 24, 25, 26, 27].map((t) => ({ t, group: 'anterior', canals: 1, base: 60 })),
  ...[4, 5, 12, 13, 20, 21, 28, 29].map((t) => ({ t, group: 'premolar', canals: [5, 12].includes(t) ? 2 : 1, base: 75 })),
  ...[2, 3, 14, 15, 18, 19, 30, 31].map((t) => ({ t, group: 'molar', canals: [3, 14].includes(t) ? 4 : 3, base: 90 })),
];
const operators = [
  { email: 'endo@quillfern-endo.test', pace: 1.0 },
  { email: 'endo2@quillfern-endo.test', pace: 1.3 },
  { email: 'endo3@quillfern-endo.test', pace: 0.9 },
];
const tier = { low: 1, moderate: 1.25, high: 1.5 };
const lines = ['date,tooth,procedure,canals,level,operator_email,actual_minutes'];
const start = Date.UTC(2026, 5, 1);
for (let i = 0; i < 240; i++) {
  const tooth = pick(teeth);
  const level = pick(['low', 'low', 'moderate', 'moderate', 'high']);
  const procedure = rnd() < 0.8 ? 'initial' : 'consult';
  const op = pick(operators);
  const table = procedure === 'consult' ? 30 : tooth.base * tier[level];
  // A treatment longer than the 120-minute longest visit was done in several visits: one row each.
  const visits = Math.ceil(table / 120);
  const perVisit = Math.ceil(table / visits / 5) * 5;
  const cellBias = procedure === 'initial' && tooth.group === 'molar' && level === 'high' ? 1.2 : 1;
  const day = Math.floor(rnd() * 140);
  for (let v = 0; v < visits; v++) {
    const actual = Math.max(10, Math.round(perVisit * op.pace * cellBias * Math.exp(0.12 * normal())));
    const date = new Date(start + (day + v * 10) * 86_400_000).toISOString().slice(0, 10);
    lines.push([date, tooth.t, procedure, tooth.canals, level, op.email, actual].join(','));
  }
}
const out = join(dirname(fileURLToPath(import.meta.url)), 'demo', 'visit-history.csv');
writeFileSync(out, lines.join('\n') + '\n');
console.log(`wrote ${lines.length - 1} visits (240 treatments) to ${out}`);
