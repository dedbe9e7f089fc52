/**
 * The cable solver: which parts on the shelf, chained per chip input, give the delays that emulate the angles
 * wanted. Pure and exact within its bounds (the usable parts, at most `maxSegments` per path): it finds the best
 * proposals by branch and bound over every valid chain, never greedily.
 *
 * The model (../shared/RF-PRIMER.md §1–§3): a plane wave from angle θ off broadside reaches input n of a uniform
 * linear array with spacing d later by τ_n = n·d·sin θ / c, so source s wants relative delays T_{s,n} on its
 * paths (or the relative delays given directly). Only differences matter: each source has a free common offset
 * o_s, and path n's error is e_{s,n} = D_{s,n} − T_{s,n} − o_s, with o_s chosen to centre the errors. A proposal
 * meets the tolerance when every |e| ≤ tolerancePs; its error is the largest |e| over all paths.
 *
 * Search:
 * 1. Every valid chain of 1..maxSegments distinct parts is built once per problem, by class of connector ends:
 *    a multiset of end classes either has a mating order or not, so parts are combined only inside mating class
 *    multisets and each set of parts appears once. Chains are bucketed by delay (counting sort), so the chains
 *    whose delay lies in a window are found without scanning the rest: sorted delay sums, looked up by window.
 * 2. Paths are assigned in order (source by source, input by input) by depth-first branch and bound: the first
 *    path of a source may take any chain; each further path only chains inside the window that keeps the
 *    source's spread of D − T within 2·bound. A bucket of first-path chains is skipped at once when another input
 *    has no chain at all in its window. Parts are never used twice in one proposal. Candidates are tried best
 *    score first, and a branch is cut when even the best completion cannot beat the worst of the best `limit`
 *    proposals found.
 * 3. With the tolerance as bound, it finds the best proposals by preference (then by error), growing the total
 *    segment budget from one segment per path. With one source and the fewest segments wanted, three-part chains
 *    are first made only where they can sit beside single parts (the only place they fit within two segments more
 *    than paths), found from sorted delays by binary search; every chain is made only when that is not enough.
 * 4. When none meets the tolerance, the bound starts at a greedy assignment's error (and doubles if needed);
 *    the proposals are then the closest ones, ranked by error, and the answer says what limits them.
 */
import { mates, matingWarning, describeEnd, type ConnectorEnd } from './connectors.js';
import { SPEED_OF_LIGHT_M_PER_S as C } from './constants.js';
import { cableLossDb } from './cable.js';

export type SolverPreference = 'fewest-segments' | 'lowest-loss' | 'least-length';
export const solverPreferences: readonly SolverPreference[] = ['fewest-segments', 'lowest-loss', 'least-length'];

/** A usable part as the solver sees it. */
export interface SolverPart {
  id: number;
  tag: string;
  kind: string;
  /** The part's two ends, A then B; a part may be used either way round. */
  ends: [ConnectorEnd, ConnectorEnd];
  delayPs: number;
  /** Where the delay comes from: measured (e.g. with a VNA), computed from length and velocity factor, or entered. */
  delaySource: 'measured' | 'computed' | 'entered';
  /** Physical length, mm (0 where unknown or not a cable). */
  lengthMm: number;
  /** Loss: a cable's dB/m at a reference frequency (scaled by √f) over its length, or a fixed loss in dB. */
  loss: { dbPerM: number; refHz: number } | { db: number } | null;
}

export interface SolverSource {
  key: string;
  frequencyHz: number;
  /** Target angle of arrival from broadside, degrees (positive: the path to input 1 is longer). */
  targetAngleDeg?: number;
  /** Or the target delay of each input, ps (only their differences matter). */
  targetDelaysPs?: number[];
}

export interface SolverProblem {
  elements: number;
  spacingMm: number;
  sources: SolverSource[];
  tolerancePs: number;
  /** Most segments in one path's chain (the shared fixed segments do not count). */
  maxSegments: number;
  prefer: SolverPreference;
  /** How many proposals to return. */
  limit: number;
  /** The candidates: usable parts only (status ok, not held elsewhere); the caller filters. */
  parts: SolverPart[];
  /** Segments every path shares and that stay fixed, in order from the source (e.g. a cable into a splitter, the splitter). */
  shared?: SolverPart[];
  /** What each chain's first segment plugs into, when no shared segment says it (e.g. a splitter output). */
  pathStart?: ConnectorEnd | null;
  /** What each chain's last segment plugs into (the chip's input), or null to leave it unchecked. */
  pathEnd?: ConnectorEnd | null;
  /** Safety limits of the search; exceeded → the answer says the search was cut short. */
  maxChains?: number;
  maxNodes?: number;
}

export interface ProposalSegment {
  partId: number;
  tag: string;
  kind: string;
  /** Used B end first. */
  reversed: boolean;
  delayPs: number;
  delaySource: SolverPart['delaySource'];
  lossDb: number;
  /** e.g. "SMA m → SMA m", in the direction of the signal. */
  connectors: string;
}

export interface ProposalPath {
  source: string;
  channel: number;
  /** The chain chosen for this input (the shared segments come before it on every path). */
  chain: ProposalSegment[];
  /** Delay of the chain alone, ps. */
  chainDelayPs: number;
  /** Delay of the whole path (shared segments + chain), ps. */
  delayPs: number;
  /** The delay the target asks for, with the source's common offset, ps. */
  targetDelayPs: number;
  errorPs: number;
  lossDb: number;
  lengthMm: number;
  segments: number;
  /** Cautions at this path's joints (e.g. SMA into a precision connector). */
  cautions: string[];
}

export interface ProposalSource {
  key: string;
  frequencyHz: number;
  targetAngleDeg: number | null;
  /** The angle the achieved delays emulate (straight-line fit over the inputs), null when non-physical. */
  angleDeg: number | null;
  angleErrorDeg: number | null;
  targetRelativeDelaysPs: number[];
  relativeDelaysPs: number[];
  maxErrorPs: number;
}

export interface Proposal {
  rank: number;
  meetsTolerance: boolean;
  maxErrorPs: number;
  totals: { segments: number; lossDb: number; lengthMm: number };
  sources: ProposalSource[];
  paths: ProposalPath[];
}

export interface SolverAnswer {
  feasible: boolean;
  proposals: Proposal[];
  /** When nothing meets the tolerance: what limits the closest proposal. */
  limits: string[];
  /** Chains considered per path, nodes of the search, and whether it ran to the end (exact) or hit a safety limit. */
  search: { chains: number; nodes: number; complete: boolean };
}

/** An impossible problem for the solver's bounds (too many combinations): the caller answers 422 with this message. */
export class SolverLimitError extends Error {}

const EPS = 1e-9;
const DEFAULT_MAX_CHAINS = 3_000_000;
const DEFAULT_MAX_NODES = 5_000_000;

/** Relative target delays of each source, ps: n·d·sin θ / c, or the given delays minus the first. */
export function targetDelays(problem: Pick<SolverProblem, 'elements' | 'spacingMm'>, source: SolverSource): number[] {
  if (source.targetDelaysPs) return source.targetDelaysPs.map((t) => t - source.targetDelaysPs![0]!);
  const stepPs = ((problem.spacingMm * 1e-3 * Math.sin(((source.targetAngleDeg ?? 0) * Math.PI) / 180)) / C) * 1e12;
  return Array.from({ length: problem.elements }, (_, n) => n * stepPs);
}

/** Loss of a part at `frequencyHz`, dB. */
export function partLossDb(part: SolverPart, frequencyHz: number): number {
  if (!part.loss) return 0;
  if ('db' in part.loss) return part.loss.db;
  return cableLossDb(part.loss.dbPerM, part.loss.refHz, frequencyHz, part.lengthMm);
}

/** The emulated angle of relative delays: least-squares slope over the inputs, sin θ = c·slope/d. */
export function emulatedAngleDeg(relativeDelaysPs: number[], spacingMm: number): number | null {
  const n = relativeDelaysPs.length;
  const meanX = (n - 1) / 2;
  const meanY = relativeDelaysPs.reduce((a, b) => a + b, 0) / n;
  let sxy = 0;
  let sxx = 0;
  relativeDelaysPs.forEach((y, x) => {
    sxy += (x - meanX) * (y - meanY);
    sxx += (x - meanX) ** 2;
  });
  const sin = ((sxy / sxx) * 1e-12 * C) / (spacingMm * 1e-3);
  return Math.abs(sin) > 1 + 1e-12 ? null : (Math.asin(Math.max(-1, Math.min(1, sin))) * 180) / Math.PI;
}

// ------------------------------------------------------------------ chains

/** Ends of a part in use: `reversed` puts its B end toward the source. */
const startOf = (p: SolverPart, reversed: boolean) => (reversed ? p.ends[1] : p.ends[0]);
const finishOf = (p: SolverPart, reversed: boolean) => (reversed ? p.ends[0] : p.ends[1]);
const endKey = (e: ConnectorEnd) => `${e.type}/${e.gender}`;

/** Parts grouped by the unordered pair of their end kinds: whether a set of parts chains depends only on these. */
interface EndClass {
  a: ConnectorEnd;
  b: ConnectorEnd;
  parts: number[];
}

/** One mating order of a multiset of classes: class index and whether it is reversed, per position. */
type ClassOrder = { cls: number; reversed: boolean }[];

function classOrderFor(classes: EndClass[], multiset: number[], start: ConnectorEnd | null, end: ConnectorEnd | null): ClassOrder | null {
  // Try every order of the multiset's members, each either way round; at most 4! · 2⁴ = 384 tries.
  const k = multiset.length;
  const used = new Array<boolean>(k).fill(false);
  const order: ClassOrder = [];
  const walk = (previous: ConnectorEnd | null): boolean => {
    if (order.length === k) return end === null || previous === null || mates(previous, end);
    const tried = new Set<number>();
    for (let i = 0; i < k; i++) {
      if (used[i] || tried.has(multiset[i]!)) continue;
      tried.add(multiset[i]!);
      const c = classes[multiset[i]!]!;
      for (const reversed of c.a === c.b || endKey(c.a) === endKey(c.b) ? [false] : [false, true]) {
        const s = reversed ? c.b : c.a;
        const f = reversed ? c.a : c.b;
        if (previous !== null && !mates(previous, s)) continue;
        used[i] = true;
        order.push({ cls: multiset[i]!, reversed });
        if (walk(f)) return true;
        order.pop();
        used[i] = false;
      }
    }
    return false;
  };
  return walk(start) ? order.slice() : null;
}

/** Every valid chain, in structure-of-arrays form, bucketed by delay. */
interface ChainSet {
  count: number;
  width: number;
  delay: Float64Array;
  length: Float64Array;
  segments: Uint8Array;
  /** width slots per chain: part index or -1. */
  parts: Int32Array;
  /** Same layout: 1 when the part is used reversed. */
  reversed: Uint8Array;
  bucketWidthPs: number;
  minDelay: number;
  /** Chain indices sorted by bucket; bucketStart[k]..bucketStart[k+1] are bucket k. */
  order: Uint32Array;
  bucketStart: Uint32Array;
  buckets: number;
  /** Per segment count, the buckets that hold chains. */
  nonEmpty: number[][];
}

/**
 * Every valid chain of up to maxSegments parts. With `tripleWindows` (sorted disjoint [lo, hi] pairs, flat), chains
 * of three parts are only made when their delay lies in one of the windows (see solveCables).
 */
function buildChains(problem: SolverProblem, start: ConnectorEnd | null, bucketWidthPs: number, tripleWindows: number[] | null = null): ChainSet {
  const { parts, maxSegments } = problem;
  const maxChains = problem.maxChains ?? DEFAULT_MAX_CHAINS;
  const byKey = new Map<string, EndClass>();
  parts.forEach((p, i) => {
    const [x, y] = [endKey(p.ends[0]), endKey(p.ends[1])];
    const key = x <= y ? `${x}|${y}` : `${y}|${x}`;
    let c = byKey.get(key);
    if (!c) {
      c = x <= y ? { a: p.ends[0], b: p.ends[1], parts: [] } : { a: p.ends[1], b: p.ends[0], parts: [] };
      byKey.set(key, c);
    }
    c.parts.push(i);
  });
  const classes = [...byKey.values()];
  // Members by delay (then index): any fixed order makes each set once; this one lets windows be searched.
  for (const c of classes) c.parts.sort((x, y) => parts[x]!.delayPs - parts[y]!.delayPs || x - y);
  const end = problem.pathEnd ?? null;

  // Class multisets (non-decreasing class indices) of 1..maxSegments members that have a mating order.
  const plans: { multiset: number[]; order: ClassOrder }[] = [];
  const grow = (multiset: number[], from: number) => {
    if (multiset.length > 0) {
      const counts = new Map<number, number>();
      for (const c of multiset) counts.set(c, (counts.get(c) ?? 0) + 1);
      const enough = [...counts].every(([c, n]) => classes[c]!.parts.length >= n);
      if (!enough) return;
      const order = classOrderFor(classes, multiset, start, end);
      if (order) plans.push({ multiset: multiset.slice(), order });
    }
    if (multiset.length === maxSegments) return;
    for (let c = from; c < classes.length; c++) {
      multiset.push(c);
      grow(multiset, c);
      multiset.pop();
    }
  };
  grow([], 0);

  // Count first, so the arrays are allocated once.
  const choose = (n: number, k: number) => {
    let r = 1;
    for (let i = 0; i < k; i++) r = (r * (n - i)) / (i + 1);
    return Math.round(r);
  };
  const partDelay = parts.map((p) => p.delayPs);
  const partLength = parts.map((p) => p.lengthMm);
  const sameAsOf = (plan: { order: ClassOrder }) =>
    plan.order.map((o, j) => {
      let last = -1;
      for (let i = 0; i < j; i++) if (plan.order[i]!.cls === o.cls) last = i;
      return last;
    });
  /** First index of `sorted` (ascending) whose value is ≥ x. */
  const lowerBound = (sorted: Float64Array, x: number) => {
    let lo = 0;
    let hi = sorted.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (sorted[mid]! < x) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  };
  const windowHighs = Float64Array.from({ length: (tripleWindows?.length ?? 0) / 2 }, (_, w) => tripleWindows![2 * w + 1]!);
  /** The three-part chains of a plan whose delay lies in a window: visit(a, b, c part indices, delay). */
  const windowedTriples = (plan: { order: ClassOrder }, visit: (pa: number, pb: number, pc: number, delay: number) => void) => {
    const [m0, m1, m2] = plan.order.map((o) => classes[o.cls]!.parts);
    const sameAs = sameAsOf(plan);
    const d2 = Float64Array.from(m2!, (p) => partDelay[p]!);
    for (let a = 0; a < m0!.length; a++) {
      for (let b = sameAs[1] === 0 ? a + 1 : 0; b < m1!.length; b++) {
        const dAB = partDelay[m0![a]!]! + partDelay[m1![b]!]!;
        const cStart = sameAs[2] === 0 ? a + 1 : sameAs[2] === 1 ? b + 1 : 0;
        if (cStart >= d2.length) continue;
        // Only the windows that the third part's delays can reach from here.
        const reachLo = dAB + d2[cStart]! - EPS;
        const reachHi = dAB + d2[d2.length - 1]! + EPS;
        for (let w = 2 * lowerBound(windowHighs, reachLo); w < tripleWindows!.length && tripleWindows![w]! <= reachHi; w += 2) {
          const from = Math.max(cStart, lowerBound(d2, tripleWindows![w]! - dAB - EPS));
          const to = lowerBound(d2, tripleWindows![w + 1]! - dAB + EPS);
          for (let c = from; c < to; c++) visit(m0![a]!, m1![b]!, m2![c]!, dAB + d2[c]!);
        }
      }
    }
  };
  let total = 0;
  for (const plan of plans) {
    if (tripleWindows && plan.order.length === 3) {
      windowedTriples(plan, () => total++);
      continue;
    }
    const counts = new Map<number, number>();
    for (const c of plan.multiset) counts.set(c, (counts.get(c) ?? 0) + 1);
    let n = 1;
    for (const [c, k] of counts) n *= choose(classes[c]!.parts.length, k);
    total += n;
  }
  if (total > maxChains) {
    throw new SolverLimitError(
      `${total.toLocaleString('en')} chains of up to ${maxSegments} segments can be built from ${parts.length} parts, more than the solver's limit of ${maxChains.toLocaleString('en')}: allow fewer segments per path or offer fewer parts.`,
    );
  }

  const width = Math.max(1, maxSegments);
  const set: ChainSet = {
    count: 0,
    width,
    delay: new Float64Array(total),
    length: new Float64Array(total),
    segments: new Uint8Array(total),
    parts: new Int32Array(total * width).fill(-1),
    reversed: new Uint8Array(total * width),
    bucketWidthPs,
    minDelay: 0,
    order: new Uint32Array(total),
    bucketStart: new Uint32Array(1),
    buckets: 0,
    nonEmpty: [],
  };
  // Whether a part is stored b-end first relative to its class's canonical (a, b): the plan's turn is then inverted.
  const storedBFirst = new Uint8Array(parts.length);
  for (const c of classes) for (const p of c.parts) storedBFirst[p] = endKey(parts[p]!.ends[0]) !== endKey(c.a) ? 1 : 0;
  const push = (k: number, delay: number, length: number, picks: number[], turns: boolean[]) => {
    const i = set.count++;
    set.delay[i] = delay;
    set.length[i] = length;
    set.segments[i] = k;
    const at = i * width;
    for (let j = 0; j < k; j++) {
      const p = picks[j]!;
      set.parts[at + j] = p;
      set.reversed[at + j] = turns[j]! !== (storedBFirst[p] === 1) ? 1 : 0;
    }
  };

  for (const plan of plans) {
    // Positions pick distinct parts of their class; a position of the same class as an earlier one takes a later
    // member, so each set of parts is made once. Loops for up to three segments, recursion beyond.
    const k = plan.order.length;
    const members = plan.order.map((o) => classes[o.cls]!.parts);
    const turns = plan.order.map((o) => o.reversed);
    const sameAs = sameAsOf(plan);
    const picks: number[] = new Array(k);
    if (tripleWindows && k === 3) {
      windowedTriples(plan, (pa, pb, pc, delay) => {
        picks[0] = pa;
        picks[1] = pb;
        picks[2] = pc;
        push(3, delay, partLength[pa]! + partLength[pb]! + partLength[pc]!, picks, turns);
      });
      continue;
    }
    const idx = new Int32Array(k);
    if (k <= 3) {
      const [m0, m1, m2] = members;
      for (let a = 0; a < m0!.length; a++) {
        const pa = m0![a]!;
        picks[0] = pa;
        idx[0] = a;
        const dA = partDelay[pa]!;
        const lA = partLength[pa]!;
        if (k === 1) {
          push(1, dA, lA, picks, turns);
          continue;
        }
        for (let b = sameAs[1] === 0 ? a + 1 : 0; b < m1!.length; b++) {
          const pb = m1![b]!;
          picks[1] = pb;
          idx[1] = b;
          const dAB = dA + partDelay[pb]!;
          const lAB = lA + partLength[pb]!;
          if (k === 2) {
            push(2, dAB, lAB, picks, turns);
            continue;
          }
          for (let c = sameAs[2]! >= 0 ? idx[sameAs[2]!]! + 1 : 0; c < m2!.length; c++) {
            const pc = m2![c]!;
            picks[2] = pc;
            push(3, dAB + partDelay[pc]!, lAB + partLength[pc]!, picks, turns);
          }
        }
      }
      continue;
    }
    const place = (pos: number, delay: number, length: number) => {
      if (pos === k) {
        push(k, delay, length, picks, turns);
        return;
      }
      const list = members[pos]!;
      for (let j = sameAs[pos]! >= 0 ? idx[sameAs[pos]!]! + 1 : 0; j < list.length; j++) {
        const p = list[j]!;
        picks[pos] = p;
        idx[pos] = j;
        place(pos + 1, delay + partDelay[p]!, length + partLength[p]!);
      }
    };
    place(0, 0, 0);
  }

  // Counting sort by (segments, delay bucket): the search asks for chains of at most so many segments in a window.
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < set.count; i++) {
    min = Math.min(min, set.delay[i]!);
    max = Math.max(max, set.delay[i]!);
  }
  if (set.count === 0) {
    min = 0;
    max = 0;
  }
  set.minDelay = min;
  const buckets = Math.floor((max - min) / bucketWidthPs) + 1;
  const slots = buckets * width;
  const counts = new Uint32Array(slots + 1);
  const slotOf = (i: number) => (set.segments[i]! - 1) * buckets + Math.floor((set.delay[i]! - min) / bucketWidthPs);
  for (let i = 0; i < set.count; i++) counts[slotOf(i) + 1]! += 1;
  for (let b = 0; b < slots; b++) counts[b + 1]! += counts[b]!;
  set.bucketStart = counts.slice();
  const fill = counts.slice();
  for (let i = 0; i < set.count; i++) set.order[fill[slotOf(i)]!++] = i;
  set.buckets = buckets;
  set.nonEmpty = Array.from({ length: width }, (_, level) => {
    const list: number[] = [];
    for (let b = 0; b < buckets; b++) if (counts[level * buckets + b + 1]! > counts[level * buckets + b]!) list.push(b);
    return list;
  });
  return set;
}

/** The bucket range [first, last] of delays [lo, hi], or null when it lies outside every chain's delay. */
function bucketRange(set: ChainSet, lo: number, hi: number): [number, number] | null {
  if (set.count === 0 || hi < lo) return null;
  const first = Math.max(0, Math.floor((lo - set.minDelay) / set.bucketWidthPs));
  const last = Math.min(set.buckets - 1, Math.floor((hi - set.minDelay) / set.bucketWidthPs));
  return last < first ? null : [first, last];
}

/** Chains of at most `maxSegments` segments with delay in [lo, hi], appended to `out` (indices). */
function chainsIn(set: ChainSet, lo: number, hi: number, maxSegments: number, out: number[]): void {
  const range = bucketRange(set, lo, hi);
  if (!range) return;
  for (let seg = 1; seg <= Math.min(maxSegments, set.width); seg++) {
    const base = (seg - 1) * set.buckets;
    for (let j = set.bucketStart[base + range[0]]!; j < set.bucketStart[base + range[1] + 1]!; j++) {
      const c = set.order[j]!;
      const d = set.delay[c]!;
      if (d >= lo - EPS && d <= hi + EPS) out.push(c);
    }
  }
}

/** Whether a chain of at most `maxSegments` may lie in [lo, hi] (bucket precision: a near miss may say yes, never a wrong no). */
function anyIn(set: ChainSet, lo: number, hi: number, maxSegments: number): boolean {
  const range = bucketRange(set, lo, hi);
  if (!range) return false;
  for (let seg = 1; seg <= Math.min(maxSegments, set.width); seg++) {
    const base = (seg - 1) * set.buckets;
    if (set.bucketStart[base + range[1] + 1]! > set.bucketStart[base + range[0]]!) return true;
  }
  return false;
}

// ------------------------------------------------------------------ search

interface Found {
  score: number;
  error: number;
  chains: number[];
}

interface PathSpec {
  source: number;
  channel: number;
  target: number;
  frequencyHz: number;
}

/** Each chain's score on each path (segments, loss at the path's frequency, or length) and lower bounds of the rest. */
interface Scoring {
  scoreArrays: ArrayLike<number>[];
  /** rest[i]: the least score paths i… can add together. */
  rest: Float64Array;
}

function scoringOf(problem: SolverProblem, set: ChainSet, paths: PathSpec[], floors: number[]): Scoring {
  const lossCache = new Map<number, Float64Array>();
  const lossOf = (frequencyHz: number) => {
    let a = lossCache.get(frequencyHz);
    if (!a) {
      const perPart = problem.parts.map((p) => partLossDb(p, frequencyHz));
      a = new Float64Array(set.count);
      for (let c = 0; c < set.count; c++) {
        let sum = 0;
        for (let j = 0; j < set.width; j++) {
          const p = set.parts[c * set.width + j]!;
          if (p < 0) break;
          sum += perPart[p]!;
        }
        a[c] = sum;
      }
      lossCache.set(frequencyHz, a);
    }
    return a;
  };
  const scoreArrays: ArrayLike<number>[] = paths.map((p) => (problem.prefer === 'lowest-loss' ? lossOf(p.frequencyHz) : problem.prefer === 'least-length' ? set.length : set.segments));
  const minCache = new Map<ArrayLike<number>, number>();
  const minScores = scoreArrays.map((a) => {
    let m = minCache.get(a);
    if (m === undefined) {
      m = Infinity;
      for (let c = 0; c < set.count; c++) if (a[c]! < m) m = a[c]!;
      minCache.set(a, m);
    }
    return m;
  });
  // rest[i]: the paths of i's source from i on need at least their least scores (or, from the source's first path
  // on, its best score alone), and every later source at least its best score alone (`floors`, 0 when unknown).
  const rest = new Float64Array(paths.length + 1);
  let later = 0;
  let within = 0;
  for (let i = paths.length - 1; i >= 0; i--) {
    const s = paths[i]!.source;
    within += minScores[i]!;
    const first = i === 0 || paths[i - 1]!.source !== s;
    rest[i] = (first ? Math.max(within, floors[s] ?? 0) : within) + later;
    if (first) {
      later += Math.max(within, floors[s] ?? 0);
      within = 0;
    }
  }
  return { scoreArrays, rest };
}

interface SearchOptions {
  /** Largest |error| allowed, ps: the windows keep each source's spread of D − T within 2·bound. */
  bound: number;
  /** Rank by (error, score) instead of (score, error). */
  byError: boolean;
  /** Most segments over all paths together (Infinity: no limit). */
  segmentBudget: number;
  /** Proposals found so far (they prune the search; the result holds the best of both). */
  seed: Found[];
}

/**
 * The best `limit` complete assignments, ranked by (score, error) or by (error, score), among those within
 * `bound` and `segmentBudget`. Exhaustive within those limits: every cut is by a lower bound.
 */
function search(problem: SolverProblem, set: ChainSet, paths: PathSpec[], scoring: Scoring, options: SearchOptions, budget: { nodes: number; max: number }): Found[] {
  const { bound, byError, segmentBudget } = options;
  const nParts = problem.parts.length;
  const used = new Uint8Array(nParts);
  const chosen = new Int32Array(paths.length);
  const S = problem.sources.length;
  const uMin = new Float64Array(S).fill(Infinity);
  const uMax = new Float64Array(S).fill(-Infinity);
  const best: Found[] = options.seed.slice();
  const limit = problem.limit;

  const { scoreArrays, rest } = scoring;
  const bySegments = problem.prefer === 'fewest-segments';
  let minSegments = Infinity;
  for (let c = 0; c < set.count && minSegments > 1; c++) minSegments = Math.min(minSegments, set.segments[c]!);

  const worse = (a: { score: number; error: number }, b: { score: number; error: number }) =>
    byError
      ? a.error > b.error + EPS || (Math.abs(a.error - b.error) <= EPS && a.score > b.score + EPS)
      : a.score > b.score + EPS || (Math.abs(a.score - b.score) <= EPS && a.error > b.error + EPS);
  /** Whether a branch with these lower bounds can still enter the best list. */
  const hopeful = (lbScore: number, lbError: number) => {
    if (lbError > bound + EPS) return false;
    if (best.length < limit) return true;
    const kth = best[best.length - 1]!;
    return byError
      ? lbError < kth.error - EPS || (Math.abs(lbError - kth.error) <= EPS && lbScore < kth.score - EPS)
      : lbScore < kth.score - EPS || (Math.abs(lbScore - kth.score) <= EPS && lbError < kth.error - EPS);
  };
  const errorNow = () => {
    let e = 0;
    for (let s = 0; s < S; s++) if (uMax[s]! > uMin[s]!) e = Math.max(e, (uMax[s]! - uMin[s]!) / 2);
    return e;
  };
  /**
   * One key for wirings that differ only by swapping chains of equal delay between a source's inputs: the same
   * chains per source, and the same delay on every path. They are the same proposal to the bench.
   */
  const wiringKey = (chains: ArrayLike<number>) => {
    const perSource = new Map<number, number[]>();
    const delays: string[] = [];
    for (let i = 0; i < paths.length; i++) {
      const list = perSource.get(paths[i]!.source) ?? [];
      list.push(chains[i]!);
      perSource.set(paths[i]!.source, list);
      delays.push(set.delay[chains[i]!]!.toFixed(6));
    }
    return `${[...perSource.values()].map((l) => [...l].sort((a, b) => a - b).join(',')).join('|')}#${delays.join(',')}`;
  };
  const seen = new Set(best.map((f) => wiringKey(f.chains)));
  const record = (scoreSum: number) => {
    const key = wiringKey(chosen);
    if (seen.has(key)) return;
    const found: Found = { score: scoreSum, error: errorNow(), chains: Array.from(chosen) };
    let i = best.length;
    while (i > 0 && worse(best[i - 1]!, found)) i--;
    if (i >= limit) return;
    best.splice(i, 0, found);
    seen.add(key);
    if (best.length > limit) seen.delete(wiringKey(best.pop()!.chains));
  };
  const takes = (c: number) => {
    for (let j = 0; j < set.width; j++) {
      const p = set.parts[c * set.width + j]!;
      if (p < 0) break;
      if (used[p]) return false;
    }
    return true;
  };
  const mark = (c: number, v: 0 | 1) => {
    for (let j = 0; j < set.width; j++) {
      const p = set.parts[c * set.width + j]!;
      if (p < 0) break;
      used[p] = v;
    }
  };

  /**
   * The non-empty delay buckets of `seg`-segment chains that can start the source at `depth`: every later input of
   * the source has some chain of at most `othersMaxSeg` segments in its shifted window. Depends on neither the
   * parts in use nor the branch, so it is worked out once per search and reused by every branch that reaches here.
   */
  const passCache = new Map<string, number[]>();
  const passingBuckets = (depth: number, seg: number, othersMaxSeg: number): number[] => {
    const key = `${depth}|${seg}|${othersMaxSeg}`;
    let list = passCache.get(key);
    if (!list) {
      list = [];
      const path = paths[depth]!;
      const others = paths.filter((p, i) => i > depth && p.source === path.source);
      for (const b of set.nonEmpty[seg - 1]!) {
        const lo = set.minDelay + b * set.bucketWidthPs - path.target;
        const hi = lo + set.bucketWidthPs;
        if (others.every((o) => anyIn(set, lo + o.target - 2 * bound, hi + o.target + 2 * bound, othersMaxSeg))) list.push(b);
      }
      passCache.set(key, list);
    }
    return list;
  };

  const window: number[][] = paths.map(() => []);
  const visit = (depth: number, scoreSum: number, segSum: number) => {
    if (budget.nodes++ > budget.max) return;
    if (depth === paths.length) {
      record(scoreSum);
      return;
    }
    const path = paths[depth]!;
    const s = path.source;
    const after = paths.length - depth - 1;
    // Segments this path may take so that every later path can still have one.
    const maxSegHere = Math.min(problem.maxSegments, segmentBudget - segSum - after);
    if (maxSegHere < 1) return;
    const savedMin = uMin[s]!;
    const savedMax = uMax[s]!;
    const scores = scoreArrays[depth]!;
    /** Try chain c here; false only when its score alone rules it out (later candidates, in score order, too). */
    const tryChain = (c: number) => {
      budget.nodes++;
      const u = set.delay[c]! - path.target;
      const lo = Math.min(savedMin, u);
      const hi = Math.max(savedMax, u);
      const lbError = Math.max(errorNow(), (hi - lo) / 2);
      const sc = scores[c]!;
      if (!hopeful(scoreSum + sc + rest[depth + 1]!, lbError)) {
        // Ruled out by its score alone (then no later candidate, in score order, can do better)?
        return !(best.length >= limit && scoreSum + sc + rest[depth + 1]! > best[best.length - 1]!.score + EPS);
      }
      if (!takes(c)) return true;
      if (bySegments) {
        // A tighter bound: the later inputs of this source need at least the fewest segments found in their windows.
        let need = scoreSum + sc + rest[depth + 1]!;
        for (let i = depth + 1; i < paths.length && paths[i]!.source === s; i++) {
          const t = paths[i]!.target;
          let level = 1;
          while (level <= problem.maxSegments && !anyIn(set, hi - 2 * bound + t, lo + 2 * bound + t, level)) level++;
          if (level > problem.maxSegments) return true;
          need += level - minSegments;
        }
        if (!hopeful(need, lbError) || need > segmentBudget + EPS) return true;
      }
      uMin[s] = lo;
      uMax[s] = hi;
      chosen[depth] = c;
      mark(c, 1);
      visit(depth + 1, scoreSum + sc, segSum + set.segments[c]!);
      mark(c, 0);
      uMin[s] = savedMin;
      uMax[s] = savedMax;
      return true;
    };

    if (!Number.isFinite(savedMin)) {
      // The first input of a source may take any chain. Walk the chains by segments, then by delay bucket; skip a
      // bucket whole when another input of the source has no chain at all in its shifted window.
      for (let seg = 1; seg <= maxSegHere; seg++) {
        const othersMaxSeg = Math.min(problem.maxSegments, segmentBudget - segSum - seg - (after - 1));
        if (after > 0 && othersMaxSeg < 1) break;
        const base = (seg - 1) * set.buckets;
        for (const b of passingBuckets(depth, seg, othersMaxSeg)) {
          for (let j = set.bucketStart[base + b]!; j < set.bucketStart[base + b + 1]!; j++) {
            tryChain(set.order[j]!);
            if (budget.nodes > budget.max) return;
          }
        }
      }
      return;
    }
    // A further input of the source: only chains that keep the spread within 2·bound.
    const list = window[depth]!;
    list.length = 0;
    chainsIn(set, savedMax - 2 * bound + path.target, savedMin + 2 * bound + path.target, maxSegHere, list);
    // chainsIn lists by segments already: that is the score order when fewest segments is the preference.
    if (list.length > 1 && !bySegments) {
      const centre = (savedMin + savedMax) / 2 + path.target;
      list.sort((a, b) => scores[a]! - scores[b]! || Math.abs(set.delay[a]! - centre) - Math.abs(set.delay[b]! - centre));
    }
    for (const c of list) {
      // Sorted by score: when one candidate cannot help on score, no later one can; ranked by error, go on.
      if (!tryChain(c) && !byError) break;
      if (budget.nodes > budget.max) return;
    }
  };
  visit(0, 0, 0);
  return best;
}

/**
 * The best proposals within `bound`: first by growing the budget of segments over all paths (few segments are
 * cheap to search and give a good first answer), then, for loss or length, by one search without a segment
 * budget that the first answers prune.
 */
function bestWithin(problem: SolverProblem, set: ChainSet, paths: PathSpec[], bound: number, byError: boolean, budget: { nodes: number; max: number }, maxBudget = Infinity): Found[] {
  const most = Math.min(paths.length * problem.maxSegments, maxBudget);
  // With several sources: each one's best score alone (its parts free of the others) bounds what it needs
  // together with them; a source with no answer alone has none together either.
  const sources = [...new Set(paths.map((p) => p.source))];
  const floors: number[] = [];
  if (sources.length > 1 && !byError) {
    for (const s of sources) {
      const alone = bestWithin({ ...problem, limit: 1 }, set, paths.filter((p) => p.source === s), bound, false, budget);
      if (budget.nodes > budget.max) break;
      if (!alone.length) return [];
      floors[s] = alone[0]!.score;
    }
  }
  const scoring = scoringOf(problem, set, paths, floors);
  const firstBudget = problem.prefer === 'fewest-segments' ? Math.max(paths.length, Math.ceil(rest0(scoring) - EPS)) : paths.length;
  let found: Found[] = [];
  for (let segments = firstBudget; segments <= most; segments++) {
    found = search(problem, set, paths, scoring, { bound, byError, segmentBudget: segments, seed: found }, budget);
    if (budget.nodes > budget.max) return found;
    // Ranked by segments (and not by error), `limit` answers within this budget are the best there are.
    if (found.length >= problem.limit && problem.prefer === 'fewest-segments' && !byError) return found;
    if (found.length >= problem.limit) break;
  }
  if (problem.prefer === 'fewest-segments' && !byError) return found;
  return search(problem, set, paths, scoring, { bound, byError, segmentBudget: Infinity, seed: found }, budget);
}

/** The least total score any complete assignment can have. */
const rest0 = (scoring: Scoring) => scoring.rest[0]!;

// ------------------------------------------------------------------ answer

function describeChain(problem: SolverProblem, set: ChainSet, c: number, frequencyHz: number, previous: ConnectorEnd | null): { segments: ProposalSegment[]; cautions: string[]; loss: number } {
  const segments: ProposalSegment[] = [];
  const cautions: string[] = [];
  let loss = 0;
  let before = previous;
  for (let j = 0; j < set.width; j++) {
    const pi = set.parts[c * set.width + j]!;
    if (pi < 0) break;
    const part = problem.parts[pi]!;
    const reversed = set.reversed[c * set.width + j] === 1;
    const s = startOf(part, reversed);
    const f = finishOf(part, reversed);
    if (before) {
      const warning = matingWarning(before, s);
      if (warning) cautions.push(`${part.tag}: ${warning}`);
    }
    const l = partLossDb(part, frequencyHz);
    loss += l;
    segments.push({ partId: part.id, tag: part.tag, kind: part.kind, reversed, delayPs: part.delayPs, delaySource: part.delaySource, lossDb: l, connectors: `${describeEnd(s)} → ${describeEnd(f)}` });
    before = f;
  }
  if (before && problem.pathEnd) {
    const warning = matingWarning(before, problem.pathEnd);
    if (warning) cautions.push(`into the chip input: ${warning}`);
  }
  return { segments, cautions, loss };
}

function toProposal(problem: SolverProblem, set: ChainSet, paths: PathSpec[], found: Found, rank: number, start: ConnectorEnd | null): Proposal {
  const shared = problem.shared ?? [];
  const sharedDelay = shared.reduce((a, p) => a + p.delayPs, 0);
  const sharedLength = shared.reduce((a, p) => a + p.lengthMm, 0);
  const S = problem.sources.length;
  const offsets = Array.from({ length: S }, (_, s) => {
    const us = paths.map((p, i) => (p.source === s ? set.delay[found.chains[i]!]! - p.target : null)).filter((u): u is number => u !== null);
    return (Math.max(...us) + Math.min(...us)) / 2;
  });
  const out: ProposalPath[] = paths.map((p, i) => {
    const c = found.chains[i]!;
    const { segments, cautions, loss } = describeChain(problem, set, c, p.frequencyHz, start);
    const sharedLoss = shared.reduce((a, part) => a + partLossDb(part, p.frequencyHz), 0);
    const chainDelay = set.delay[c]!;
    return {
      source: problem.sources[p.source]!.key,
      channel: p.channel,
      chain: segments,
      chainDelayPs: chainDelay,
      delayPs: chainDelay + sharedDelay,
      targetDelayPs: p.target + offsets[p.source]! + sharedDelay,
      errorPs: chainDelay - p.target - offsets[p.source]!,
      lossDb: loss + sharedLoss,
      lengthMm: set.length[c]! + sharedLength,
      segments: set.segments[c]!,
      cautions,
    };
  });
  const sources: ProposalSource[] = problem.sources.map((src) => {
    const mine = out.filter((p) => p.source === src.key).sort((a, b) => a.channel - b.channel);
    const relative = mine.map((p) => p.chainDelayPs - mine[0]!.chainDelayPs);
    const targets = targetDelays(problem, src);
    const angle = emulatedAngleDeg(relative, problem.spacingMm);
    const targetAngle = src.targetAngleDeg ?? emulatedAngleDeg(targets, problem.spacingMm);
    return {
      key: src.key,
      frequencyHz: src.frequencyHz,
      targetAngleDeg: targetAngle,
      angleDeg: angle,
      angleErrorDeg: angle !== null && targetAngle !== null ? angle - targetAngle : null,
      targetRelativeDelaysPs: targets,
      relativeDelaysPs: relative,
      maxErrorPs: Math.max(...mine.map((p) => Math.abs(p.errorPs))),
    };
  });
  const maxError = Math.max(0, ...out.map((p) => Math.abs(p.errorPs)));
  return {
    rank,
    meetsTolerance: maxError <= problem.tolerancePs + EPS,
    maxErrorPs: maxError,
    totals: { segments: out.reduce((a, p) => a + p.segments, 0), lossDb: out.reduce((a, p) => a + p.lossDb, 0), lengthMm: out.reduce((a, p) => a + p.lengthMm, 0) },
    sources,
    paths: out,
  };
}

function limitsOf(problem: SolverProblem, set: ChainSet, paths: PathSpec[], closest: Proposal | undefined): string[] {
  const limits: string[] = [];
  const nPaths = paths.length;
  if (problem.parts.length < nPaths) limits.push(`Only ${problem.parts.length} usable parts for ${nPaths} paths: every path needs at least one.`);
  if (set.count === 0) {
    limits.push(`No chain of up to ${problem.maxSegments} segments can be built from the usable parts whose connectors mate${problem.pathEnd || problem.pathStart ? ' at both ends of the path' : ''}.`);
    return limits;
  }
  let min = Infinity;
  let max = -Infinity;
  for (let c = 0; c < set.count; c++) {
    min = Math.min(min, set.delay[c]!);
    max = Math.max(max, set.delay[c]!);
  }
  for (const src of problem.sources) {
    const t = targetDelays(problem, src);
    const needed = Math.max(...t) - Math.min(...t);
    if (needed > max - min + problem.tolerancePs * 2) {
      limits.push(
        `${src.key} needs ${needed.toFixed(1)} ps between its earliest and latest input, but the longest usable chain (${max.toFixed(1)} ps) is only ${(max - min).toFixed(1)} ps longer than the shortest (${min.toFixed(1)} ps): longer cables, or more segments per path, are needed.`,
      );
    }
  }
  if (closest) {
    limits.push(`No combination of the usable parts comes closer than ${closest.maxErrorPs.toFixed(2)} ps (tolerance ${problem.tolerancePs} ps): cables graded in finer steps of length, or measured delays, would help.`);
    if (closest.paths.some((p) => p.segments === problem.maxSegments)) {
      limits.push(`The closest proposal already uses ${problem.maxSegments} segment${problem.maxSegments === 1 ? '' : 's'} on some paths: allowing more segments per path may get closer.`);
    }
  }
  return limits;
}

/**
 * The error of a complete assignment found greedily (an upper bound of the best error), or Infinity: for a few
 * first-input chains spread over the delays, every further input takes the free chain nearest its target.
 */
function greedyErrorPs(set: ChainSet, paths: PathSpec[], nParts: number): number {
  let best = Infinity;
  const tries = Math.min(set.count, 16);
  const used = new Uint8Array(nParts);
  const partsOf = (c: number) => {
    const out: number[] = [];
    for (let j = 0; j < set.width; j++) {
      const p = set.parts[c * set.width + j]!;
      if (p < 0) break;
      out.push(p);
    }
    return out;
  };
  for (let t = 0; t < tries; t++) {
    used.fill(0);
    let error = 0;
    let complete = true;
    let offset = 0;
    for (const [i, path] of paths.entries()) {
      const first = i === 0 || paths[i - 1]!.source !== path.source;
      let pick = -1;
      if (first) {
        // The t-th of `tries` chains spread over the delay order.
        pick = set.order[Math.floor((t * set.count) / tries)]!;
        if (partsOf(pick).some((p) => used[p])) pick = -1;
      }
      if (pick < 0) {
        let distance = Infinity;
        const want = (first ? set.delay[set.order[Math.floor((t * set.count) / tries)]!]! - path.target : offset) + path.target;
        for (let c = 0; c < set.count; c++) {
          const d = Math.abs(set.delay[c]! - want);
          if (d < distance && !partsOf(c).some((p) => used[p])) {
            distance = d;
            pick = c;
          }
        }
      }
      if (pick < 0) {
        complete = false;
        break;
      }
      for (const p of partsOf(pick)) used[p] = 1;
      const u = set.delay[pick]! - path.target;
      if (first) offset = u;
      // Errors about the first input's offset: at most twice the centred error, so still an upper bound.
      error = Math.max(error, Math.abs(u - offset));
    }
    if (complete) best = Math.min(best, error);
  }
  return best;
}

/** Sorted, merged [lo, hi] intervals (flat pairs). */
function mergeIntervals(intervals: [number, number][]): [number, number][] {
  intervals.sort((a, b) => a[0] - b[0]);
  const out: [number, number][] = [];
  for (const [lo, hi] of intervals) {
    const last = out[out.length - 1];
    if (last && lo <= last[1]) last[1] = Math.max(last[1], hi);
    else out.push([lo, hi]);
  }
  return out;
}

function intersectIntervals(a: [number, number][], b: [number, number][]): [number, number][] {
  const out: [number, number][] = [];
  let i = 0;
  let j = 0;
  while (i < a.length && j < b.length) {
    const lo = Math.max(a[i]![0], b[j]![0]);
    const hi = Math.min(a[i]![1], b[j]![1]);
    if (lo <= hi) out.push([lo, hi]);
    if (a[i]![1] < b[j]![1]) i++;
    else j++;
  }
  return out;
}

/**
 * Delays a three-part chain may have in an answer whose other paths are all single parts (one source): on path i,
 * for every other input j some single part x must keep |(d − T_i) − (x − T_j)| ≤ 2·bound. The union over i.
 */
function tripleWindowsFor(paths: PathSpec[], singleDelays: number[], bound: number): number[] {
  const all: [number, number][] = [];
  for (const [i, pi] of paths.entries()) {
    let allowed: [number, number][] | null = null;
    for (const [j, pj] of paths.entries()) {
      if (j === i) continue;
      const shift = pi.target - pj.target;
      const around = mergeIntervals(singleDelays.map((x) => [x + shift - 2 * bound, x + shift + 2 * bound] as [number, number]));
      allowed = allowed === null ? around : intersectIntervals(allowed, around);
      if (!allowed.length) break;
    }
    if (allowed) all.push(...allowed);
  }
  return mergeIntervals(all).flat();
}

/** Find the best proposals for `problem`. Throws SolverLimitError when its bounds would be too large to search. */
export function solveCables(problem: SolverProblem): SolverAnswer {
  const shared = problem.shared ?? [];
  const start = shared.length ? shared[shared.length - 1]!.ends[1] : (problem.pathStart ?? null);
  const paths: PathSpec[] = [];
  problem.sources.forEach((src, s) => {
    const t = targetDelays(problem, src);
    for (let n = 0; n < problem.elements; n++) paths.push({ source: s, channel: n, target: t[n]!, frequencyHz: src.frequencyHz });
  });
  const tol = problem.tolerancePs;
  const budget = { nodes: 0, max: problem.maxNodes ?? DEFAULT_MAX_NODES };

  // Buckets of about twice the tolerance: a window of the search spans a few of them.
  const width = Math.max(2 * tol, 0.05);
  let set: ChainSet | null = null;
  let found: Found[] = [];
  // (Below about 40 parts making every chain is cheap, and the detour would only add work.)
  if (problem.parts.length >= Math.max(paths.length, 40) && problem.prefer === 'fewest-segments' && problem.maxSegments === 3 && problem.sources.length === 1) {
    // Most of the work is making every three-part chain. With the fewest segments wanted, first look at total
    // budgets up to two more segments than paths: there a three-part chain can only sit beside single parts on
    // every other path, so only three-part chains whose delay fits some single part's window on every other
    // input are made. When that already gives `limit` proposals, they are the best: anything else has more
    // segments. Otherwise all chains are made and the search goes on.
    const singles = buildChains({ ...problem, maxSegments: 1 }, start, width);
    const windows = tripleWindowsFor(paths, Array.from(singles.delay.subarray(0, singles.count)), tol);
    const lazy = buildChains(problem, start, width, windows);
    const within = bestWithin(problem, lazy, paths, tol, false, budget, paths.length + 2);
    if (within.length >= problem.limit) {
      set = lazy;
      found = within;
    }
  }
  if (!set) {
    set = buildChains(problem, start, width);
    found = problem.parts.length >= paths.length ? bestWithin(problem, set, paths, tol, false, budget) : [];
  }
  const feasible = found.length > 0;
  if (!feasible && set.count > 0 && problem.parts.length >= paths.length) {
    // Nothing within the tolerance: widen the bound until the closest proposals exist, ranked by error.
    // No error can exceed half of (chain delay spread + target spread): with that bound every assignment is in.
    let minDelay = Infinity;
    let maxDelay = -Infinity;
    for (let c = 0; c < set.count; c++) {
      minDelay = Math.min(minDelay, set.delay[c]!);
      maxDelay = Math.max(maxDelay, set.delay[c]!);
    }
    const targetSpread = Math.max(...paths.map((p) => p.target)) - Math.min(...paths.map((p) => p.target));
    const widest = (maxDelay - minDelay + targetSpread) / 2 + EPS;
    // Start from the error of some complete assignment (a greedy one), so one search usually suffices.
    let bound = Math.max(2 * tol, Math.min(greedyErrorPs(set, paths, problem.parts.length), widest));
    for (;;) {
      bound = Math.min(bound, widest + tol);
      if (set.bucketWidthPs < bound / 4) set = buildChains(problem, start, bound);
      found = bestWithin(problem, set, paths, bound, true, budget);
      if (found.length || bound >= widest || budget.nodes > budget.max) break;
      bound *= 2;
    }
  }
  const proposals = found.map((f, i) => toProposal(problem, set, paths, f, i + 1, start));
  const complete = budget.nodes <= budget.max;
  const limits = feasible ? [] : limitsOf(problem, set, paths, proposals[0]);
  if (!complete) {
    limits.unshift(
      `The search stopped after ${budget.max.toLocaleString('en')} steps, so these are the best proposals found, not proven the best${feasible ? '' : ', and a proposal within the tolerance may exist'}: allow fewer segments per path, solve one source at a time, or offer fewer parts.`,
    );
  }
  return { feasible, proposals, limits, search: { chains: set.count, nodes: budget.nodes, complete } };
}
