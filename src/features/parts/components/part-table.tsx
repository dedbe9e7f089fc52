import { useQuery } from '@tanstack/react-query';
import { createColumnHelper } from '@tanstack/react-table';
import { Link } from 'react-router-dom';
import { describeEnds } from '@shared/domain/connectors';
import { partKindLabels, partStatusLabels, type Part } from '@shared/schemas/parts';
import { DataTable } from '@/components/ui/data-table';
import { Badge, Loading, Notice } from '@/components/ui/feedback';
import { formatDb, formatPs } from '@/utils/format';
import { partListOptions, type PartFilters } from '../api/parts.queries';

const column = createColumnHelper<Part>();

/** Loss column: attenuation for pads, per-branch loss for splitters, dB/m at f_ref for cables. */
function lossText(p: Part): string {
  if (p.kind === 'cable') return p.lossDbPerM == null ? '—' : `${p.lossDbPerM} dB/m @ ${p.lossRefHz! / 1e9} GHz`;
  return formatDb(p.lossDb);
}

const columns = [
  column.accessor('tag', {
    header: 'Tag',
    cell: (c) => (
      <Link to={`/parts/${c.row.original.id}`} className="font-mono font-semibold text-phase-700 underline-offset-2 hover:underline">
        {c.getValue()}
      </Link>
    ),
  }),
  column.accessor((p) => partKindLabels[p.kind], { id: 'kind', header: 'Kind' }),
  column.accessor('description', { header: 'Description' }),
  column.accessor((p) => describeEnds(p), { id: 'connectors', header: 'Connectors', cell: (c) => <span className="whitespace-nowrap">{c.getValue()}</span> }),
  column.accessor('lengthMm', { header: 'Length', cell: (c) => (c.getValue() == null ? '—' : `${c.getValue()} mm`), enableGlobalFilter: false }),
  column.accessor('delayPs', {
    header: 'Delay',
    enableGlobalFilter: false,
    cell: (c) => (
      <span className="tabular-nums">
        {formatPs(c.getValue())}
        {c.row.original.delaySource === 'measured' ? <span className="ml-1 text-caption text-phase-700">measured</span> : null}
      </span>
    ),
  }),
  column.accessor(lossText, { id: 'loss', header: 'Loss', enableSorting: false, enableGlobalFilter: false }),
  column.accessor('status', {
    header: 'Status',
    cell: (c) => <Badge tone={c.getValue() === 'ok' ? 'pass' : c.getValue() === 'damaged' ? 'caution' : 'fault'}>{partStatusLabels[c.getValue()]}</Badge>,
  }),
];

export function PartTable({ filters, search }: { filters: PartFilters; search: string }) {
  const parts = useQuery(partListOptions(filters));
  if (parts.isPending) return <Loading label="Loading parts…" />;
  if (parts.isError) return <Notice tone="fault">{parts.error.message}</Notice>;
  return (
    <DataTable
      data={parts.data}
      columns={columns}
      search={search}
      caption="Cables and passive RF parts"
      initialSort={[{ id: 'tag', desc: false }]}
      rowLabel={(p) => `${p.tag} ${p.description}`}
      empty="No part matches these filters."
    />
  );
}
