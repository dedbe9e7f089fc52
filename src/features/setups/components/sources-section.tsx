import type { SourceRole } from '@shared/domain/analysis';
import { Button } from '@/components/ui/button';
import { Panel } from '@/components/ui/feedback';
import { SelectField, TextField } from '@/components/ui/field';
import { newSource } from '../utils/setup-draft';
import { useBind, useSetupEditor } from './editor-context';

export const roleLabels: Record<SourceRole, string> = { desired: 'Desired', interferer: 'Interferer', other: 'Other' };
const MAX_SOURCES = 8;

/** A key no other source uses: `interferer`, then `interferer2`, … */
function freeKey(base: string, taken: string[]): string {
  if (!taken.includes(base)) return base;
  let i = 2;
  while (taken.includes(`${base}${i}`)) i++;
  return `${base}${i}`;
}

/** The signal generators standing in for the transmitters: which one, at what frequency and level. */
export function SourcesSection() {
  const { draft, update, errorFor, instruments, booked } = useSetupEditor();
  const bind = useBind();
  const generators = instruments.filter((i) => i.kind === 'signal-generator');
  const add = () =>
    update((d) => {
      const role = d.sources.some((s) => s.role === 'interferer') ? 'other' : 'interferer';
      const used = new Set(d.sources.map((s) => s.instrumentId));
      // The next generator of the booking that no source plays yet, else none: the person picks.
      const next = generators.find((g) => booked.has(g.id) && !used.has(g.id));
      d.sources.push(newSource(role, freeKey(role === 'interferer' ? 'interferer' : 'source', d.sources.map((s) => s.key)), next?.id ?? null));
    });

  return (
    <Panel title="Sources">
      <div className="space-y-4">
        {draft.sources.map((source, i) => {
          const at = `analysis.sources.${i}`;
          const set = (d: typeof draft) => d.sources[i]!;
          return (
            <fieldset key={source.id} className="rounded-chip border border-ink-100 p-4">
              <legend className="px-1 text-caption font-semibold uppercase tracking-wide text-ink-600">Source {i + 1}</legend>
              <div className="grid gap-3 md:grid-cols-3">
                <TextField label="Key" maxLength={40} hint="Names the source in paths and results." {...bind(`${at}.key`, source.key, (d, v) => void (set(d).key = v))} />
                <SelectField label="Role" {...bind(`${at}.role`, source.role, (d, v) => void (set(d).role = v as SourceRole))}>
                  {(Object.keys(roleLabels) as SourceRole[]).map((r) => (
                    <option key={r} value={r}>
                      {roleLabels[r]}
                    </option>
                  ))}
                </SelectField>
                <SelectField
                  label="Generator"
                  value={source.instrumentId ?? ''}
                  error={errorFor(`generators.${i}.instrumentId`)}
                  hint={source.instrumentId !== null && !booked.has(source.instrumentId) ? 'Not in this booking: check that it is free.' : undefined}
                  onChange={(e) => update((d) => void (set(d).instrumentId = e.target.value ? Number(e.target.value) : null), `generators.${i}.instrumentId`)}
                >
                  <option value="">Not recorded</option>
                  {generators.map((g) => (
                    <option key={g.id} value={g.id}>
                      {g.tag} · {g.name}
                    </option>
                  ))}
                </SelectField>
                <TextField label="Frequency (GHz)" inputMode="decimal" {...bind(`${at}.frequencyHz`, source.frequencyGhz, (d, v) => void (set(d).frequencyGhz = v))} />
                <TextField label="Power (dBm)" inputMode="decimal" hint="The generator’s output level." {...bind(`${at}.powerDbm`, source.powerDbm, (d, v) => void (set(d).powerDbm = v))} />
                <TextField label="Modulation" maxLength={200} placeholder="CW, 10 MHz QPSK…" {...bind(`generators.${i}.modulation`, source.modulation, (d, v) => void (set(d).modulation = v))} />
              </div>
              {draft.sources.length > 1 ? (
                <div className="mt-3">
                  <Button
                    variant="quiet"
                    onClick={() =>
                      update((d) => {
                        d.sources.splice(i, 1);
                        delete d.paths[source.id];
                      })
                    }
                  >
                    Remove source {source.key || i + 1}
                  </Button>
                </div>
              ) : null}
            </fieldset>
          );
        })}
      </div>
      {draft.sources.length < MAX_SOURCES ? (
        <Button variant="secondary" className="mt-4" onClick={add}>
          Add source
        </Button>
      ) : null}
    </Panel>
  );
}
