import { useQuery } from '@tanstack/react-query';
import { Link, useNavigate, useParams } from 'react-router-dom';
import { Loading, Notice } from '@/components/ui/feedback';
import { partDetailOptions } from '@/features/parts/api/parts.queries';
import { PartForm } from '@/features/parts/components/part-form';

/** /parts/new and /parts/:id/edit (managers). */
export function PartEditRoute() {
  const params = useParams();
  const id = params.id ? Number(params.id) : undefined;
  const navigate = useNavigate();
  const existing = useQuery({ ...partDetailOptions(id ?? 0), enabled: id !== undefined });
  if (id !== undefined && existing.isPending) return <Loading label="Loading part…" />;
  if (id !== undefined && existing.isError) return <Notice tone="fault">{existing.error.message}</Notice>;
  return (
    <div className="space-y-5">
      <div>
        <Link to={id ? `/parts/${id}` : '/parts'} className="text-caption font-semibold text-phase-700">← Back</Link>
        <h1 className="mt-1 text-display text-ink-900">{id ? `Edit ${existing.data?.tag}` : 'New part'}</h1>
      </div>
      <PartForm key={id ?? 'new'} part={existing.data} onSaved={(saved) => navigate(`/parts/${saved.id}`)} />
    </div>
  );
}
