import { useQuery } from '@tanstack/react-query';
import { useState, type FormEvent } from 'react';
import type { SetupDiff } from '@shared/domain/setup-diff';
import { Button } from '@/components/ui/button';
import { EmptyState, Loading, Notice, Panel } from '@/components/ui/feedback';
import { SelectField } from '@/components/ui/field';
import { formatDb } from '@/utils/format';
import { setupCompareOptions } from '../api/setups.queries';

export interface RevisionChoice {
  /** Revision id (not number): revisions of another setup, such as the one this was reloaded from, compare too. */
  id: number;
  label: string;
}

/** An angle as the analysis panels write it: a true minus sign, two decimals. */
const angle = (deg: number | null) => (deg === null ? 'non-physical' : `${deg < 0 ? '−' : ''}${Math.abs(deg).toFixed(2)}°`);
const moved = (a: number | null, b: number | null) => a !== b && !(a !== null && b !== null && Math.abs(a - b) < 1e-9);
const fieldLabels: Record<string, string> = {
  'analysis.array': 'Array',
  'analysis.sources': 'Sources',
  'analysis.combiner': 'Chip delays and gains',
  'analysis.inputs': 'Input limits',
  title: 'Title',
  generators: 'Generators',
  outputs: 'Measuring instruments',
  delayCodes: 'Delay codes',
  dut: 'Device under test',
  notes: 'Notes',
};

/** A field's value in one line, cut short: the full documents are one click away in the history. */
function short(value: unknown): string {
  if (value === null || value === undefined) return '—';
  const text = typeof value === 'string' ? value : JSON.stringify(value);
  return text.length > 160 ? `${text.slice(0, 157)}…` : text;
}

function DiffView({ diff, instrumentTag }: { diff: SetupDiff; instrumentTag: (id: number | null) => string }) {
  const results = diff.results.filter((r) => moved(r.angleBefore, r.angleAfter) || moved(r.responseBefore, r.responseAfter));
  const rejectionMoved = moved(diff.rejection.before, diff.rejection.after);
  const nothing = !diff.segments.length && !diff.settings.length && !diff.fields.length && !results.length && !rejectionMoved;
  if (nothing) return <EmptyState title="The two revisions are the same" />;
  const cell = 'px-3 py-1.5 align-top';
  return (
    <div className="space-y-5">
      {results.length || rejectionMoved ? (
        <section aria-label="How the results moved">
          <h3 className="font-bold text-ink-800">Results</h3>
          <ul className="mt-1 space-y-1 text-body">
            {results.map((r) => (
              <li key={r.source}>
                <span className="font-semibold">{r.source}</span>: angle {angle(r.angleBefore)} → {angle(r.angleAfter)}, response {formatDb(r.responseBefore)} →{' '}
                {formatDb(r.responseAfter)}
              </li>
            ))}
            {rejectionMoved ? (
              <li>
                <span className="font-semibold">Rejection</span>: {formatDb(diff.rejection.before)} → {formatDb(diff.rejection.after)}
              </li>
            ) : null}
          </ul>
        </section>
      ) : null}
      {diff.segments.length ? (
        <section aria-label="Segments changed" className="overflow-x-auto">
          <h3 className="font-bold text-ink-800">Segments</h3>
          <table className="mt-1 w-full text-left text-body">
            <thead>
              <tr className="text-caption uppercase tracking-wide text-ink-500">
                <th scope="col" className={cell}>Path</th>
                <th scope="col" className={cell}>#</th>
                <th scope="col" className={cell}>Change</th>
                <th scope="col" className={cell}>Before</th>
                <th scope="col" className={cell}>After</th>
              </tr>
            </thead>
            <tbody>
              {diff.segments.map((s, i) => (
                <tr key={i} className="border-t border-ink-100">
                  <td className={cell}>
                    {s.source} → input {s.channel}
                  </td>
                  <td className={`${cell} tabular-nums`}>{s.index + 1}</td>
                  <td className={cell}>{s.change}</td>
                  <td className={`${cell} font-mono`}>{s.before ?? '—'}</td>
                  <td className={`${cell} font-mono`}>{s.after ?? '—'}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      ) : null}
      {diff.settings.length ? (
        <section aria-label="Settings changed">
          <h3 className="font-bold text-ink-800">Settings</h3>
          <ul className="mt-1 space-y-1 text-body">
            {diff.settings.map((s, i) => (
              <li key={i}>
                <span className="font-mono font-semibold">{instrumentTag(s.instrumentId)}</span> {s.key}: {s.before ?? '—'} → {s.after ?? '—'}
              </li>
            ))}
          </ul>
        </section>
      ) : null}
      {diff.fields.length ? (
        <section aria-label="Other changes">
          <h3 className="font-bold text-ink-800">Other changes</h3>
          <dl className="mt-1 space-y-2 text-body">
            {diff.fields.map((f) => (
              <div key={f.field}>
                <dt className="font-semibold">{fieldLabels[f.field] ?? f.field}</dt>
                <dd className="break-words font-mono text-caption text-ink-600">
                  {short(f.before)} → {short(f.after)}
                </dd>
              </div>
            ))}
          </dl>
        </section>
      ) : null}
    </div>
  );
}

interface CompareRevisionsProps {
  choices: RevisionChoice[];
  /** The pair shown, kept by the page (in the URL); null until one is asked for. */
  pair: { from: number; to: number } | null;
  onCompare: (pair: { from: number; to: number }) => void;
  instrumentTag: (id: number | null) => string;
}

/** Pick two revisions and see what changed: segments, settings, other fields, and how angles and rejection moved. */
export function CompareRevisions({ choices, pair, onCompare, instrumentTag }: CompareRevisionsProps) {
  const [from, setFrom] = useState(pair?.from ?? choices[1]?.id ?? choices[0]?.id ?? 0);
  const [to, setTo] = useState(pair?.to ?? choices[0]?.id ?? 0);
  const diff = useQuery({ ...setupCompareOptions(pair?.from ?? 0, pair?.to ?? 0), enabled: pair !== null });
  const submit = (event: FormEvent) => {
    event.preventDefault();
    onCompare({ from, to });
  };

  if (choices.length < 2) {
    return (
      <Panel title="Compare" className="min-w-0">
        <p className="text-body text-ink-500">Once the setup has a second revision, compare any two here.</p>
      </Panel>
    );
  }
  return (
    <Panel title="Compare" className="min-w-0">
      <form onSubmit={submit} aria-label="Compare revisions" className="grid items-end gap-3 sm:grid-cols-[minmax(0,1fr)_minmax(0,1fr)_auto]">
        <SelectField label="From" value={from} onChange={(e) => setFrom(Number(e.target.value))}>
          {choices.map((c) => (
            <option key={c.id} value={c.id}>
              {c.label}
            </option>
          ))}
        </SelectField>
        <SelectField label="To" value={to} onChange={(e) => setTo(Number(e.target.value))}>
          {choices.map((c) => (
            <option key={c.id} value={c.id}>
              {c.label}
            </option>
          ))}
        </SelectField>
        <Button type="submit" variant="secondary" disabled={from === to}>
          Compare
        </Button>
      </form>
      <div className="mt-4" aria-live="polite">
        {pair === null ? null : diff.isPending ? (
          <Loading label="Comparing…" />
        ) : diff.isError ? (
          <Notice tone="fault">{diff.error.message}</Notice>
        ) : (
          <DiffView diff={diff.data} instrumentTag={instrumentTag} />
        )}
      </div>
    </Panel>
  );
}
