import { dielectricLabels, dielectrics, type Dielectric } from '@shared/domain/cable';
import { connectorLabels, partKindLabels } from '@shared/schemas/parts';
import { Button } from '@/components/ui/button';
import { SelectField, TextField } from '@/components/ui/field';
import { formatPs } from '@/utils/format';
import { adHocKinds, editableChain, emptySegment, type AdHocKind, type Draft, type DraftSegment } from '../utils/setup-draft';
import { useBind, useSetupEditor } from './editor-context';
import { PartPicker } from './part-picker';

/** Parts that go into a path: every kind the inventory keeps, except what is lost. */
const wireable = (status: string) => status !== 'lost';

interface SegmentEditorProps {
  segment: DraftSegment;
  /** `analysis.paths.k.segments.j`, for messages. */
  at: string;
  position: number;
  count: number;
  sourceId: string;
  channel: number;
  where: string;
}

/** One segment of a path: an inventory part, or an ad-hoc part with its own values; move it up or down, or remove it. */
export function SegmentEditor({ segment, at, position, count, sourceId, channel, where }: SegmentEditorProps) {
  const { update, errorFor, touch, parts, partsById } = useSetupEditor();
  const bind = useBind();
  const edit = (change: (s: DraftSegment) => void, path?: string) => update((d) => change(editableChain(d, sourceId, channel)[position]!), path);
  const chain = (d: Draft) => editableChain(d, sourceId, channel);
  const move = (to: number) =>
    update((d) => {
      const list = chain(d);
      const [moved] = list.splice(position, 1);
      list.splice(to, 0, moved!);
    });
  const set = (field: keyof DraftSegment) => (d: Draft, v: string) => void ((chain(d)[position] as unknown as Record<string, string>)[field] = v);
  const part = segment.source === 'part' && segment.partId !== null ? partsById.get(segment.partId) : undefined;
  const name = `segment ${position + 1} of ${where}`;

  return (
    <li aria-label={`Segment ${position + 1}`} className="rounded-chip bg-ptfe-50 p-3 ring-1 ring-ink-100">
      <div className="flex flex-wrap items-start gap-3">
        <span aria-hidden className="mt-7 w-6 text-right font-mono text-caption font-semibold text-ink-400">
          {position + 1}
        </span>
        <div className="w-40">
          <SelectField
            label="Segment is"
            value={segment.source}
            onChange={(e) => edit((s) => Object.assign(s, { ...emptySegment(e.target.value as DraftSegment['source']), id: s.id }))}
          >
            <option value="part">Inventory part</option>
            <option value="ad-hoc">Ad-hoc segment</option>
          </SelectField>
        </div>
        <div className="min-w-0 flex-1">
          {segment.source === 'part' ? (
            <>
              <PartPicker
                label="Part"
                parts={parts.filter((p) => wireable(p.status) || p.id === segment.partId)}
                value={segment.partId}
                error={errorFor(`${at}.partId`)}
                onBlur={() => touch(`${at}.partId`)}
                onChange={(id) => edit((s) => void (s.partId = id), `${at}.partId`)}
              />
              {part ? (
                <p className="mt-1 text-caption text-ink-500">
                  {partKindLabels[part.kind]} · {connectorLabels[part.connectorA]} / {connectorLabels[part.connectorB]}
                  {part.lengthMm != null ? ` · ${part.lengthMm} mm` : ''} · {formatPs(part.delayPs)}
                  {part.delaySource === 'measured' ? ' (measured)' : ''}
                  {part.status === 'damaged' ? <span className="font-semibold text-caution-700"> · marked damaged</span> : null}
                </p>
              ) : null}
            </>
          ) : (
            <div className="grid gap-3 sm:grid-cols-3">
              <SelectField label="Kind" value={segment.kind} onChange={(e) => edit((s) => void (s.kind = e.target.value as AdHocKind))}>
                {adHocKinds.map((k) => (
                  <option key={k} value={k}>
                    {partKindLabels[k]}
                  </option>
                ))}
              </SelectField>
              <TextField label="Label" maxLength={40} placeholder="Line stretcher" {...bind(`${at}.tag`, segment.tag, set('tag'))} />
              {segment.kind === 'cable' ? (
                <>
                  <TextField label="Length (mm)" inputMode="decimal" {...bind(`${at}.lengthMm`, segment.lengthMm, set('lengthMm'))} />
                  <SelectField label="Dielectric" {...bind(`${at}.dielectric`, segment.dielectric, (d, v) => void (chain(d)[position]!.dielectric = v as Dielectric | ''))}>
                    <option value="">Not known</option>
                    {dielectrics.map((k) => (
                      <option key={k} value={k}>
                        {dielectricLabels[k]}
                      </option>
                    ))}
                  </SelectField>
                  <TextField label="Velocity factor" inputMode="decimal" {...bind(`${at}.velocityFactor`, segment.velocityFactor, set('velocityFactor'))} />
                  <TextField label="Measured delay (ps)" inputMode="decimal" {...bind(`${at}.measuredDelayPs`, segment.measuredDelayPs, set('measuredDelayPs'))} />
                  <TextField label="Loss (dB/m)" inputMode="decimal" {...bind(`${at}.lossDbPerM`, segment.lossDbPerM, set('lossDbPerM'))} />
                  <TextField label="Loss stated at (GHz)" inputMode="decimal" {...bind(`${at}.lossRefHz`, segment.lossRefGhz, set('lossRefGhz'))} />
                </>
              ) : (
                <>
                  <TextField
                    label={segment.kind === 'attenuator' ? 'Attenuation (dB)' : 'Loss (dB)'}
                    inputMode="decimal"
                    {...bind(`${at}.lossDb`, segment.lossDb, set('lossDb'))}
                  />
                  <TextField label="Delay (ps)" inputMode="decimal" {...bind(`${at}.delayPs`, segment.delayPs, set('delayPs'))} />
                </>
              )}
            </div>
          )}
          {errorFor(at) ? (
            <p role="alert" className="mt-1 text-caption font-semibold text-fault-700">
              {errorFor(at)}
            </p>
          ) : null}
        </div>
        <div className="mt-6 flex gap-1">
          <Button variant="quiet" className="!px-2" disabled={position === 0} onClick={() => move(position - 1)} aria-label={`Move ${name} up`}>
            ↑
          </Button>
          <Button variant="quiet" className="!px-2" disabled={position === count - 1} onClick={() => move(position + 1)} aria-label={`Move ${name} down`}>
            ↓
          </Button>
          <Button variant="quiet" className="!px-2" onClick={() => update((d) => void chain(d).splice(position, 1))} aria-label={`Remove ${name}`}>
            Remove
          </Button>
        </div>
      </div>
    </li>
  );
}
