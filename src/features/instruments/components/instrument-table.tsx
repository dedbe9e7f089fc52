import { useQuery } from '@tanstack/react-query';
import { createColumnHelper } from '@tanstack/react-table';
import { Link } from 'react-router-dom';
import { instrumentKindLabels, instrumentStatusLabels, type Instrument } from '@shared/schemas/instruments';
import { DataTable } from '@/components/ui/data-table';
import { Badge, Loading, Notice } from '@/components/ui/feedback';
import { formatDbm, formatRange } from '@/utils/format';
import { instrumentListOptions, type InstrumentFilters } from '../api/instruments.queries';
import { CalibrationBadge } from './calibration-badge';

const column = createColumnHelper<Instrument>();
const calibrationRank = { overdue: 0, 'due-soon': 1, ok: 2, none: 3 } as const;

const columns = [
  column.accessor('tag', {
    header: 'Tag',
    cell: (c) => (
      <Link to={`/instruments/${c.row.original.id}`} className="font-mono font-semibold text-phase-700 underline-offset-2 hover:underline">
        {c.getValue()}
      </Link>
    ),
  }),
  column.accessor('name', { header: 'Instrument' }),
  column.accessor((i) => instrumentKindLabels[i.kind], { id: 'kind', header: 'Kind' }),
  column.accessor('location', { header: 'Location' }),
  column.accessor('status', {
    header: 'Status',
    cell: (c) => <Badge tone={c.getValue() === 'in-service' ? 'pass' : c.getValue() === 'maintenance' ? 'caution' : 'muted'}>{instrumentStatusLabels[c.getValue()]}</Badge>,
  }),
  column.accessor((i) => calibrationRank[i.calibration.state] * 100000 + (i.calibration.daysLeft ?? 0), {
    id: 'calibration',
    header: 'Calibration',
    enableGlobalFilter: false,
    cell: (c) => <CalibrationBadge instrument={c.row.original} />,
  }),
  column.accessor((i) => formatRange(i.minFrequencyHz, i.maxFrequencyHz), { id: 'range', header: 'Range', enableSorting: false }),
  column.accessor('maxSafeInputDbm', { header: 'Max input', cell: (c) => formatDbm(c.getValue()), enableGlobalFilter: false }),
];

export function InstrumentTable({ filters, search }: { filters: InstrumentFilters; search: string }) {
  const instruments = useQuery(instrumentListOptions(filters));
  if (instruments.isPending) return <Loading label="Loading instruments…" />;
  if (instruments.isError) return <Notice tone="fault">{instruments.error.message}</Notice>;
  return (
    <DataTable
      data={instruments.data}
      columns={columns}
      search={search}
      caption="Instruments of the lab"
      initialSort={[{ id: 'tag', desc: false }]}
      rowLabel={(i) => `${i.tag} ${i.name}`}
      empty="No instrument matches these filters."
    />
  );
}
