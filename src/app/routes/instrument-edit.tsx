import { useQuery } from '@tanstack/react-query';
import { Link, useNavigate, useParams } from 'react-router-dom';
import { Loading, Notice } from '@/components/ui/feedback';
import { instrumentDetailOptions } from '@/features/instruments/api/instruments.queries';
import { InstrumentForm } from '@/features/instruments/components/instrument-form';

/** /instruments/new and /instruments/:id/edit (managers). */
export function InstrumentEditRoute() {
  const params = useParams();
  const id = params.id ? Number(params.id) : undefined;
  const navigate = useNavigate();
  const existing = useQuery({ ...instrumentDetailOptions(id ?? 0), enabled: id !== undefined });
  if (id !== undefined && existing.isPending) return <Loading label="Loading instrument…" />;
  if (id !== undefined && existing.isError) return <Notice tone="fault">{existing.error.message}</Notice>;
  return (
    <div className="space-y-5">
      <div>
        <Link to={id ? `/instruments/${id}` : '/instruments'} className="text-caption font-semibold text-phase-700">← Back</Link>
        <h1 className="mt-1 text-display text-ink-900">{id ? `Edit ${existing.data?.tag}` : 'New instrument'}</h1>
      </div>
      <InstrumentForm key={id ?? 'new'} instrument={existing.data} onSaved={(saved) => navigate(`/instruments/${saved.id}`)} />
    </div>
  );
}
