import type { ReactNode } from 'react';
import { NEAR_LIMIT_DB, type AnalysisResult, type AnalysisWarning } from '@shared/domain/analysis';
import { Badge, Notice } from '@/components/ui/feedback';
import { formatDb, formatDbm, formatHz, formatMm, formatPs } from '@/utils/format';
import { formatAngle, roleLabels } from '../utils/display';

/** Shown with every power warning: the analysis is a check on paper, the bench is what counts. */
export const POWER_CAUTION = "Check levels before connecting: an instrument or chip input can be damaged by too much RF power. Your lab's rules come first.";

const powerCodes = new Set<AnalysisWarning['code']>(['input-overload', 'input-near-limit']);

function Section({ title, children }: { title: string; children: ReactNode }) {
  return (
    <section className="space-y-2">
      <h3 className="text-caption font-semibold uppercase tracking-wide text-ink-500">{title}</h3>
      {children}
    </section>
  );
}

const th = 'border-b border-ink-100 px-3 py-2 text-left text-caption font-semibold uppercase tracking-wide text-ink-500';
const td = 'whitespace-nowrap border-b border-ink-100 px-3 py-1.5 tabular-nums';

function Table({ caption, head, children }: { caption: string; head: ReactNode[]; children: ReactNode }) {
  return (
    <div className="overflow-x-auto rounded-panel bg-white ring-1 ring-ink-100">
      <table className="w-full text-body">
        <caption className="sr-only">{caption}</caption>
        <thead className="bg-ptfe-50">
          <tr>
            {head.map((h, i) => (
              <th key={i} scope="col" className={th}>
                {h}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>{children}</tbody>
      </table>
    </div>
  );
}

function PowerBadge({ marginDb }: { marginDb: number | null }) {
  if (marginDb === null) return <Badge tone="muted">no limit given</Badge>;
  if (marginDb < 0) return <Badge tone="fault">overload</Badge>;
  if (marginDb < NEAR_LIMIT_DB) return <Badge tone="caution">near the limit</Badge>;
  return <Badge tone="pass">within limit</Badge>;
}

/**
 * The numbers of an analysis: power warnings first (an overload is a fault, a level within NEAR_LIMIT_DB of the
 * limit a caution, both with the bench caution), then per source the emulated angle, path differences, phase
 * lags and response; the rejection and the best null; per input the total power against its limit; and the
 * other warnings.
 */
export function AnalysisSummary({ result }: { result: AnalysisResult }) {
  const overloads = result.warnings.filter((w) => w.code === 'input-overload');
  const nearLimits = result.warnings.filter((w) => w.code === 'input-near-limit');
  const others = result.warnings.filter((w) => !powerCodes.has(w.code));
  const channels = result.sources[0]?.relativeDelaysPs.length ?? 0;

  return (
    <div className="space-y-6">
      {overloads.length ? (
        <Notice tone="fault">
          <p className="font-bold">Too much power at {overloads.length === 1 ? 'an input' : `${overloads.length} inputs`}</p>
          <ul className="mt-1 list-disc pl-5">
            {overloads.map((w) => (
              <li key={w.channel}>{w.message}</li>
            ))}
          </ul>
          <p className="mt-2 font-semibold">{POWER_CAUTION}</p>
        </Notice>
      ) : null}
      {nearLimits.length ? (
        <Notice tone="caution">
          <p className="font-bold">Close to the limit at {nearLimits.length === 1 ? 'an input' : `${nearLimits.length} inputs`}</p>
          <ul className="mt-1 list-disc pl-5">
            {nearLimits.map((w) => (
              <li key={w.channel}>{w.message}</li>
            ))}
          </ul>
          <p className="mt-2 font-semibold">{POWER_CAUTION}</p>
        </Notice>
      ) : null}

      <Section title="Rejection">
        <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-body">
          <dt className="text-ink-500">Interferer rejection</dt>
          <dd className="font-semibold tabular-nums" data-testid="rejection">
            {result.rejectionDb === null ? 'needs exactly one desired source and one interferer' : formatDb(result.rejectionDb)}
          </dd>
          {result.bestNull ? (
            <>
              <dt className="text-ink-500">Best null</dt>
              <dd className="tabular-nums" data-testid="best-null">
                {formatDb(result.bestNull.rejectionDb)} with chip delays {result.bestNull.delaysPs.map((t) => Number(t.toFixed(3))).join(' / ')} ps
              </dd>
            </>
          ) : null}
          <dt className="text-ink-500">Element spacing</dt>
          <dd className="tabular-nums">{formatMm(result.spacingMm, 3)}</dd>
        </dl>
      </Section>

      <Section title="Sources">
        <Table caption="Per source: emulated angle and response" head={['Source', 'Role', 'Frequency', 'Emulated angle', 'Response']}>
          {result.sources.map((s) => (
            <tr key={s.key}>
              <th scope="row" className={`${td} text-left font-semibold text-ink-800`}>
                {s.key}
              </th>
              <td className={td}>{roleLabels[s.role]}</td>
              <td className={td}>{formatHz(s.frequencyHz)}</td>
              <td className={td} data-testid={`angle-${s.key}`}>
                {s.angleDeg === null ? (
                  <span title={`c·Δτ/d = ${s.sinTheta.toFixed(3)}: no real angle gives these delays`}>non-physical (c·Δτ/d = {s.sinTheta.toFixed(3)})</span>
                ) : (
                  formatAngle(s.angleDeg, 2)
                )}
              </td>
              <td className={td}>{formatDb(s.responseDb)}</td>
            </tr>
          ))}
        </Table>
        {channels > 1 ? (
          <Table
            caption="Per input, relative to input 0: each source's delay, free-space path difference and carrier phase lag"
            head={['Input', ...result.sources.flatMap((s) => [`${s.key} Δτ`, `${s.key} path difference`, `${s.key} phase lag`])]}
          >
            {Array.from({ length: channels - 1 }, (_, i) => i + 1).map((channel) => (
              <tr key={channel}>
                <th scope="row" className={`${td} text-left font-semibold text-ink-800`}>
                  {channel}
                </th>
                {result.sources.flatMap((s) => [
                  <td key={`${s.key}-t`} className={td}>
                    {formatPs(s.relativeDelaysPs[channel], 2)}
                  </td>,
                  <td key={`${s.key}-s`} className={td}>
                    {formatMm(s.pathDifferenceMm[channel], 3)}
                  </td>,
                  <td key={`${s.key}-p`} className={td}>
                    {formatAngle(s.phaseLagDeg[channel]!, 2)}
                  </td>,
                ])}
              </tr>
            ))}
          </Table>
        ) : null}
      </Section>

      <Section title="Power at the inputs">
        <Table caption="Per input: total power from all sources against its maximum safe level" head={['Input', 'Total power', 'Maximum safe level', 'Margin', '']}>
          {result.inputs.map((input) => (
            <tr key={input.channel}>
              <th scope="row" className={`${td} text-left font-semibold text-ink-800`}>
                {input.channel}
              </th>
              <td className={td}>{formatDbm(input.totalPowerDbm)}</td>
              <td className={td}>{formatDbm(input.maxInputDbm)}</td>
              <td className={td}>{formatDb(input.marginDb)}</td>
              <td className={td}>
                <PowerBadge marginDb={input.marginDb} />
              </td>
            </tr>
          ))}
        </Table>
      </Section>

      {others.length ? (
        <Section title="Other warnings">
          <ul className="space-y-2">
            {others.map((w, i) => (
              <li key={i}>
                <Notice tone="caution">{w.message}</Notice>
              </li>
            ))}
          </ul>
        </Section>
      ) : null}
    </div>
  );
}
