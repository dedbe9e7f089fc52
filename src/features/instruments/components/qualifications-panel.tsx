import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { EmptyState, Loading, Notice, Panel } from '@/components/ui/feedback';
import { SelectField } from '@/components/ui/field';
import { useGrantQualification, useRevokeQualification } from '../api/instruments.mutations';
import { qualificationListOptions } from '../api/instruments.queries';

interface Candidate {
  id: number;
  name: string;
  active: boolean;
}

/** Who holds the qualification for an instrument; managers grant and revoke (candidates come from the People data). */
export function QualificationsPanel({ instrumentId, candidates }: { instrumentId: number; candidates: Candidate[] | null }) {
  const list = useQuery(qualificationListOptions(instrumentId));
  const grant = useGrantQualification(instrumentId);
  const revoke = useRevokeQualification(instrumentId);
  const [choice, setChoice] = useState('');
  const canManage = candidates !== null;
  const held = new Set(list.data?.map((q) => q.userId));
  const options = (candidates ?? []).filter((c) => c.active && !held.has(c.id));

  return (
    <Panel title="Qualified people">
      {list.isPending ? <Loading /> : list.isError ? <Notice tone="fault">{list.error.message}</Notice> : null}
      {list.data && list.data.length === 0 ? <EmptyState title="Nobody is recorded as qualified yet" /> : null}
      {list.data && list.data.length > 0 ? (
        <ul className="divide-y divide-ink-100">
          {list.data.map((q) => (
            <li key={q.userId} className="flex items-center justify-between gap-3 py-2">
              <div>
                <div className="font-semibold text-ink-800">{q.name}</div>
                <div className="text-caption text-ink-500">
                  since {new Date(q.grantedAt).toLocaleDateString()} {q.grantedBy ? `· recorded by ${q.grantedBy}` : ''}
                </div>
              </div>
              {canManage ? (
                <Button variant="quiet" className="!py-1" disabled={revoke.isPending} onClick={() => revoke.mutate(q.userId)}>
                  Revoke<span className="sr-only"> {q.name}</span>
                </Button>
              ) : null}
            </li>
          ))}
        </ul>
      ) : null}
      {canManage ? (
        <form
          className="mt-3 flex items-end gap-2 border-t border-ink-100 pt-3"
          onSubmit={(e) => {
            e.preventDefault();
            if (choice) grant.mutate(Number(choice), { onSuccess: () => setChoice('') });
          }}
        >
          <div className="flex-1">
            <SelectField label="Add a qualified person" value={choice} onChange={(e) => setChoice(e.target.value)}>
              <option value="">Choose a person…</option>
              {options.map((c) => <option key={c.id} value={c.id}>{c.name}</option>)}
            </SelectField>
          </div>
          <Button type="submit" variant="secondary" disabled={!choice || grant.isPending}>Record</Button>
        </form>
      ) : null}
      {grant.error ? <div className="mt-2"><Notice tone="fault">{grant.error.message}</Notice></div> : null}
      {revoke.error ? <div className="mt-2"><Notice tone="fault">{revoke.error.message}</Notice></div> : null}
    </Panel>
  );
}
