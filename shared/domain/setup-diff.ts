/**
 * What changed between two revisions of a setup: segments added, removed or changed on each path, instrument
 * settings changed, other fields changed, and how each computed angle, response and the rejection moved.
 */
import type { AnalysisResult } from './analysis.js';

/** The parts of a setup document the comparison reads (structurally compatible with SetupDocument). */
export interface ComparableDocument {
  analysis: {
    array: unknown;
    sources: { key: string }[];
    paths: { source: string; channel: number; segments: Record<string, unknown>[] }[];
    combiner: unknown;
    inputs?: unknown;
  };
  settings: { instrumentId: number; key: string; value: string }[];
  [field: string]: unknown;
}

export interface SegmentChange {
  source: string;
  channel: number;
  index: number;
  change: 'added' | 'removed' | 'changed';
  before: string | null;
  after: string | null;
}

export interface SetupDiff {
  segments: SegmentChange[];
  settings: { instrumentId: number; key: string; before: string | null; after: string | null }[];
  fields: { field: string; before: unknown; after: unknown }[];
  results: { source: string; angleBefore: number | null; angleAfter: number | null; responseBefore: number | null; responseAfter: number | null }[];
  rejection: { before: number | null; after: number | null };
}

/** A segment in one line: the part tag, or its kind and values. */
export function describeSegment(s: Record<string, unknown>): string {
  if (typeof s.partId === 'number') return `part #${s.partId}`;
  const values = Object.entries(s)
    .filter(([k, v]) => k !== 'kind' && v !== null && v !== undefined)
    .map(([k, v]) => `${k} ${v}`)
    .join(', ');
  return `${String(s.kind)}${values ? ` (${values})` : ''}`;
}

const same = (a: unknown, b: unknown) => JSON.stringify(a) === JSON.stringify(b);

export function diffSetups(
  before: ComparableDocument,
  after: ComparableDocument,
  results: { before: AnalysisResult | null; after: AnalysisResult | null },
  label: (s: Record<string, unknown>) => string = describeSegment,
): SetupDiff {
  const segments: SegmentChange[] = [];
  const keyOf = (p: { source: string; channel: number }) => `${p.source}#${p.channel}`;
  const pathsBefore = new Map(before.analysis.paths.map((p) => [keyOf(p), p]));
  const pathsAfter = new Map(after.analysis.paths.map((p) => [keyOf(p), p]));
  for (const key of new Set([...pathsBefore.keys(), ...pathsAfter.keys()])) {
    const a = pathsBefore.get(key)?.segments ?? [];
    const b = pathsAfter.get(key)?.segments ?? [];
    const [source, channel] = [key.slice(0, key.lastIndexOf('#')), Number(key.slice(key.lastIndexOf('#') + 1))];
    for (let i = 0; i < Math.max(a.length, b.length); i++) {
      const x = a[i];
      const y = b[i];
      if (x && !y) segments.push({ source, channel, index: i, change: 'removed', before: label(x), after: null });
      else if (!x && y) segments.push({ source, channel, index: i, change: 'added', before: null, after: label(y) });
      else if (x && y && !same(x, y)) segments.push({ source, channel, index: i, change: 'changed', before: label(x), after: label(y) });
    }
  }

  const settingKey = (s: { instrumentId: number; key: string }) => `${s.instrumentId}#${s.key}`;
  const sb = new Map(before.settings.map((s) => [settingKey(s), s]));
  const sa = new Map(after.settings.map((s) => [settingKey(s), s]));
  const settings = [...new Set([...sb.keys(), ...sa.keys()])]
    .filter((k) => sb.get(k)?.value !== sa.get(k)?.value)
    .map((k) => {
      const s = (sa.get(k) ?? sb.get(k))!;
      return { instrumentId: s.instrumentId, key: s.key, before: sb.get(k)?.value ?? null, after: sa.get(k)?.value ?? null };
    });

  const fields: SetupDiff['fields'] = [];
  for (const field of ['array', 'sources', 'combiner', 'inputs'] as const) {
    if (!same(before.analysis[field], after.analysis[field])) fields.push({ field: `analysis.${field}`, before: before.analysis[field] ?? null, after: after.analysis[field] ?? null });
  }
  for (const field of new Set([...Object.keys(before), ...Object.keys(after)])) {
    if (field === 'analysis' || field === 'settings') continue;
    if (!same(before[field], after[field])) fields.push({ field, before: before[field] ?? null, after: after[field] ?? null });
  }

  const sourceKeys = [...new Set([...(results.before?.sources ?? []).map((s) => s.key), ...(results.after?.sources ?? []).map((s) => s.key)])];
  const find = (r: AnalysisResult | null, key: string) => r?.sources.find((s) => s.key === key) ?? null;
  const resultsDiff = sourceKeys.map((key) => ({
    source: key,
    angleBefore: find(results.before, key)?.angleDeg ?? null,
    angleAfter: find(results.after, key)?.angleDeg ?? null,
    responseBefore: find(results.before, key)?.responseDb ?? null,
    responseAfter: find(results.after, key)?.responseDb ?? null,
  }));
  return { segments, settings, fields, results: resultsDiff, rejection: { before: results.before?.rejectionDb ?? null, after: results.after?.rejectionDb ?? null } };
}
