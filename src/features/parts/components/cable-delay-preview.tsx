import { cableElectrical, type Dielectric } from '@shared/domain/cable';
import { formatMm, formatPs } from '@/utils/format';

interface Props {
  lengthMm: unknown;
  dielectric: Dielectric | null | undefined;
  velocityFactor: unknown;
  measuredDelayPs: unknown;
}

const finite = (v: unknown): number | null => (typeof v === 'number' && Number.isFinite(v) ? v : null);

/**
 * The cable's electrical facts while the manager types, from the same shared function the server stores.
 * The server recomputes on save; this is only a preview.
 */
export function CableDelayPreview({ lengthMm, dielectric, velocityFactor, measuredDelayPs }: Props) {
  const length = finite(lengthMm);
  const facts =
    length !== null && dielectric
      ? cableElectrical({ lengthMm: length, dielectric, velocityFactor: finite(velocityFactor), measuredDelayPs: finite(measuredDelayPs) })
      : null;
  return (
    <section aria-label="Cable delay" aria-live="polite" className="rounded-panel bg-ink-900 p-4 text-ptfe-50">
      <h3 className="text-caption font-semibold uppercase tracking-widest text-copper-300">Electrical delay</h3>
      {facts && facts.delayPs !== null ? (
        <dl className="mt-2 grid grid-cols-2 gap-3 sm:grid-cols-4">
          <div>
            <dt className="text-caption text-ink-300">Delay</dt>
            <dd className="text-title tabular-nums" data-testid="preview-delay">{formatPs(facts.delayPs)}</dd>
            <dd className="text-caption text-ink-300">{facts.delaySource === 'measured' ? 'measured (overrides)' : 'L / (VF·c)'}</dd>
          </div>
          <div>
            <dt className="text-caption text-ink-300">Per metre</dt>
            <dd className="text-lead tabular-nums">{facts.delayPerMetrePs === null ? '—' : `${(facts.delayPerMetrePs / 1000).toFixed(4)} ns/m`}</dd>
          </div>
          <div>
            <dt className="text-caption text-ink-300">Velocity factor</dt>
            <dd className="text-lead tabular-nums">{facts.velocityFactor?.toFixed(4)}</dd>
            <dd className="text-caption text-ink-300">{facts.velocityFactorSource === 'datasheet' ? 'from the datasheet' : 'from the dielectric, 1/√ε_r'}</dd>
          </div>
          <div>
            <dt className="text-caption text-ink-300">Free-space path</dt>
            <dd className="text-lead tabular-nums" data-testid="preview-free-space">{formatMm(facts.freeSpaceLengthMm)}</dd>
            <dd className="text-caption text-ink-300">c × delay</dd>
          </div>
          {facts.delaySource === 'measured' && facts.computedDelayPs !== null ? (
            <p className="col-span-full text-caption text-ink-300">Computed from length and VF: {formatPs(facts.computedDelayPs)}</p>
          ) : null}
        </dl>
      ) : (
        <p className="mt-2 text-body text-ink-300">Enter a length and a dielectric (or a datasheet velocity factor) to see the delay.</p>
      )}
    </section>
  );
}
