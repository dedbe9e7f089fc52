import type { AnalysisResult } from '@shared/domain/analysis';
import type { SolverPreference } from '@shared/domain/solver';
import type { SolverInput, SolverProposal } from '@shared/schemas/solver';
import { editableChain, emptySegment, newId, type Draft } from './setup-draft';

/** The cable finder's form, as typed (numbers stay text until the request is built). */
export interface SolverForm {
  /** Draft source id → target angle, degrees. */
  targets: Record<string, string>;
  tolerancePs: string;
  maxSegments: string;
  prefer: SolverPreference;
  /** Fixed segments every path starts with, in order from the generator. */
  shared: { id: string; partId: number | null }[];
}

export const preferenceLabels: Record<SolverPreference, string> = {
  'fewest-segments': 'Fewest segments',
  'lowest-loss': 'Lowest loss',
  'least-length': 'Least cable length',
};

const round = (value: number, digits: number) => String(Number(value.toFixed(digits)));

/** A fresh form: each source's target is the angle the wiring emulates now (0° where it has none yet). */
export function initialSolverForm(draft: Draft, preview: AnalysisResult | null): SolverForm {
  const targets: Record<string, string> = {};
  for (const s of draft.sources) {
    const angle = preview?.sources.find((r) => r.key === s.key.trim())?.angleDeg;
    targets[s.id] = angle == null ? '0' : round(angle, 2);
  }
  return { targets, tolerancePs: '0.5', maxSegments: '3', prefer: 'fewest-segments', shared: [] };
}

/** Sources added to the draft since the form was made get a target of 0°. */
export function withAllSources(form: SolverForm, draft: Draft): SolverForm {
  const missing = draft.sources.filter((s) => form.targets[s.id] === undefined);
  if (missing.length === 0) return form;
  return { ...form, targets: { ...form.targets, ...Object.fromEntries(missing.map((s) => [s.id, '0'])) } };
}

export const newSharedSegment = () => ({ id: newId(), partId: null });

const number = (value: string) => (value.trim() === '' ? Number.NaN : Number(value));
const hz = (ghz: string) => {
  const v = number(ghz);
  return Number.isFinite(v) ? Number((v * 1e9).toPrecision(12)) : v;
};

/** The request for the draft's array and sources, before validation; `sourceIds[i]` is the draft id of `sources[i]`. */
export function solverRequest(draft: Draft, form: SolverForm, scope: { bookingId: number; setupId?: number }): { input: SolverInput; sourceIds: string[] } {
  const array = draft.spacingMode === 'mm' ? { elements: draft.elements, spacingMm: number(draft.spacingMm) } : { elements: draft.elements, spacingHalfWavelengthAtHz: hz(draft.spacingGhz) };
  return {
    sourceIds: draft.sources.map((s) => s.id),
    input: {
      bookingId: scope.bookingId,
      ...(scope.setupId !== undefined ? { setupId: scope.setupId } : {}),
      array,
      sources: draft.sources.map((s) => ({ key: s.key.trim(), frequencyHz: hz(s.frequencyGhz), targetAngleDeg: number(form.targets[s.id] ?? '') })),
      tolerancePs: number(form.tolerancePs),
      maxSegments: number(form.maxSegments),
      prefer: form.prefer,
      sharedPartIds: form.shared.map((s) => s.partId ?? Number.NaN),
    },
  };
}

/** What a search was asked with, to apply its proposals to the draft later. */
export interface SolverAsked {
  /** Draft source ids and the keys they were sent with, in request order. */
  sourceIds: string[];
  sourceKeys: string[];
  elements: number;
  sharedPartIds: number[];
  tolerancePs: number;
}

/** Whether the draft still has the inputs and sources the proposal was made for. */
export function proposalFits(draft: Draft, asked: SolverAsked): boolean {
  return draft.elements === asked.elements && asked.sourceIds.every((id) => draft.sources.some((s) => s.id === id));
}

/**
 * Wire a proposal into the draft: every source's path to every input becomes the shared segments, then the
 * proposed chain, as inventory parts (check `proposalFits` first).
 */
export function applyProposal(draft: Draft, proposal: SolverProposal, asked: SolverAsked): void {
  const idOf = new Map(asked.sourceKeys.map((key, i) => [key, asked.sourceIds[i]!]));
  for (const p of proposal.paths) {
    const sourceId = idOf.get(p.source);
    if (sourceId === undefined || p.channel >= draft.elements) continue;
    const chain = editableChain(draft, sourceId, p.channel);
    chain.splice(0, chain.length, ...[...asked.sharedPartIds, ...p.chain.map((s) => s.partId)].map((partId) => ({ ...emptySegment('part'), partId })));
  }
}
