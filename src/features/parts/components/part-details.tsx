import { dielectricLabels } from '@shared/domain/cable';
import { connectorLabels, genderLabels, partKindLabels, partStatusLabels, type Part } from '@shared/schemas/parts';
import { Fact } from '@/components/ui/fact';
import { Badge, Notice, Panel } from '@/components/ui/feedback';
import { formatDate, formatDb, formatDbm, formatHz, formatMm, formatPs, formatRange } from '@/utils/format';

export function PartDetails({ part: p }: { part: Part }) {
  return (
    <div className="space-y-4">
      {p.status !== 'ok' ? <Notice tone="caution">{p.tag} is marked {partStatusLabels[p.status].toLowerCase()}: do not use it in a setup.</Notice> : null}
      {p.kind === 'attenuator' && p.maxInputDbm !== null ? (
        <Notice tone="caution">Rated for at most {formatDbm(p.maxInputDbm)} at its input; more overheats or destroys the pad.</Notice>
      ) : null}
      <Panel>
        <dl className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
          <Fact label="Kind">{partKindLabels[p.kind]}</Fact>
          <Fact label="End A">{connectorLabels[p.connectorA]} {genderLabels[p.genderA]}</Fact>
          <Fact label="End B">{connectorLabels[p.connectorB]} {genderLabels[p.genderB]}</Fact>
          <Fact label="Status"><Badge tone={p.status === 'ok' ? 'pass' : 'caution'}>{partStatusLabels[p.status]}</Badge></Fact>
          {p.kind === 'cable' ? (
            <>
              <Fact label="Length">{formatMm(p.lengthMm, 0)}</Fact>
              <Fact label="Dielectric">{p.dielectric ? dielectricLabels[p.dielectric] : '—'}</Fact>
              <Fact label="Velocity factor">
                {p.velocityFactor?.toFixed(4) ?? '—'} <span className="text-caption text-ink-500">{p.velocityFactorSource === 'datasheet' ? 'datasheet' : '1/√ε_r'}</span>
              </Fact>
              <Fact label="Electrical delay">
                <span data-testid="part-delay">{formatPs(p.delayPs)}</span>{' '}
                <span className="text-caption text-ink-500">{p.delaySource === 'measured' ? `measured${p.measuredOn ? ` ${formatDate(p.measuredOn)}` : ''}` : 'L / (VF·c)'}</span>
              </Fact>
              <Fact label="Free-space path it equals">{formatMm(p.freeSpaceLengthMm)}</Fact>
              <Fact label="Delay per metre">{p.delayPerMetrePs ? `${(p.delayPerMetrePs / 1000).toFixed(4)} ns/m` : '—'}</Fact>
              <Fact label="Loss">{p.lossDbPerM == null ? '—' : `${p.lossDbPerM} dB/m at ${formatHz(p.lossRefHz)}`}</Fact>
              {p.delaySource === 'measured' ? <Fact label="Computed delay">{formatPs(p.computedDelayPs)}</Fact> : null}
              {p.measuredHow ? <Fact label="Measured how">{p.measuredHow}</Fact> : null}
            </>
          ) : (
            <>
              <Fact label={p.kind === 'attenuator' ? 'Nominal attenuation' : p.kind === 'splitter' ? 'Loss per branch' : 'Loss'}>{formatDb(p.lossDb)}</Fact>
              <Fact label="Delay">{formatPs(p.delayPs)}</Fact>
              <Fact label="Frequency range">{formatRange(p.minFrequencyHz, p.maxFrequencyHz)}</Fact>
              {p.kind === 'attenuator' ? <Fact label="Maximum input">{formatDbm(p.maxInputDbm)}</Fact> : null}
            </>
          )}
        </dl>
        {p.notes ? <p className="mt-4 whitespace-pre-line border-t border-ink-100 pt-3 text-body text-ink-700">{p.notes}</p> : null}
      </Panel>
    </div>
  );
}
