import { segmentDelayPs, segmentLossDb, type AnalysisResult, type Segment } from '@shared/domain/analysis';
import { partToSegment } from '@shared/domain/part-segment';
import { connectorLabels, partKindLabels, type Part } from '@shared/schemas/parts';
import type { SetupDocument } from '@shared/schemas/setups';
import { formatDb, formatDbm, formatHz, formatPs } from '@/utils/format';
import { roleLabels } from './sources-section';

type DocSegment = SetupDocument['analysis']['paths'][number]['segments'][number];

interface Row {
  tag: string;
  what: string;
  lengthMm: number | null;
  connectors: string;
  delayPs: number | null;
  lossDb: number | null;
  partId: number | null;
}

/** One segment as the bench sees it: the inventory part's tag and facts, or the ad-hoc values. */
function rowOf(segment: DocSegment, partsById: Map<number, Part>, frequencyHz: number): Row {
  if ('partId' in segment) {
    const part = partsById.get(segment.partId);
    if (!part) return { tag: `#${segment.partId}`, what: 'Part no longer in the inventory', lengthMm: null, connectors: '—', delayPs: null, lossDb: null, partId: segment.partId };
    const s = partToSegment(part);
    return {
      tag: part.tag,
      what: part.description || partKindLabels[part.kind],
      lengthMm: part.lengthMm,
      connectors: `${connectorLabels[part.connectorA]} / ${connectorLabels[part.connectorB]}`,
      delayPs: segmentDelayPs(s),
      lossDb: segmentLossDb(s, frequencyHz),
      partId: part.id,
    };
  }
  const s = segment as Segment;
  return {
    tag: s.tag || '—',
    what: `${partKindLabels[s.kind]} (ad hoc)`,
    lengthMm: s.kind === 'cable' ? s.lengthMm : null,
    connectors: '—',
    delayPs: segmentDelayPs(s),
    lossDb: segmentLossDb(s, frequencyHz),
    partId: null,
  };
}

interface WiringTableProps {
  document: SetupDocument;
  analysis: AnalysisResult;
  partsById: Map<number, Part>;
  instrumentTag: (id: number | null) => string;
  /** The rebuild sheet: a box per segment to tick off while wiring. */
  checklist?: boolean;
}

/** Every path's segments in wiring order, with tags, lengths, connectors, delays and losses, grouped by source. */
export function WiringTable({ document, analysis, partsById, instrumentTag, checklist = false }: WiringTableProps) {
  const a = document.analysis;
  return (
    <div className="space-y-6">
      {a.sources.map((source) => {
        const generator = document.generators.find((g) => g.source === source.key);
        return (
          <section key={source.key} aria-label={`Wiring of ${source.key}`} className="break-inside-avoid">
            <h3 className="text-lead font-bold text-ink-800">
              {source.key}{' '}
              <span className="text-body font-semibold text-ink-500">
                {roleLabels[source.role]} · {formatHz(source.frequencyHz)} · {formatDbm(source.powerDbm)}
                {generator?.instrumentId ? ` · ${instrumentTag(generator.instrumentId)}` : ''}
                {generator?.modulation ? ` · ${generator.modulation}` : ''}
              </span>
            </h3>
            <div className="mt-2 space-y-3">
              {a.paths
                .filter((p) => p.source === source.key)
                .sort((x, y) => x.channel - y.channel)
                .map((path) => {
                  const where = `${source.key} → input ${path.channel}`;
                  const total = analysis.paths.find((p) => p.source === path.source && p.channel === path.channel);
                  return (
                    <div key={path.channel} className="overflow-x-auto rounded-chip ring-1 ring-ink-100 print:overflow-visible">
                      <table className="w-full text-left text-body">
                        <caption className="bg-ptfe-50 px-3 py-1.5 text-left font-semibold text-ink-800">
                          {where}
                          {total ? (
                            <span className="ml-3 text-caption font-normal tabular-nums text-ink-500">
                              total {formatPs(total.delayPs)} · {formatDb(total.lossDb)} · {formatDbm(total.powerAtInputDbm)} at the input
                            </span>
                          ) : null}
                        </caption>
                        <thead>
                          <tr className="text-caption uppercase tracking-wide text-ink-500">
                            {checklist ? <th scope="col" className="w-10 px-3 py-1"><span className="sr-only">Connected</span></th> : null}
                            <th scope="col" className="w-8 px-3 py-1">#</th>
                            <th scope="col" className="px-3 py-1">Tag</th>
                            <th scope="col" className="px-3 py-1">Part</th>
                            <th scope="col" className="px-3 py-1 text-right">Length</th>
                            <th scope="col" className="px-3 py-1">Connectors</th>
                            <th scope="col" className="px-3 py-1 text-right">Delay</th>
                            <th scope="col" className="px-3 py-1 text-right">Loss</th>
                          </tr>
                        </thead>
                        <tbody>
                          {path.segments.length === 0 ? (
                            <tr>
                              <td colSpan={checklist ? 8 : 7} className="px-3 py-2 text-ink-500">
                                No segments: the generator connects straight to the input.
                              </td>
                            </tr>
                          ) : null}
                          {path.segments.map((segment, j) => {
                            const row = rowOf(segment, partsById, source.frequencyHz);
                            return (
                              <tr key={j} className="border-t border-ink-100">
                                {checklist ? (
                                  <td className="px-3 py-1.5">
                                    <input type="checkbox" className="h-4 w-4 accent-copper-600" aria-label={`Connected: ${row.tag}, segment ${j + 1} of ${where}`} />
                                  </td>
                                ) : null}
                                <td className="px-3 py-1.5 tabular-nums text-ink-500">{j + 1}</td>
                                <td className="whitespace-nowrap px-3 py-1.5 font-mono font-semibold text-ink-800">{row.tag}</td>
                                <td className="px-3 py-1.5 text-ink-700">{row.what}</td>
                                <td className="whitespace-nowrap px-3 py-1.5 text-right tabular-nums">{row.lengthMm == null ? '—' : `${row.lengthMm} mm`}</td>
                                <td className="whitespace-nowrap px-3 py-1.5">{row.connectors}</td>
                                <td className="whitespace-nowrap px-3 py-1.5 text-right tabular-nums">{formatPs(row.delayPs)}</td>
                                <td className="whitespace-nowrap px-3 py-1.5 text-right tabular-nums">{formatDb(row.lossDb)}</td>
                              </tr>
                            );
                          })}
                        </tbody>
                      </table>
                    </div>
                  );
                })}
            </div>
          </section>
        );
      })}
    </div>
  );
}
