import { useQuery } from '@tanstack/react-query';
import { useSearchParams } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { EmptyState, Loading, Panel } from '@/components/ui/feedback';
import { SelectField } from '@/components/ui/field';
import { instrumentListOptions } from '@/features/instruments/api/instruments.queries';
import { labInfoOptions } from '@/features/lab/api/lab.queries';
import { LabelSheet, paper, type LabelItem, type PaperSize } from '@/features/labels/components/label-sheet';
import { partListOptions } from '@/features/parts/api/parts.queries';

const ids = (value: string | null) => new Set((value ?? '').split(',').filter(Boolean).map(Number));

function Checklist({ title, items, selected, onChange }: { title: string; items: { id: number; tag: string; text: string }[]; selected: Set<number>; onChange: (next: Set<number>) => void }) {
  const all = items.length > 0 && items.every((i) => selected.has(i.id));
  return (
    <fieldset className="min-w-0 space-y-1">
      <legend className="mb-1 flex w-full items-center justify-between text-caption font-semibold uppercase tracking-wide text-ink-600">
        {title}
        <button type="button" className="normal-case text-phase-700 hover:underline" onClick={() => onChange(all ? new Set() : new Set(items.map((i) => i.id)))}>
          {all ? 'Clear' : 'Select all'}
        </button>
      </legend>
      <div className="max-h-72 space-y-0.5 overflow-y-auto pr-1">
        {items.map((i) => (
          <label key={i.id} className="flex min-w-0 items-center gap-2 rounded px-1 py-0.5 text-body hover:bg-ptfe-100">
            <input
              type="checkbox"
              className="shrink-0 accent-copper-600"
              checked={selected.has(i.id)}
              onChange={(e) => {
                const next = new Set(selected);
                if (e.target.checked) next.add(i.id);
                else next.delete(i.id);
                onChange(next);
              }}
            />
            <span className="shrink-0 font-mono font-semibold">{i.tag}</span> <span className="min-w-0 truncate text-ink-500">{i.text}</span>
          </label>
        ))}
      </div>
    </fieldset>
  );
}

/** QR labels for instruments and parts, printable on A4 or Letter label sheets (managers). */
export function LabelsRoute() {
  const [params, setParams] = useSearchParams();
  const instruments = useQuery(instrumentListOptions());
  const parts = useQuery(partListOptions());
  const lab = useQuery(labInfoOptions());
  const size: PaperSize = params.get('paper') === 'letter' ? 'letter' : 'a4';
  const chosenInstruments = ids(params.get('instruments'));
  const chosenParts = ids(params.get('parts'));
  const update = (key: string, value: string) =>
    setParams((prev) => {
      const next = new URLSearchParams(prev);
      if (value) next.set(key, value);
      else next.delete(key);
      return next;
    }, { replace: true });

  if (instruments.isPending || parts.isPending || lab.isPending) return <Loading label="Loading inventory…" />;
  const base = lab.data?.publicUrl ?? window.location.origin;
  const items: LabelItem[] = [
    ...(instruments.data ?? []).filter((i) => chosenInstruments.has(i.id)).map((i) => ({ key: `i${i.id}`, tag: i.tag, description: i.name, url: `${base}/instruments/${i.id}` })),
    ...(parts.data ?? []).filter((p) => chosenParts.has(p.id)).map((p) => ({ key: `p${p.id}`, tag: p.tag, description: p.description, url: `${base}/parts/${p.id}` })),
  ];

  return (
    <div className="grid gap-6 lg:grid-cols-[22rem_1fr]">
      <div className="min-w-0 space-y-4 print:hidden">
        <div>
          <h1 className="text-display text-ink-900">QR labels</h1>
          <p className="mt-1 text-body text-ink-500">Choose items, then print on a label sheet. Scanning a label opens the item in Skewbench.</p>
        </div>
        <Panel>
          <div className="space-y-4">
            <SelectField label="Paper" value={size} onChange={(e) => update('paper', e.target.value === 'a4' ? '' : e.target.value)}>
              {(Object.keys(paper) as PaperSize[]).map((k) => <option key={k} value={k}>{paper[k].label}</option>)}
            </SelectField>
            <Checklist
              title="Instruments"
              items={(instruments.data ?? []).map((i) => ({ id: i.id, tag: i.tag, text: i.name }))}
              selected={chosenInstruments}
              onChange={(next) => update('instruments', [...next].join(','))}
            />
            <Checklist
              title="Cables and parts"
              items={(parts.data ?? []).map((p) => ({ id: p.id, tag: p.tag, text: p.description }))}
              selected={chosenParts}
              onChange={(next) => update('parts', [...next].join(','))}
            />
            <Button className="w-full" disabled={items.length === 0} onClick={() => window.print()}>
              Print {items.length} {items.length === 1 ? 'label' : 'labels'}
            </Button>
          </div>
        </Panel>
      </div>
      <div>{items.length ? <LabelSheet items={items} size={size} /> : <EmptyState title="No items chosen">Tick instruments or parts on the left.</EmptyState>}</div>
    </div>
  );
}
