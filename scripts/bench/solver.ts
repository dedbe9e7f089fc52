// The cable solver's benchmark (part of `npm run bench`; alone: `npx tsx scripts/bench/solver.ts`).
//
// 1. The target problem: a 300-part invented shelf, chains of at most 3 segments, 4 inputs, ±0.5 ps, the
//    interferer at −35° for half-wavelength spacing at 3.5 GHz: median time of solveCables (target ≤ 50 ms).
//    The same with a second source (the desired signal at broadside), for comparison.
// 2. Against brute force, on shelves small enough for it to finish: the same problem solved by enumerating every
//    assignment (tests/support/solver-oracle.ts), timed once, next to the solver's median; the ratio (target ≥ 100×),
//    and a check that both find the same best (score, error).
import { performance } from 'node:perf_hooks';
import { solveCables, type SolverProblem, type SolverSource } from '../../shared/domain/solver.js';
import { bruteForce } from '../../tests/support/solver-oracle.js';
import { benchShelf } from './solver-inventory.js';

const TARGET_MEDIAN_MS = 50;
const TARGET_RATIO = 100;
const HALF_WAVE_3G5_MM = (299_792_458 / (2 * 3.5e9)) * 1e3;

const interferer: SolverSource = { key: 'interferer', frequencyHz: 3.5e9, targetAngleDeg: -35 };
const desired: SolverSource = { key: 'desired', frequencyHz: 3.5e9, targetAngleDeg: 0 };

function problem(parts: number, elements: number, maxSegments: number, sources: SolverSource[]): SolverProblem {
  return {
    elements,
    spacingMm: HALF_WAVE_3G5_MM,
    sources,
    tolerancePs: 0.5,
    maxSegments,
    prefer: 'fewest-segments',
    limit: 5,
    parts: benchShelf(parts),
    pathStart: { type: 'sma', gender: 'female' },
    pathEnd: { type: 'sma', gender: 'female' },
  };
}

function timeRuns(p: SolverProblem, runs: number) {
  solveCables(p); // warm-up: JIT
  const times: number[] = [];
  let answer = solveCables(p);
  for (let i = 0; i < runs; i++) {
    const t = performance.now();
    answer = solveCables(p);
    times.push(performance.now() - t);
  }
  times.sort((a, b) => a - b);
  return { median: times[Math.floor(runs / 2)]!, p90: times[Math.floor(runs * 0.9)]!, answer };
}

const mark = (ok: boolean) => (ok ? 'met' : 'NOT met');

console.log('Cable solver: solveCables in-process, one Node process');
let ok = true;
for (const [label, sources] of [["1 source (interferer −35°)", [interferer]], ["2 sources (desired 0°, interferer −35°)", [desired, interferer]]] as const) {
  const p = problem(300, 4, 3, [...sources]);
  const { median, p90, answer } = timeRuns(p, 15);
  const best = answer.proposals[0];
  console.log(
    `  300 parts, 4 inputs, ≤3 segments, ±0.5 ps, ${label}: median ${median.toFixed(1)} ms, p90 ${p90.toFixed(1)} ms; ` +
      `${answer.search.chains.toLocaleString('en')} chains, ${answer.search.nodes.toLocaleString('en')} nodes, ` +
      `${answer.feasible ? `best ${best!.totals.segments} segments, error ${best!.maxErrorPs.toFixed(3)} ps` : 'nothing within tolerance'}` +
      (sources.length === 1 ? `; target ≤ ${TARGET_MEDIAN_MS} ms: ${mark(median <= TARGET_MEDIAN_MS)}` : ''),
  );
  if (sources.length === 1) ok &&= median <= TARGET_MEDIAN_MS;
}

console.log('Against brute force (every assignment enumerated), same problem, smaller shelves:');
for (const [parts, elements, maxSegments] of [
  [18, 4, 2],
  [20, 4, 2],
  [16, 3, 3],
] as const) {
  const p = problem(parts, elements, maxSegments, [interferer]);
  const t0 = performance.now();
  const oracle = bruteForce(p);
  const bruteMs = performance.now() - t0;
  const { median, answer } = timeRuns(p, 21);
  const best = answer.proposals[0];
  const agree =
    best !== undefined && Math.abs(best.maxErrorPs - oracle.errorPs) < 1e-6 && Math.abs(best.totals.segments - oracle.score) < 1e-6 && answer.feasible === oracle.feasible;
  const ratio = bruteMs / Math.max(median, 1e-3);
  console.log(
    `  ${parts} parts, ${elements} inputs, ≤${maxSegments} segments: brute force ${bruteMs.toFixed(1)} ms (${oracle.assignments.toLocaleString('en')} assignments), ` +
      `solver median ${median.toFixed(3)} ms, ${ratio.toFixed(0)}× faster (target ≥ ${TARGET_RATIO}×: ${mark(ratio >= TARGET_RATIO)}); same best: ${agree ? 'yes' : 'NO'}`,
  );
  ok &&= agree;
}
process.exitCode = ok ? 0 : 1;
