import { analyseSetup, type AnalysisResult, type Segment } from '../../../shared/domain/analysis.js';
import type { AnalysisInput, SegmentInput } from '../../../shared/schemas/analysis.js';
import { partToSegment } from '../../../shared/domain/part-segment.js';
import { AppError } from '../../lib/errors.js';
import { partsByIds } from '../parts/parts.service.js';

/** Replace every {"partId"} segment with the part's values; an unknown part is a 400 on that segment. */
export async function resolveSegments(doc: AnalysisInput): Promise<Omit<AnalysisInput, 'paths'> & { paths: { source: string; channel: number; segments: Segment[] }[] }> {
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
      return partToSegment(part);
    }),
  }));
  if (issues.length) throw new AppError(400, 'validation_failed', 'Some fields are not valid.', issues);
  return { ...doc, paths };
}

export async function analyse(doc: AnalysisInput): Promise<AnalysisResult> {
  return analyseSetup(await resolveSegments(doc));
}
