import { Button } from '@/components/ui/button';
import { Notice, Panel } from '@/components/ui/feedback';
import { TextField } from '@/components/ui/field';
import { formatDb } from '@/utils/format';
import { firstInterferer } from '../utils/setup-draft';
import { useBind, useSetupEditor } from './editor-context';

/** A delay as the field shows it: at most three decimals, no trailing zeros. */
const delayText = (ps: number) => String(Number(ps.toFixed(3)));

/** The chip's true-time delay and gain per input, and the search for the delays that null the interferer. */
export function CombinerSection() {
  const { draft, update, errorFor, preview } = useSetupEditor();
  const bind = useBind();
  const interferer = firstInterferer(draft);
  const best = preview?.bestNull ?? null;
  const applied = best !== null && best.delaysPs.every((ps, c) => Number(draft.delaysPs[c]) === Number(delayText(ps)));

  return (
    <Panel title="Combiner (chip settings)">
      <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
        {draft.delaysPs.map((delay, c) => (
          <div key={c} className="contents">
            <TextField label={`Input ${c} chip delay (ps)`} inputMode="decimal" {...bind(`analysis.combiner.delaysPs.${c}`, delay, (d, v) => void (d.delaysPs[c] = v))} />
            <TextField label={`Input ${c} gain`} inputMode="decimal" hint="Linear, 1 = unity." {...bind(`analysis.combiner.gains.${c}`, draft.gains[c] ?? '', (d, v) => void (d.gains[c] = v))} />
          </div>
        ))}
      </div>
      {errorFor('analysis.combiner.delaysPs') ? <p role="alert" className="mt-1 text-caption font-semibold text-fault-700">{errorFor('analysis.combiner.delaysPs')}</p> : null}

      <h3 className="mt-5 font-bold text-ink-800">Null search</h3>
      {interferer ? (
        <>
          <p className="mt-1 text-body text-ink-500">
            Looks for progressive chip delays (t<sub>n</sub> = n·Δ) within the chip’s range that suppress <span className="font-semibold">{interferer.key || 'the interferer'}</span> most
            against the desired source.
          </p>
          <div className="mt-3 grid gap-3 sm:grid-cols-2">
            <TextField label="Chip delay range (ps)" inputMode="decimal" {...bind('analysis.nullSearch.maxDelayPs', draft.nullSearch.maxDelayPs, (d, v) => void (d.nullSearch.maxDelayPs = v))} />
            <TextField label="Chip delay step (ps)" inputMode="decimal" {...bind('analysis.nullSearch.stepPs', draft.nullSearch.stepPs, (d, v) => void (d.nullSearch.stepPs = v))} />
          </div>
          {best ? (
            <div className="mt-3 flex flex-wrap items-center gap-3">
              <p className="text-body text-ink-700" data-testid="suggested-null">
                Suggested: {best.delaysPs.map(delayText).join(' / ')} ps, rejection {formatDb(best.rejectionDb)}
              </p>
              <Button variant="secondary" disabled={applied} onClick={() => update((d) => void (d.delaysPs = best.delaysPs.map(delayText)), 'analysis.combiner.delaysPs')}>
                Use suggested null
              </Button>
              {applied ? <span className="text-caption font-semibold text-pass-700">The chip delays are set to it.</span> : null}
            </div>
          ) : null}
        </>
      ) : (
        <div className="mt-2">
          <Notice>Give a source the role “interferer” to search for the chip delays that null it.</Notice>
        </div>
      )}
    </Panel>
  );
}
