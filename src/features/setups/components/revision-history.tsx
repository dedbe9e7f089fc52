import { Link } from 'react-router-dom';
import type { RevisionSummary } from '@shared/schemas/setups';
import { Panel } from '@/components/ui/feedback';
import { formatLabInstant } from '../utils/setup-time';

/** Every saved revision, newest first, each linking to the setup as it was then. */
export function RevisionHistory({ setupId, revisions, shown, timeZone }: { setupId: number; revisions: RevisionSummary[]; shown: number; timeZone: string }) {
  const latest = Math.max(...revisions.map((r) => r.number));
  return (
    <Panel title="History">
      <ol className="divide-y divide-ink-100" aria-label="Revisions">
        {revisions.map((r) => (
          <li key={r.id} className="py-2">
            <Link
              to={r.number === latest ? `/setups/${setupId}` : `/setups/${setupId}?revision=${r.number}`}
              aria-current={r.number === shown ? 'page' : undefined}
              className={`font-semibold underline-offset-4 hover:underline ${r.number === shown ? 'text-ink-900' : 'text-phase-700'}`}
            >
              Revision {r.number}
              {r.number === latest ? ' (latest)' : ''}
            </Link>
            <div className="text-caption text-ink-500">
              {formatLabInstant(r.savedAt, timeZone)} · {r.savedBy.name}
            </div>
            {r.note ? <p className="text-body text-ink-700">{r.note}</p> : null}
          </li>
        ))}
      </ol>
    </Panel>
  );
}
