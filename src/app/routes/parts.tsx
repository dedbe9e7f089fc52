import { Link } from 'react-router-dom';
import { partKindLabels, partKinds, partStatusLabels, partStatuses } from '@shared/schemas/parts';
import { SelectField, TextField } from '@/components/ui/field';
import { useSearchParam } from '@/hooks/use-search-param';
import { useSignedInUser } from '@/features/auth/hooks/use-signed-in-user';
import { PartTable } from '@/features/parts/components/part-table';
import { PartsCsv } from '@/features/parts/components/parts-csv';

export function PartsRoute() {
  const user = useSignedInUser();
  const [kind, setKind] = useSearchParam('kind', partKinds);
  const [status, setStatus] = useSearchParam('status', partStatuses);
  const [q, setSearch] = useSearchParam('q');
  const search = q ?? '';

  return (
    <div className="space-y-5">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-display text-ink-900">Cables and parts</h1>
          <p className="mt-1 text-body text-ink-500">Every cable with its electrical delay, and the pads, splitters, adapters and DC blocks between instruments.</p>
        </div>
        <div className="flex flex-wrap items-start gap-2">
          <PartsCsv canImport={user.can('manager')} />
          {user.can('manager') ? (
            <Link to="/parts/new" className="rounded-chip bg-copper-600 px-3.5 py-2 font-semibold text-white hover:bg-copper-700">Add part</Link>
          ) : null}
        </div>
      </div>
      <div className="grid gap-3 sm:grid-cols-[2fr_1fr_1fr]">
        <TextField label="Search" type="search" placeholder="Tag, description…" value={search} onChange={(e) => setSearch(e.target.value)} />
        <SelectField label="Kind" value={kind ?? ''} onChange={(e) => setKind(e.target.value)}>
          <option value="">All kinds</option>
          {partKinds.map((k) => <option key={k} value={k}>{partKindLabels[k]}</option>)}
        </SelectField>
        <SelectField label="Status" value={status ?? ''} onChange={(e) => setStatus(e.target.value)}>
          <option value="">Any status</option>
          {partStatuses.map((s) => <option key={s} value={s}>{partStatusLabels[s]}</option>)}
        </SelectField>
      </div>
      <PartTable filters={{ kind, status }} search={search} />
    </div>
  );
}
