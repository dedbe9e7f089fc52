import { Button } from '@/components/ui/button';
import { Panel } from '@/components/ui/feedback';
import { formatDb, formatHz, formatPs } from '@/utils/format';
import { chainOf, editableChain, emptySegment, pathIndex } from '../utils/setup-draft';
import { CableSolver } from './cable-solver';
import { useSetupEditor } from './editor-context';
import { roleLabels } from './sources-section';
import { SegmentEditor } from './segment-editor';

/** Every source's wiring to every chip input: an ordered chain of parts from the generator to the input. */
export function PathsSection() {
  const { draft, update, errorFor, preview } = useSetupEditor();
  return (
    <Panel title="Paths">
      <p className="mb-4 text-body text-ink-500">
        One chain per source and input, in order from the generator to the chip input. Pick parts from the inventory, or describe an ad-hoc part.
      </p>
      <CableSolver />
      <div className="space-y-6">
        {draft.sources.map((source, i) => (
          <section key={source.id} aria-label={`Paths of ${source.key || `source ${i + 1}`}`}>
            <h3 className="text-lead font-bold text-ink-800">
              {source.key || `Source ${i + 1}`}{' '}
              <span className="text-body font-semibold text-ink-500">
                {roleLabels[source.role]}
                {Number.isFinite(Number(source.frequencyGhz)) && source.frequencyGhz.trim() ? ` · ${formatHz(Number(source.frequencyGhz) * 1e9)}` : ''}
              </span>
            </h3>
            <div className="mt-2 space-y-3">
              {Array.from({ length: draft.elements }, (_, channel) => {
                const where = `${source.key || `source ${i + 1}`} → input ${channel}`;
                const at = `analysis.paths.${pathIndex(draft, i, channel)}`;
                const chain = chainOf(draft, source.id, channel);
                const result = preview?.paths.find((p) => p.source === source.key.trim() && p.channel === channel);
                return (
                  <fieldset key={channel} aria-label={where} className="rounded-chip border border-ink-100 p-3">
                    <legend className="flex flex-wrap items-baseline gap-x-3 px-1">
                      <span className="font-semibold text-ink-800">{where}</span>
                      {result ? (
                        <span className="text-caption tabular-nums text-ink-500" data-testid="path-total">
                          {formatPs(result.delayPs)} · {formatDb(result.lossDb)}
                        </span>
                      ) : null}
                    </legend>
                    {chain.length ? (
                      <ol className="space-y-2">
                        {chain.map((segment, j) => (
                          <SegmentEditor key={segment.id} segment={segment} at={`${at}.segments.${j}`} position={j} count={chain.length} sourceId={source.id} channel={channel} where={where} />
                        ))}
                      </ol>
                    ) : (
                      <p className="text-body text-ink-500">No segments yet: the path counts as 0 ps and 0 dB.</p>
                    )}
                    {errorFor(`${at}.segments`) ? (
                      <p role="alert" className="mt-1 text-caption font-semibold text-fault-700">
                        {errorFor(`${at}.segments`)}
                      </p>
                    ) : null}
                    <Button variant="secondary" className="mt-2 !py-1.5" onClick={() => update((d) => void editableChain(d, source.id, channel).push(emptySegment()))}>
                      Add segment<span className="sr-only"> to {where}</span>
                    </Button>
                  </fieldset>
                );
              })}
            </div>
          </section>
        ))}
      </div>
    </Panel>
  );
}
