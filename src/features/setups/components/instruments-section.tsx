import { Button } from '@/components/ui/button';
import { EmptyState, Panel } from '@/components/ui/feedback';
import { SelectField, TextField } from '@/components/ui/field';
import { newId } from '../utils/setup-draft';
import { useBind, useSetupEditor } from './editor-context';

const MEASURING = new Set(['spectrum-analyzer', 'oscilloscope', 'vna', 'other']);

/** What measures the combined output, and the free settings (centre, span, RBW, …) of any instrument. */
export function InstrumentsSection() {
  const { draft, update, errorFor, instruments, booked } = useSetupEditor();
  const bind = useBind();
  const measuring = instruments.filter((i) => MEASURING.has(i.kind));
  const instrumentOption = (i: (typeof instruments)[number]) => (
    <option key={i.id} value={i.id}>
      {i.tag} · {i.name}
    </option>
  );

  return (
    <Panel title="Instruments and settings">
      <h3 className="font-bold text-ink-800">Measuring the output</h3>
      <div className="mt-2 space-y-3">
        {draft.outputs.map((o, i) => (
          <div key={o.id} role="group" aria-label={`Measuring instrument ${i + 1}`} className="grid items-start gap-3 sm:grid-cols-[minmax(0,1fr)_minmax(0,1fr)_auto]">
            <SelectField
              label="Instrument"
              value={o.instrumentId ?? ''}
              error={errorFor(`outputs.${i}.instrumentId`)}
              hint={o.instrumentId !== null && !booked.has(o.instrumentId) ? 'Not in this booking: check that it is free.' : undefined}
              onChange={(e) => update((d) => void (d.outputs[i]!.instrumentId = e.target.value ? Number(e.target.value) : null), `outputs.${i}.instrumentId`)}
            >
              <option value="">Choose…</option>
              {measuring.map(instrumentOption)}
            </SelectField>
            <TextField label="What it measures" maxLength={200} placeholder="Combiner output, via AT-10A" {...bind(`outputs.${i}.note`, o.note, (d, v) => void (d.outputs[i]!.note = v))} />
            <Button variant="quiet" className="sm:mt-6" onClick={() => update((d) => void d.outputs.splice(i, 1))}>
              Remove<span className="sr-only"> measuring instrument {i + 1}</span>
            </Button>
          </div>
        ))}
      </div>
      <Button variant="secondary" className="mt-3 !py-1.5" onClick={() => update((d) => void d.outputs.push({ id: newId(), instrumentId: measuring[0]?.id ?? null, note: '' }))}>
        Add measuring instrument
      </Button>

      <h3 className="mt-6 font-bold text-ink-800">Settings</h3>
      {draft.settings.length === 0 ? (
        <div className="mt-2">
          <EmptyState title="No settings recorded">Add the settings someone would need to repeat the measurement: centre frequency, span, RBW, averaging…</EmptyState>
        </div>
      ) : (
        <div className="mt-2 space-y-3">
          {draft.settings.map((s, i) => (
            <div key={s.id} role="group" aria-label={`Setting ${i + 1}`} className="grid items-start gap-3 sm:grid-cols-[minmax(0,1.3fr)_minmax(0,1fr)_minmax(0,1fr)_auto]">
              <SelectField
                label="Instrument"
                value={s.instrumentId ?? ''}
                error={errorFor(`settings.${i}.instrumentId`)}
                onChange={(e) => update((d) => void (d.settings[i]!.instrumentId = e.target.value ? Number(e.target.value) : null), `settings.${i}.instrumentId`)}
              >
                <option value="">Choose…</option>
                {instruments.map(instrumentOption)}
              </SelectField>
              <TextField label="Setting" maxLength={60} placeholder="RBW" {...bind(`settings.${i}.key`, s.key, (d, v) => void (d.settings[i]!.key = v))} />
              <TextField label="Value" maxLength={200} placeholder="100 kHz" {...bind(`settings.${i}.value`, s.value, (d, v) => void (d.settings[i]!.value = v))} />
              <Button variant="quiet" className="sm:mt-6" onClick={() => update((d) => void d.settings.splice(i, 1))}>
                Remove<span className="sr-only"> setting {i + 1}</span>
              </Button>
            </div>
          ))}
        </div>
      )}
      <Button
        variant="secondary"
        className="mt-3 !py-1.5"
        onClick={() => update((d) => void d.settings.push({ id: newId(), instrumentId: d.outputs[0]?.instrumentId ?? null, key: '', value: '' }))}
      >
        Add setting
      </Button>
    </Panel>
  );
}
