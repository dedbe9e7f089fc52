import { spacingOf } from '../../../shared/domain/analysis.js';
import { describeEnds, partEnds, type ConnectorEnd } from '../../../shared/domain/connectors.js';
import { solveCables, SolverLimitError, type SolverAnswer, type SolverPart, type SolverProblem } from '../../../shared/domain/solver.js';
import type { Part } from '../../../shared/schemas/parts.js';
import type { SolverRequest, SolverResponse } from '../../../shared/schemas/solver.js';
import { AppError, notFound } from '../../lib/errors.js';
import { listParts } from '../parts/parts.service.js';
import { bookingSlot, partsHeldDuring, type PartHeld } from '../setups/setups.service.js';

/**
 * Kinds a chain is built from: cables, and adapters (barrels, savers) to join them. Pads, DC blocks and splitters
 * change the level, the band or the topology; a researcher who wants one on every path lists it as shared.
 */
const chainKinds: ReadonlySet<Part['kind']> = new Set(['cable', 'adapter']);

/** What a chain plugs into when no shared segment says it: a generator's (or splitter's) SMA jack. */
const SMA_JACK: ConnectorEnd = { type: 'sma', gender: 'female' };

/**
 * A part as the solver sees it, or null when its delay is not known. Cables: the measured delay, else the one
 * computed from length and velocity factor, and the loss per metre at its reference frequency; other kinds: the
 * entered delay and loss.
 */
export function toSolverPart(part: Part): SolverPart | null {
  if (part.delayPs === null || part.delaySource === null) return null;
  const cable = part.kind === 'cable';
  const loss = cable
    ? part.lossDbPerM !== null && part.lossRefHz !== null
      ? { dbPerM: part.lossDbPerM, refHz: part.lossRefHz }
      : null
    : part.lossDb !== null
      ? { db: part.lossDb }
      : null;
  return { id: part.id, tag: part.tag, kind: part.kind, ends: partEnds(part), delayPs: part.delayPs, delaySource: part.delaySource, lengthMm: cable ? (part.lengthMm ?? 0) : 0, loss };
}

const inBand = (part: Part, frequenciesHz: number[]) =>
  frequenciesHz.every((f) => (part.minFrequencyHz === null || f >= part.minFrequencyHz) && (part.maxFrequencyHz === null || f <= part.maxFrequencyHz));

/** The booking's slot: from the setup when one is given (and then bookingId, if given too, must be its booking). */
async function slotOf(input: SolverRequest) {
  if (input.setupId !== undefined) {
    const slot = await bookingSlot({ setupId: input.setupId });
    if (!slot) throw notFound('Setup');
    if (input.bookingId !== undefined && input.bookingId !== slot.bookingId) {
      throw new AppError(400, 'validation_failed', 'Some fields are not valid.', [{ path: 'bookingId', message: `Setup ${input.setupId} belongs to booking ${slot.bookingId}, not ${input.bookingId}` }]);
    }
    return slot;
  }
  const slot = await bookingSlot({ bookingId: input.bookingId! });
  if (!slot) throw notFound('Booking');
  return slot;
}

function solve(problem: SolverProblem): SolverAnswer {
  try {
    return solveCables(problem);
  } catch (err) {
    if (err instanceof SolverLimitError) throw new AppError(422, 'solver_limit', err.message);
    throw err;
  }
}

const tagList = (tags: string[]) => (tags.length <= 6 ? tags.join(', ') : `${tags.slice(0, 6).join(', ')} and ${tags.length - 6} more`);

/**
 * POST /api/solver: the best chains of free parts for the angles (or delays) wanted. Candidates are cables and
 * adapters with status ok, a known delay and a rated band that holds every source's frequency, that no setup of
 * another overlapping active booking wires, and that are not among the shared segments.
 */
export async function solveForBooking(input: SolverRequest): Promise<SolverResponse> {
  const slot = await slotOf(input);
  const [parts, held] = await Promise.all([listParts({}), partsHeldDuring(slot, { exceptSetupId: input.setupId ?? null })]);
  const byId = new Map(parts.map((p) => [p.id, p]));
  const heldBy = new Map<number, PartHeld[]>();
  for (const h of held) heldBy.set(h.partId, [...(heldBy.get(h.partId) ?? []), h]);
  const frequencies = input.sources.map((s) => s.frequencyHz);

  // The shared segments are the researcher's choice, but must be usable too.
  const issues: { path: string; message: string }[] = [];
  const shared: SolverPart[] = [];
  input.sharedPartIds.forEach((id, i) => {
    const path = `sharedPartIds.${i}`;
    const part = byId.get(id);
    const solverPart = part ? toSolverPart(part) : null;
    const holder = heldBy.get(id)?.[0];
    if (!part) issues.push({ path, message: `No part with id ${id}` });
    else if (part.status !== 'ok') issues.push({ path, message: `${part.tag} is marked ${part.status}` });
    else if (!solverPart) issues.push({ path, message: `${part.tag} has no known delay: record its delay first` });
    else if (holder) issues.push({ path, message: `${part.tag} is wired in “${holder.setupTitle}” for an overlapping booking` });
    else shared.push(solverPart);
  });
  if (issues.length) throw new AppError(400, 'validation_failed', 'Some fields are not valid.', issues);

  const sharedIds = new Set(input.sharedPartIds);
  const candidates: SolverPart[] = [];
  /** Parts that would be candidates but are damaged, lost or held: they matter only if they would help. */
  const leftOut: { part: SolverPart; why: 'held' | 'not-ok' }[] = [];
  const excluded: SolverResponse['excluded'] = { held: [], notOk: 0, noDelay: 0, outOfBand: 0 };
  for (const part of parts) {
    if (!chainKinds.has(part.kind) || sharedIds.has(part.id)) continue;
    const solverPart = toSolverPart(part);
    const usable = solverPart !== null && inBand(part, frequencies);
    if (part.status !== 'ok') {
      excluded.notOk++;
      if (usable) leftOut.push({ part: solverPart, why: 'not-ok' });
    } else if (!solverPart) {
      excluded.noDelay++;
    } else if (!usable) {
      excluded.outOfBand++;
    } else if (heldBy.has(part.id)) {
      for (const h of heldBy.get(part.id)!) excluded.held.push({ partId: h.partId, tag: h.tag, setupId: h.setupId, bookingId: h.bookingId });
      leftOut.push({ part: solverPart, why: 'held' });
    } else {
      candidates.push(solverPart);
    }
  }

  const problem: SolverProblem = {
    elements: input.array.elements,
    spacingMm: spacingOf(input.array),
    sources: input.sources.map((s) => ({ key: s.key, frequencyHz: s.frequencyHz, targetAngleDeg: s.targetAngleDeg, targetDelaysPs: s.targetDelaysPs })),
    tolerancePs: input.tolerancePs,
    maxSegments: input.maxSegments,
    prefer: input.prefer,
    limit: input.limit,
    parts: candidates,
    shared,
    pathStart: shared.length ? null : SMA_JACK,
    pathEnd: input.inputConnector,
  };
  const answer = solve(problem);
  const limits = [...answer.limits];

  if (!answer.feasible && leftOut.length) {
    // Would the parts left out have helped? Ask the solver once more with them, for the best proposal only.
    let withThem: SolverAnswer | null = null;
    try {
      withThem = solveCables({ ...problem, parts: [...candidates, ...leftOut.map((l) => l.part)], limit: 1 });
    } catch (err) {
      if (!(err instanceof SolverLimitError)) throw err;
    }
    const best = withThem?.proposals[0];
    const closest = answer.proposals[0];
    if (withThem && best && (withThem.feasible || !closest || best.maxErrorPs < closest.maxErrorPs - 1e-6)) {
      const heldTags = leftOut.filter((l) => l.why === 'held').map((l) => l.part.tag);
      const brokenTags = leftOut.filter((l) => l.why === 'not-ok').map((l) => l.part.tag);
      const why = [
        heldTags.length ? `${heldTags.length} held by setups of overlapping bookings (${tagList(heldTags)})` : null,
        brokenTags.length ? `${brokenTags.length} damaged or lost (${tagList(brokenTags)})` : null,
      ].filter(Boolean);
      limits.push(
        `${leftOut.length} part${leftOut.length === 1 ? ' was' : 's were'} left out: ${why.join('; ')}. With them, ${
          withThem.feasible ? 'a proposal within the tolerance would exist' : `the closest proposal would come to ${best.maxErrorPs.toFixed(2)} ps`
        }: free a held part with its owner, or repair or replace the damaged ones.`,
      );
    }
  }

  return {
    ...answer,
    limits,
    shared: shared.map((p) => {
      const part = byId.get(p.id)!;
      return { partId: p.id, tag: p.tag, kind: p.kind, delayPs: p.delayPs, delaySource: p.delaySource, connectors: describeEnds(part) };
    }),
    candidates: candidates.length,
    excluded,
  };
}
