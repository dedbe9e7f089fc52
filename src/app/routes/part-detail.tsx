import { useQuery } from '@tanstack/react-query';
import { Link, useParams } from 'react-router-dom';
import { Loading, Notice } from '@/components/ui/feedback';
import { useSignedInUser } from '@/features/auth/hooks/use-signed-in-user';
import { partDetailOptions } from '@/features/parts/api/parts.queries';
import { PartDetails } from '@/features/parts/components/part-details';
import { PhotoGallery } from '@/features/photos/components/photo-gallery';

export function PartDetailRoute() {
  const id = Number(useParams().id);
  const user = useSignedInUser();
  const isManager = user.can('manager');
  const part = useQuery(partDetailOptions(id));
  if (part.isPending) return <Loading label="Loading part…" />;
  if (part.isError) return <Notice tone="fault">{part.error.message}</Notice>;
  const p = part.data;
  return (
    <div className="space-y-5">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <Link to="/parts" className="text-caption font-semibold text-phase-700">← Cables and parts</Link>
          <h1 className="mt-1 text-display text-ink-900">
            <span className="font-mono">{p.tag}</span> <span className="font-semibold text-ink-700">{p.description}</span>
          </h1>
        </div>
        {isManager ? (
          <Link to={`/parts/${p.id}/edit`} className="rounded-chip bg-white px-3.5 py-2 font-semibold text-ink-800 ring-1 ring-ink-200 hover:bg-ptfe-100">Edit</Link>
        ) : null}
      </div>
      <PartDetails part={p} />
      <PhotoGallery subjectType="part" subjectId={p.id} canUpload={isManager} currentUserId={user.id} isManager={isManager} />
    </div>
  );
}
