// A brute-force oracle for the cable solver, written apart from it on purpose: every ordered chain of distinct
// parts, each either way round, kept when its joints mate; then every assignment of chains to paths with no part
// twice. Exponential: for tiny inventories only (tests and the benchmark's comparison).
import { mates, type ConnectorEnd } from '../../shared/domain/connectors.js';
import { partLossDb, targetDelays, type SolverPart, type SolverProblem } from '../../shared/domain/solver.js';

export interface OracleBest {
  feasible: boolean;
  /** Lexicographically best (score, error) among assignments within the tolerance, or best (error, score) when none is. */
  score: number;
  errorPs: number;
  assignments: number;
}

interface OracleChain {
  parts: number[];
  delayPs: number;
  lengthMm: number;
  segments: number;
}

function chainsOf(problem: SolverProblem): OracleChain[] {
  const shared = problem.shared ?? [];
  const start: ConnectorEnd | null = shared.length ? shared[shared.length - 1]!.ends[1] : (problem.pathStart ?? null);
  const end = problem.pathEnd ?? null;
  const seen = new Map<string, OracleChain>();
  const parts = problem.parts;
  const walk = (chain: number[], previous: ConnectorEnd | null) => {
    if (chain.length > 0 && (end === null || mates(previous!, end))) {
      const key = [...chain].sort((a, b) => a - b).join(',');
      if (!seen.has(key)) {
        seen.set(key, {
          parts: [...chain],
          delayPs: chain.reduce((a, i) => a + parts[i]!.delayPs, 0),
          lengthMm: chain.reduce((a, i) => a + parts[i]!.lengthMm, 0),
          segments: chain.length,
        });
      }
    }
    if (chain.length === problem.maxSegments) return;
    parts.forEach((p: SolverPart, i) => {
      if (chain.includes(i)) return;
      for (const [s, f] of [[p.ends[0], p.ends[1]], [p.ends[1], p.ends[0]]] as const) {
        if (previous !== null && !mates(previous, s)) continue;
        chain.push(i);
        walk(chain, f);
        chain.pop();
      }
    });
  };
  walk([], start);
  return [...seen.values()];
}

export function bruteForce(problem: SolverProblem): OracleBest {
  const chains = chainsOf(problem);
  const paths = problem.sources.flatMap((src, s) => targetDelays(problem, src).map((target, n) => ({ s, n, target, frequencyHz: src.frequencyHz })));
  const EPS = 1e-9;
  let bestFeasible: { score: number; error: number } | null = null;
  let bestAny: { score: number; error: number } | null = null;
  let assignments = 0;
  const pick: number[] = [];
  const used = new Set<number>();
  const scoreOf = (c: OracleChain, frequencyHz: number) =>
    problem.prefer === 'fewest-segments' ? c.segments : problem.prefer === 'least-length' ? c.lengthMm : c.parts.reduce((a, i) => a + partLossDb(problem.parts[i]!, frequencyHz), 0);
  const visit = (depth: number) => {
    if (depth === paths.length) {
      assignments += 1;
      let error = 0;
      problem.sources.forEach((_, s) => {
        const us = paths.map((p, i) => (p.s === s ? chains[pick[i]!]!.delayPs - p.target : null)).filter((u): u is number => u !== null);
        error = Math.max(error, (Math.max(...us) - Math.min(...us)) / 2);
      });
      const score = paths.reduce((a, p, i) => a + scoreOf(chains[pick[i]!]!, p.frequencyHz), 0);
      if (error <= problem.tolerancePs + EPS) {
        if (!bestFeasible || score < bestFeasible.score - EPS || (Math.abs(score - bestFeasible.score) <= EPS && error < bestFeasible.error)) bestFeasible = { score, error };
      }
      if (!bestAny || error < bestAny.error - EPS || (Math.abs(error - bestAny.error) <= EPS && score < bestAny.score)) bestAny = { score, error };
      return;
    }
    chains.forEach((c, ci) => {
      if (c.parts.some((p) => used.has(p))) return;
      c.parts.forEach((p) => used.add(p));
      pick[depth] = ci;
      visit(depth + 1);
      c.parts.forEach((p) => used.delete(p));
    });
  };
  visit(0);
  const best = (bestFeasible ?? bestAny) as { score: number; error: number } | null;
  return { feasible: bestFeasible !== null, score: best?.score ?? NaN, errorPs: best?.error ?? NaN, assignments };
}
