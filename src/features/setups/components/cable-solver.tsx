import { useState, type FormEvent } from 'react';
import { createPortal } from 'react-dom';
import type { SolverPreference } from '@shared/domain/solver';
import { solverInputSchema, type SolverProposal, type SolverResponse } from '@shared/schemas/solver';
import { Button } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { Badge, EmptyState, Notice } from '@/components/ui/feedback';
import { SelectField, TextField } from '@/components/ui/field';
import { ApiError } from '@/lib/api-client';
import { formatDb, formatHz, formatPs } from '@/utils/format';
import { useSolveCables } from '../api/solver.mutations';
import {
  applyProposal,
  initialSolverForm,
  newSharedSegment,
  preferenceLabels,
  proposalFits,
  solverRequest,
  withAllSources,
  type SolverAsked,
  type SolverForm,
} from '../utils/solver-request';
import { useSetupEditor } from './editor-context';
import { PartPicker } from './part-picker';

/** A signed number with a true minus sign: −35.13, 0, 2.5. */
function signed(value: number, digits: number): string {
  const rounded = Number(value.toFixed(digits));
  return rounded < 0 ? `−${Math.abs(rounded)}` : rounded > 0 ? `+${rounded}` : '0';
}
const angle = (deg: number | null, digits = 2) => (deg === null ? 'non-physical' : `${signed(deg, digits).replace(/^\+/, '')}°`);

/** Where a request field is, in words, for problems the finder's own fields do not show. */
function describeField(path: string, sourceKeys: string[]): string {
  const parts = path.split('.');
  if (parts[0] === 'array') return 'Array under test';
  if (parts[0] === 'sources' && parts[1] !== undefined) return `Source ${sourceKeys[Number(parts[1])] || Number(parts[1]) + 1}`;
  if (parts[0] === 'sources') return 'Sources';
  if (parts[0] === 'bookingId' || parts[0] === 'setupId') return 'Booking';
  return 'Request';
}

/** Fields of the finder itself; any other problem lies in the setup (array, sources) and is listed. */
const ownField = (path: string) => /^(sources\.\d+\.targetAngleDeg|tolerancePs|maxSegments|prefer|sharedPartIds(\.\d+)?)$/.test(path);

const delaySourceLabels = { measured: 'measured', computed: 'computed', entered: 'entered' } as const;

function DelayMark({ source }: { source: keyof typeof delaySourceLabels }) {
  return <Badge tone={source === 'measured' ? 'pass' : 'muted'}>{delaySourceLabels[source]}</Badge>;
}

function ProposalCard({ proposal, answer, asked, onApply }: { proposal: SolverProposal; answer: SolverResponse; asked: SolverAsked; onApply: () => void }) {
  const p = proposal;
  const cell = 'px-2 py-1.5 align-top';
  return (
    <section aria-label={`Proposal ${p.rank}`} className="rounded-chip bg-ptfe-50 p-4 ring-1 ring-ink-100">
      <div className="flex flex-wrap items-center gap-x-3 gap-y-2">
        <h3 className="text-lead font-bold text-ink-800">Proposal {p.rank}</h3>
        {p.meetsTolerance ? <Badge tone="pass">Within ±{asked.tolerancePs} ps</Badge> : <Badge tone="caution">Closest: {p.maxErrorPs.toFixed(2)} ps off</Badge>}
        <span className="text-caption tabular-nums text-ink-500">
          {p.totals.segments} segments · {formatDb(p.totals.lossDb)} in all · {Math.round(p.totals.lengthMm)} mm of cable
        </span>
        <Button className="ml-auto !py-1.5" onClick={onApply}>
          Apply proposal {p.rank}
        </Button>
      </div>
      <ul className="mt-2 space-y-0.5 text-body text-ink-700" aria-label="Emulated angles">
        {p.sources.map((s) => (
          <li key={s.key} data-testid={`proposal-angle-${s.key}`}>
            <span className="font-semibold">{s.key}</span> emulates <span className="font-semibold tabular-nums">{angle(s.angleDeg)}</span>
            {s.targetAngleDeg !== null ? (
              <span className="tabular-nums text-ink-500">
                {' '}
                (target {angle(s.targetAngleDeg)}
                {s.angleErrorDeg !== null ? `, off by ${signed(s.angleErrorDeg, 2)}°` : ''}; largest path error {s.maxErrorPs.toFixed(2)} ps)
              </span>
            ) : null}
          </li>
        ))}
      </ul>
      {answer.shared.length ? (
        <p className="mt-2 text-caption text-ink-500">
          Every path starts with {answer.shared.map((s) => `${s.tag} (${s.connectors})`).join(' → ')}, then its chain.
        </p>
      ) : null}
      <div className="mt-2 overflow-x-auto">
        <table className="w-full text-left text-body">
          <thead className="text-caption uppercase tracking-wide text-ink-500">
            <tr>
              <th scope="col" className={cell}>Path</th>
              <th scope="col" className={cell}>Chain, from the generator</th>
              <th scope="col" className={`${cell} text-right`}>Delay</th>
              <th scope="col" className={`${cell} text-right`}>Error</th>
              <th scope="col" className={`${cell} text-right`}>Loss</th>
            </tr>
          </thead>
          <tbody className="divide-y divide-ink-100">
            {p.paths.map((path) => (
              <tr key={`${path.source}-${path.channel}`}>
                <th scope="row" className={`${cell} whitespace-nowrap font-semibold text-ink-800`}>
                  {path.source} → input {path.channel}
                </th>
                <td className={cell}>
                  <ol className="flex flex-wrap items-center gap-x-1.5 gap-y-1">
                    {path.chain.map((s, i) => (
                      <li key={s.partId} className="flex items-center gap-1.5">
                        {i > 0 ? <span aria-hidden className="text-ink-300">+</span> : null}
                        <span className="font-mono font-semibold text-ink-800">{s.tag}</span>
                        <span className="text-caption text-ink-500">{s.connectors}</span>
                        <span className="text-caption tabular-nums text-ink-500">{formatPs(s.delayPs, 1)}</span>
                        <DelayMark source={s.delaySource} />
                      </li>
                    ))}
                  </ol>
                  {path.cautions.length ? (
                    <ul className="mt-1 space-y-0.5 text-caption font-semibold text-caution-700" aria-label="Cautions">
                      {path.cautions.map((c) => (
                        <li key={c}>⚠ {c}</li>
                      ))}
                    </ul>
                  ) : null}
                </td>
                <td className={`${cell} whitespace-nowrap text-right tabular-nums`}>{formatPs(path.delayPs, 2)}</td>
                <td className={`${cell} whitespace-nowrap text-right tabular-nums ${Math.abs(path.errorPs) > asked.tolerancePs + 1e-9 ? 'font-semibold text-caution-700' : ''}`}>
                  {signed(path.errorPs, 2)} ps
                </td>
                <td className={`${cell} whitespace-nowrap text-right tabular-nums`}>{formatDb(path.lossDb)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </section>
  );
}

/** What was left out, in words: parts held at an overlapping time, damaged or lost, or unusable for the search. */
function LeftOut({ excluded, candidates }: Pick<SolverResponse, 'excluded' | 'candidates'>) {
  const held = [...new Set(excluded.held.map((h) => h.tag))];
  const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;
  const notes = [
    held.length ? `${held.join(', ')} (wired in another setup at an overlapping time)` : null,
    excluded.notOk ? `${plural(excluded.notOk, 'damaged or lost part', 'damaged or lost parts')}` : null,
    excluded.noDelay ? `${plural(excluded.noDelay, 'part', 'parts')} without a known delay` : null,
    excluded.outOfBand ? `${plural(excluded.outOfBand, 'part', 'parts')} not rated for the sources’ frequencies` : null,
  ].filter(Boolean);
  return (
    <p className="text-caption text-ink-500" data-testid="solver-left-out">
      Built from {candidates} free cables and adapters.{notes.length ? ` Left out: ${notes.join('; ')}.` : ''}
    </p>
  );
}

/**
 * "Find cables for an angle": per source a target angle, a tolerance and bounds; the server's cable solver answers
 * with proposals from the parts that are free in this booking's slot, and "Apply" wires one into the paths, so
 * the live preview shows the angle it emulates. Nothing is saved until the setup is.
 */
export function CableSolver() {
  const { draft, preview, parts, update, scope } = useSetupEditor();
  const solve = useSolveCables();
  const [open, setOpen] = useState(false);
  const [form, setForm] = useState<SolverForm | null>(null);
  const [asked, setAsked] = useState<SolverAsked | null>(null);
  const [clientErrors, setClientErrors] = useState<Map<string, string>>(new Map());
  const [applied, setApplied] = useState<string | null>(null);
  const [stale, setStale] = useState(false);

  const openFinder = () => {
    setForm((f) => (f ? withAllSources(f, draft) : initialSolverForm(draft, preview)));
    setStale(false);
    setApplied(null);
    setOpen(true);
  };

  const apiError = solve.error instanceof ApiError ? solve.error : null;
  const errors = new Map(clientErrors);
  for (const issue of apiError?.fieldIssues ?? []) if (!errors.has(issue.path)) errors.set(issue.path, issue.message);
  const sourceKeys = draft.sources.map((s) => s.key.trim());
  const elsewhere = [...errors.entries()].filter(([path]) => !ownField(path));
  const generalError = solve.error && !(apiError && apiError.fieldIssues.length) ? solve.error.message : null;

  const setField = (change: (f: SolverForm) => SolverForm, path?: string) => {
    setForm((f) => (f ? change(f) : f));
    if (path && clientErrors.has(path)) {
      setClientErrors((m) => {
        const next = new Map(m);
        next.delete(path);
        return next;
      });
    }
  };

  const submit = (event: FormEvent) => {
    event.preventDefault();
    // The dialog sits in the setup form's React tree: its submit must not reach the setup form.
    event.stopPropagation();
    if (!form) return;
    const { input, sourceIds } = solverRequest(draft, form, scope);
    const parsed = solverInputSchema.safeParse(input);
    if (!parsed.success) {
      const map = new Map<string, string>();
      for (const issue of parsed.error.issues) {
        const path = issue.path.map(String).join('.');
        if (!map.has(path)) map.set(path, issue.message);
      }
      setClientErrors(map);
      solve.reset();
      return;
    }
    setClientErrors(new Map());
    setStale(false);
    setAsked({ sourceIds, sourceKeys: parsed.data.sources.map((s) => s.key), elements: parsed.data.array.elements, sharedPartIds: parsed.data.sharedPartIds, tolerancePs: parsed.data.tolerancePs });
    solve.mutate(input);
  };

  const apply = (proposal: SolverProposal) => {
    if (!asked || !proposalFits(draft, asked)) {
      setStale(true);
      return;
    }
    update((d) => applyProposal(d, proposal, asked));
    setApplied(`Proposal ${proposal.rank} is wired into the paths below; the live preview shows the angles it emulates. Save the setup to keep it.`);
    setOpen(false);
  };

  const answer = solve.data && asked ? solve.data : null;
  const usable = parts.filter((p) => p.status === 'ok');

  return (
    <div className="mb-4 space-y-3">
      <div className="flex flex-wrap items-center gap-3 rounded-chip bg-phase-50 px-3.5 py-2.5 ring-1 ring-phase-100">
        <p className="min-w-0 flex-1 text-body text-phase-800">Know the angles you want? Let Skewbench pick cables from the shelf that are free for this booking.</p>
        <Button variant="secondary" onClick={openFinder}>
          Find cables for an angle
        </Button>
      </div>
      {applied ? <Notice tone="pass">{applied}</Notice> : null}
      {open && form
        ? createPortal(
            <Dialog title="Find cables for an angle" onClose={() => setOpen(false)} className="w-[min(68rem,96vw)]">
              <form onSubmit={submit} noValidate aria-label="Find cables" className="space-y-4">
                <p className="text-body text-ink-600">
                  For the array above ({draft.elements} inputs) and this booking’s time slot: parts that another setup wires at an overlapping time, and damaged or lost
                  parts, are left out. Each part is used once; every joint must mate.
                </p>
                <fieldset>
                  <legend className="text-caption font-semibold uppercase tracking-wide text-ink-600">Target angle per source</legend>
                  <div className="mt-1 grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
                    {draft.sources.map((s, i) => {
                      const freq = Number(s.frequencyGhz);
                      return (
                        <TextField
                          key={s.id}
                          label={`Target angle of ${s.key.trim() || `source ${i + 1}`} (°)`}
                          inputMode="decimal"
                          hint={`From broadside; ${s.frequencyGhz.trim() && Number.isFinite(freq) ? formatHz(freq * 1e9) : 'frequency not set'}`}
                          value={form.targets[s.id] ?? ''}
                          error={errors.get(`sources.${i}.targetAngleDeg`)}
                          onChange={(e) => {
                            const v = e.target.value;
                            setField((f) => ({ ...f, targets: { ...f.targets, [s.id]: v } }), `sources.${i}.targetAngleDeg`);
                          }}
                        />
                      );
                    })}
                  </div>
                </fieldset>
                <div className="grid gap-3 sm:grid-cols-3">
                  <TextField
                    label="Tolerance (ps)"
                    inputMode="decimal"
                    hint="Largest error allowed on any path."
                    value={form.tolerancePs}
                    error={errors.get('tolerancePs')}
                    onChange={(e) => {
                      const v = e.target.value;
                      setField((f) => ({ ...f, tolerancePs: v }), 'tolerancePs');
                    }}
                  />
                  <SelectField
                    label="Most segments per path"
                    value={form.maxSegments}
                    error={errors.get('maxSegments')}
                    onChange={(e) => {
                      const v = e.target.value;
                      setField((f) => ({ ...f, maxSegments: v }), 'maxSegments');
                    }}
                  >
                    {['1', '2', '3', '4'].map((n) => (
                      <option key={n} value={n}>
                        {n}
                      </option>
                    ))}
                  </SelectField>
                  <SelectField
                    label="Prefer"
                    value={form.prefer}
                    error={errors.get('prefer')}
                    hint="Among proposals within the tolerance."
                    onChange={(e) => {
                      const v = e.target.value as SolverPreference;
                      setField((f) => ({ ...f, prefer: v }), 'prefer');
                    }}
                  >
                    {(Object.keys(preferenceLabels) as SolverPreference[]).map((p) => (
                      <option key={p} value={p}>
                        {preferenceLabels[p]}
                      </option>
                    ))}
                  </SelectField>
                </div>
                <fieldset>
                  <legend className="text-caption font-semibold uppercase tracking-wide text-ink-600">Shared segments (optional)</legend>
                  <p className="text-caption text-ink-500">Fixed parts every path starts with, in order from the generator: e.g. the cable into the splitter, then the splitter.</p>
                  <ol className="mt-2 space-y-2">
                    {form.shared.map((s, i) => (
                      <li key={s.id} className="flex items-end gap-2">
                        <div className="min-w-0 flex-1">
                          <PartPicker
                            label={`Shared segment ${i + 1}`}
                            parts={usable}
                            value={s.partId}
                            error={errors.get(`sharedPartIds.${i}`)}
                            onChange={(partId) => setField((f) => ({ ...f, shared: f.shared.map((x) => (x.id === s.id ? { ...x, partId } : x)) }), `sharedPartIds.${i}`)}
                          />
                        </div>
                        <Button variant="quiet" onClick={() => setField((f) => ({ ...f, shared: f.shared.filter((x) => x.id !== s.id) }), `sharedPartIds.${i}`)}>
                          Remove<span className="sr-only"> shared segment {i + 1}</span>
                        </Button>
                      </li>
                    ))}
                  </ol>
                  {errors.get('sharedPartIds') ? (
                    <p role="alert" className="mt-1 text-caption font-semibold text-fault-700">
                      {errors.get('sharedPartIds')}
                    </p>
                  ) : null}
                  <Button variant="secondary" className="mt-2 !py-1.5" onClick={() => setField((f) => ({ ...f, shared: [...f.shared, newSharedSegment()] }))}>
                    Add a shared segment
                  </Button>
                </fieldset>
                {elsewhere.length ? (
                  <Notice tone="fault">
                    <p className="font-semibold">Fix these in the setup first:</p>
                    <ul className="mt-1 list-disc pl-5">
                      {elsewhere.map(([path, message]) => (
                        <li key={path}>
                          {describeField(path, sourceKeys)}: {message}
                        </li>
                      ))}
                    </ul>
                  </Notice>
                ) : null}
                {generalError ? <Notice tone="fault">{generalError}</Notice> : null}
                <Button type="submit" disabled={solve.isPending}>
                  {solve.isPending ? 'Searching…' : 'Find cables'}
                </Button>
              </form>

              {answer && asked && !solve.isPending ? (
                <section aria-label="Proposals" className="mt-5 space-y-3 border-t border-ink-100 pt-4">
                  {answer.feasible ? (
                    <Notice tone="pass">
                      {answer.proposals.length === 1 ? 'One proposal meets' : `${answer.proposals.length} proposals meet`} ±{asked.tolerancePs} ps on every path, best first.
                    </Notice>
                  ) : (
                    <Notice tone="caution">
                      <p className="font-semibold">
                        No combination of free parts meets ±{asked.tolerancePs} ps on every path.{answer.proposals.length ? ' The closest proposals follow.' : ''}
                      </p>
                      {answer.limits.length ? (
                        <>
                          <p className="mt-1">What limits them:</p>
                          <ul className="mt-1 list-disc pl-5" aria-label="What limits the proposals">
                            {answer.limits.map((l) => (
                              <li key={l}>{l}</li>
                            ))}
                          </ul>
                        </>
                      ) : null}
                    </Notice>
                  )}
                  <LeftOut excluded={answer.excluded} candidates={answer.candidates} />
                  {!answer.search.complete ? <Notice tone="caution">The search hit its safety limit before it ended: better proposals may exist. Allow fewer segments per path.</Notice> : null}
                  {stale ? <Notice tone="fault">The inputs or sources changed since this search: find cables again before applying.</Notice> : null}
                  {answer.proposals.length === 0 ? <EmptyState title="No proposal">No chain of free parts fits these paths.</EmptyState> : null}
                  {answer.proposals.map((p) => (
                    <ProposalCard key={p.rank} proposal={p} answer={answer} asked={asked} onApply={() => apply(p)} />
                  ))}
                </section>
              ) : null}
            </Dialog>,
            document.body,
          )
        : null}
    </div>
  );
}
