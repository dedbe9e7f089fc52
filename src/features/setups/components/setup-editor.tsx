import { useEffect, useMemo, useRef, useState, type FormEvent, type ReactNode } from 'react';
import { Link } from 'react-router-dom';
import type { AnalysisResult } from '@shared/domain/analysis';
import type { Instrument } from '@shared/schemas/instruments';
import type { Part } from '@shared/schemas/parts';
import type { SetupDocument } from '@shared/schemas/setups';
import { Button } from '@/components/ui/button';
import { Notice, Panel } from '@/components/ui/feedback';
import { TextField } from '@/components/ui/field';
import { ApiError } from '@/lib/api-client';
import { useDebouncedValue } from '../hooks/use-debounced-value';
import { checkDraft, describePath, previewAnalysis, type Draft } from '../utils/setup-draft';
import { ArraySection } from './array-section';
import { CombinerSection } from './combiner-section';
import { DutSection } from './dut-section';
import { SetupEditorContext, type SetupEditorContextValue } from './editor-context';
import { InputLimitsSection } from './input-limits-section';
import { InstrumentsSection } from './instruments-section';
import { PathsSection } from './paths-section';
import { SourcesSection } from './sources-section';

export interface SetupEditorProps {
  initial: Draft;
  parts: Part[];
  instruments: Instrument[];
  /** Instruments of the setup's booking. */
  bookedInstrumentIds: number[];
  /** The setup's booking, and the setup when it exists (its own parts are not held against it). */
  bookingId: number;
  setupId?: number;
  onSave: (document: SetupDocument, note: string) => void;
  saving: boolean;
  /** The save's error: its field issues (`document.…` paths) land on the fields, anything else above the button. */
  error: unknown;
  submitLabel: string;
  cancelTo: string;
  /** How an analysis is shown (numbers and beam pattern), composed by the page. */
  renderAnalysis: (result: AnalysisResult) => ReactNode;
}

/** The server's field messages by document path (`document.analysis.paths.3…` → `analysis.paths.3…`). */
function serverFieldErrors(error: unknown): Map<string, string> {
  const map = new Map<string, string>();
  if (error instanceof ApiError) {
    for (const issue of error.fieldIssues) map.set(issue.path.replace(/^document\.?/, ''), issue.message);
  }
  return map;
}

/**
 * The setup editor: every part of the setup document, checked with the shared schema as it is typed, with a
 * live analysis of the wiring (the shared engine, on inventory parts resolved from the parts list).
 * A plain state object rather than react-hook-form: the paths form a grid of sources × inputs that follows
 * the number of inputs and the source list, which field arrays model poorly; the schema still decides.
 */
export function SetupEditor({ initial, parts, instruments, bookedInstrumentIds, bookingId, setupId, onSave, saving, error, submitLabel, cancelTo, renderAnalysis }: SetupEditorProps) {
  const [draft, setDraft] = useState(initial);
  const [touched, setTouched] = useState<ReadonlySet<string>>(new Set());
  const [submitted, setSubmitted] = useState(false);
  /** Counts refused save attempts, to move focus to the list of problems each time. */
  const [refusals, setRefusals] = useState(0);
  const [note, setNote] = useState('');
  const [serverErrors, setServerErrors] = useState(() => serverFieldErrors(error));
  const [seenError, setSeenError] = useState(error);
  const summary = useRef<HTMLDivElement>(null);
  if (error !== seenError) {
    // A new answer from the server: its messages replace the previous ones.
    setSeenError(error);
    setServerErrors(serverFieldErrors(error));
  }

  const partsById = useMemo(() => new Map(parts.map((p) => [p.id, p])), [parts]);
  const booked = useMemo(() => new Set(bookedInstrumentIds), [bookedInstrumentIds]);
  const scope = useMemo(() => ({ bookingId, setupId }), [bookingId, setupId]);
  const check = useMemo(() => checkDraft(draft, partsById), [draft, partsById]);
  // The engine runs a null search and a 181-point pattern: let typing settle for a moment first.
  const analysisInput = useDebouncedValue(check.analysisInput, 120);
  const preview = useMemo(() => previewAnalysis(analysisInput), [analysisInput]);

  const context: SetupEditorContextValue = {
    draft,
    check,
    preview,
    parts,
    partsById,
    instruments,
    booked,
    scope,
    update: (change, path) => {
      setDraft((current) => {
        const next = structuredClone(current);
        change(next);
        return next;
      });
      if (path && serverErrors.has(path)) {
        setServerErrors((m) => {
          const next = new Map(m);
          next.delete(path);
          return next;
        });
      }
    },
    errorFor: (path) => serverErrors.get(path) ?? (submitted || touched.has(path) ? check.errors.get(path) : undefined),
    touch: (path) => {
      if (!touched.has(path)) setTouched((t) => new Set(t).add(path));
    },
  };

  useEffect(() => {
    if (refusals > 0) summary.current?.focus();
  }, [refusals]);

  const problems = [...new Map([...check.errors, ...serverErrors]).entries()];
  const generalError = error && serverFieldErrors(error).size === 0 ? (error as Error).message : null;
  const submit = (event: FormEvent) => {
    event.preventDefault();
    setSubmitted(true);
    if (!check.document) {
      setRefusals((n) => n + 1);
      return;
    }
    onSave(check.document, note.trim());
  };

  return (
    <SetupEditorContext value={context}>
      <form onSubmit={submit} noValidate aria-label="Setup" className="grid gap-5 lg:grid-cols-[minmax(0,1fr)_30rem]">
        <div className="min-w-0 space-y-5">
          <Panel>
            <TextField
              label="Title"
              maxLength={160}
              placeholder="Interferer at −30°, desired at +28.7°"
              value={draft.title}
              error={context.errorFor('title')}
              onBlur={() => context.touch('title')}
              onChange={(e) => {
                const title = e.target.value;
                context.update((d) => void (d.title = title), 'title');
              }}
            />
          </Panel>
          <ArraySection />
          <SourcesSection />
          <PathsSection />
          <CombinerSection />
          <InputLimitsSection />
          <InstrumentsSection />
          <DutSection />
          <Panel title="Save">
            <div className="space-y-3">
              {generalError ? <Notice tone="fault">{generalError}</Notice> : null}
              {submitted && problems.length ? (
                <div ref={summary} tabIndex={-1} className="focus:outline-none">
                  <Notice tone="fault">
                    <p className="font-semibold">Fix these before saving:</p>
                    <ul className="mt-1 list-disc pl-5" aria-label="Problems">
                      {problems.map(([path, message]) => (
                        <li key={path}>
                          {describePath(path, draft, check.inputChannels)}: {message}
                        </li>
                      ))}
                    </ul>
                  </Notice>
                </div>
              ) : null}
              <TextField
                label="What changed"
                maxLength={500}
                placeholder="Swapped C-012 for C-011"
                hint="Saved with the revision, so the history says why."
                value={note}
                onChange={(e) => setNote(e.target.value)}
              />
              <div className="flex flex-wrap items-center gap-3">
                <Button type="submit" disabled={saving}>
                  {saving ? 'Saving…' : submitLabel}
                </Button>
                <Link to={cancelTo} className="font-semibold text-phase-700 hover:underline">
                  Cancel
                </Link>
              </div>
            </div>
          </Panel>
        </div>
        <aside aria-label="Live preview" className="min-w-0 lg:sticky lg:top-4 lg:max-h-[calc(100vh-2rem)] lg:self-start lg:overflow-auto">
          <Panel title="Live preview">
            <p className="mb-3 text-caption text-ink-500">Computed in your browser as you edit. Saving stores the server’s own analysis with the revision.</p>
            {preview ? (
              renderAnalysis(preview)
            ) : (
              <div className="space-y-2">
                <Notice>The preview appears once the array, sources, paths and combiner are complete.</Notice>
                <ul className="list-disc pl-5 text-caption text-ink-600" aria-label="Still missing">
                  {[...check.errors.entries()]
                    .filter(([path]) => path.startsWith('analysis.'))
                    .slice(0, 6)
                    .map(([path, message]) => (
                      <li key={path}>
                        {describePath(path, draft, check.inputChannels)}: {message}
                      </li>
                    ))}
                </ul>
              </div>
            )}
          </Panel>
        </aside>
      </form>
    </SetupEditorContext>
  );
}
