import { queryOptions } from '@tanstack/react-query';
import { photoListSchema, type PhotoSubjectType } from '@shared/schemas/photos';
import { api } from '@/lib/api-client';

export const photoKeys = {
  all: ['photos'] as const,
  lists: () => [...photoKeys.all, 'list'] as const,
  list: (subjectType: PhotoSubjectType, subjectId: number) => [...photoKeys.lists(), { subjectType, subjectId }] as const,
};

async function getPhotos(subjectType: PhotoSubjectType, subjectId: number) {
  const query = new URLSearchParams({ subjectType, subjectId: String(subjectId) });
  return (await api(`/photos?${query}`, { schema: photoListSchema })).photos;
}

/** The photos of one instrument, part or setup, newest first. */
export const photoListOptions = (subjectType: PhotoSubjectType, subjectId: number) =>
  queryOptions({ queryKey: photoKeys.list(subjectType, subjectId), queryFn: () => getPhotos(subjectType, subjectId) });
