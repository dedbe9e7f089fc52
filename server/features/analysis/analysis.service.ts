import { analyseSetup, type AnalysisResult, type Segment } from '../../../shared/domain/analysis.js';
import type { AnalysisInput, SegmentInput } from '../../../shared/schemas/analysis.js';
import type { Part } from '../../../shared/schemas/parts.js';
import { AppError } from '../../lib/errors.js';
import { partsByIds } from '../parts/parts.service.js';

/** An inventory part as an analysis segment: a cable with its facts, other parts with their loss and delay. */
export function partSegment(part: Part): Segment {
  if (part.kind === 'cable') {
    return {
      kind: 'cable',
      lengthMm: part.lengthMm!,
      velocityFactor: part.velocityFactor,
      dielectric: part.dielectric,
      measuredDelayPs: part.measuredDelayPs,
      lossDbPerM: part.lossDbPerM,
      lossRefHz: part.lossRefHz,
      tag: part.tag,
    };
  }
  if (part.kind === 'attenuator') return { kind: 'attenuator', lossDb: part.lossDb ?? 0, delayPs: part.delayPs, tag: part.tag };
  return { kind: part.kind, lossDb: part.lossDb, delayPs: part.delayPs, tag: part.tag };
}

/** Replace every {"partId"} segment with the part's values; an unknown part is a 400 on that segment. */
export async function resolveSegments(doc: AnalysisInput): Promise<AnalysisInput & { paths: { source: string; channel: number; segments: Segment[] }[] }> {
  const ids = [...new Set(doc.paths.flatMap((p) => p.segments.flatMap((s) => ('partId' in s ? [s.partId] : []))))];
  const parts = new Map((await partsByIds(ids)).map((p) => [p.id, p]));
  const issues: { path: string; message: string }[] = [];
  const paths = doc.paths.map((p, i) => ({
    ...p,
    segments: p.segments.map((s: SegmentInput, j) => {
      if (!('partId' in s)) return s as Segment;
      const part = parts.get(s.partId);
      if (!part) {
        issues.push({ path: `paths.${i}.segments.${j}.partId`, message: `No part with id ${s.partId}` });
        return { kind: 'other' } as Segment;
      }
      return partSegment(part);
    }),
  }));
  if (issues.length) throw new AppError(400, 'validation_failed', 'Some fields are not valid.', issues);
  return { ...doc, paths };
}

export async function analyse(doc: AnalysisInput): Promise<AnalysisResult> {
  return analyseSetup(await resolveSegments(doc));
}
