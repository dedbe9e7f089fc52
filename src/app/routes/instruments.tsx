import { Link } from 'react-router-dom';
import { instrumentKindLabels, instrumentKinds, instrumentStatusLabels, instrumentStatuses } from '@shared/schemas/instruments';
import { SelectField, TextField } from '@/components/ui/field';
import { useSearchParam } from '@/hooks/use-search-param';
import { useSignedInUser } from '@/features/auth/hooks/use-signed-in-user';
import { InstrumentTable } from '@/features/instruments/components/instrument-table';

export function InstrumentsRoute() {
  const user = useSignedInUser();
  const [kind, setKind] = useSearchParam('kind', instrumentKinds);
  const [status, setStatus] = useSearchParam('status', instrumentStatuses);
  const [q, setSearch] = useSearchParam('q');
  const search = q ?? '';

  return (
    <div className="space-y-5">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-display text-ink-900">Instruments</h1>
          <p className="mt-1 text-body text-ink-500">What can be booked, where it stands, and when its calibration is due.</p>
        </div>
        {user.can('manager') ? (
          <Link to="/instruments/new" className="rounded-chip bg-copper-600 px-3.5 py-2 font-semibold text-white hover:bg-copper-700">Add instrument</Link>
        ) : null}
      </div>
      <div className="grid gap-3 sm:grid-cols-[2fr_1fr_1fr]">
        <TextField label="Search" type="search" placeholder="Tag, name, location…" value={search} onChange={(e) => setSearch(e.target.value)} />
        <SelectField label="Kind" value={kind ?? ''} onChange={(e) => setKind(e.target.value)}>
          <option value="">All kinds</option>
          {instrumentKinds.map((k) => <option key={k} value={k}>{instrumentKindLabels[k]}</option>)}
        </SelectField>
        <SelectField label="Status" value={status ?? ''} onChange={(e) => setStatus(e.target.value)}>
          <option value="">Any status</option>
          {instrumentStatuses.map((s) => <option key={s} value={s}>{instrumentStatusLabels[s]}</option>)}
        </SelectField>
      </div>
      <InstrumentTable filters={{ kind, status }} search={search} />
    </div>
  );
}
