import { spacingOf } from '@shared/domain/analysis';
import type { SetupDocument } from '@shared/schemas/setups';
import { formatDbm, formatHz, formatMm } from '@/utils/format';

const Term = ({ children }: { children: string }) => <dt className="text-caption font-semibold uppercase tracking-wide text-ink-500">{children}</dt>;

/** The chip's delays and gains, the array, the measuring instruments with their settings, the device and the notes. */
export function SetupFacts({ document, instrumentTag }: { document: SetupDocument; instrumentTag: (id: number | null) => string }) {
  const a = document.analysis;
  const dut = document.dut;
  const settingsBy = new Map<number, { key: string; value: string }[]>();
  for (const s of document.settings) settingsBy.set(s.instrumentId, [...(settingsBy.get(s.instrumentId) ?? []), s]);
  const measured = [...new Set([...document.outputs.map((o) => o.instrumentId), ...settingsBy.keys()])];

  return (
    <div className="grid gap-5 md:grid-cols-2 print:grid-cols-2">
      <section aria-label="Chip settings" className="break-inside-avoid">
        <h3 className="font-bold text-ink-800">Array and chip</h3>
        <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-body">
          <Term>Inputs</Term>
          <dd>{a.array.elements}</dd>
          <Term>Spacing</Term>
          <dd className="tabular-nums">
            {formatMm(spacingOf(a.array), 3)}
            {a.array.spacingHalfWavelengthAtHz ? ` (λ/2 at ${formatHz(a.array.spacingHalfWavelengthAtHz)})` : ''}
          </dd>
          <Term>Chip delays</Term>
          <dd className="tabular-nums" data-testid="chip-delays">{a.combiner.delaysPs.map((d, c) => `in ${c}: ${d} ps`).join(' · ')}</dd>
          <Term>Gains</Term>
          <dd className="tabular-nums">{(a.combiner.gains ?? a.combiner.delaysPs.map(() => 1)).join(' · ')}</dd>
          {document.delayCodes ? (
            <>
              <Term>Delay codes</Term>
              <dd className="tabular-nums">
                {document.delayCodes.codes.join(' · ')} × {document.delayCodes.stepPs} ps
              </dd>
            </>
          ) : null}
          {a.inputs?.length ? (
            <>
              <Term>Input limits</Term>
              <dd className="tabular-nums">{a.inputs.map((i) => `in ${i.channel}: ${formatDbm(i.maxInputDbm)}`).join(' · ')}</dd>
            </>
          ) : null}
          {a.nullSearch ? (
            <>
              <Term>Null search</Term>
              <dd>
                {a.nullSearch.interferer}, up to {a.nullSearch.maxDelayPs} ps in {a.nullSearch.stepPs} ps steps
              </dd>
            </>
          ) : null}
        </dl>
      </section>
      <section aria-label="Device under test" className="break-inside-avoid">
        <h3 className="font-bold text-ink-800">Device under test</h3>
        <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-body">
          <Term>Chip</Term>
          <dd>{dut.chip || '—'}</dd>
          <Term>Board</Term>
          <dd>{dut.board || '—'}</dd>
          <Term>Die</Term>
          <dd>{dut.die || '—'}</dd>
          <Term>Supplies</Term>
          <dd className="whitespace-pre-line">{dut.supplies || '—'}</dd>
          {dut.notes ? (
            <>
              <Term>Notes</Term>
              <dd className="whitespace-pre-line">{dut.notes}</dd>
            </>
          ) : null}
        </dl>
      </section>
      <section aria-label="Instrument settings" className="break-inside-avoid md:col-span-2 print:col-span-2">
        <h3 className="font-bold text-ink-800">Instruments</h3>
        {measured.length === 0 ? <p className="mt-1 text-body text-ink-500">No measuring instrument or setting recorded.</p> : null}
        <ul className="mt-2 grid gap-3 sm:grid-cols-2">
          {measured.map((id) => {
            const output = document.outputs.find((o) => o.instrumentId === id);
            return (
              <li key={id} className="rounded-chip bg-ptfe-50 p-3 ring-1 ring-ink-100">
                <p className="font-mono font-semibold text-ink-800">
                  {instrumentTag(id)}
                  {output?.note ? <span className="ml-2 font-sans font-normal text-ink-600">{output.note}</span> : null}
                </p>
                {settingsBy.get(id)?.length ? (
                  <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-4 text-body">
                    {settingsBy.get(id)!.map((s, i) => (
                      <div key={i} className="contents">
                        <dt className="text-ink-500">{s.key}</dt>
                        <dd>{s.value}</dd>
                      </div>
                    ))}
                  </dl>
                ) : null}
              </li>
            );
          })}
        </ul>
      </section>
      {document.notes ? (
        <section aria-label="Notes" className="break-inside-avoid md:col-span-2 print:col-span-2">
          <h3 className="font-bold text-ink-800">Notes</h3>
          <p className="mt-1 whitespace-pre-line text-body text-ink-700">{document.notes}</p>
        </section>
      ) : null}
    </div>
  );
}
