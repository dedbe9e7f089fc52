import { useMutation, useQueryClient } from '@tanstack/react-query';
import { photoResponseSchema, type PhotoSubjectType, type UpdatePhotoInput } from '@shared/schemas/photos';
import { api, upload } from '@/lib/api-client';
import { photoKeys } from './photos.queries';

export interface UploadPhotoInput {
  subjectType: PhotoSubjectType;
  subjectId: number;
  caption: string;
  file: File;
  /** Fraction of the file sent so far (0…1), for a progress bar. */
  onProgress?: (fraction: number) => void;
}

export function useUploadPhoto() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ subjectType, subjectId, caption, file, onProgress }: UploadPhotoInput) => {
      const form = new FormData();
      form.set('subjectType', subjectType);
      form.set('subjectId', String(subjectId));
      form.set('caption', caption);
      // The file goes last, so the server has read the text fields when the file arrives.
      form.set('file', file);
      return upload('/photos', form, { schema: photoResponseSchema, onProgress });
    },
    onSuccess: (_data, { subjectType, subjectId }) => queryClient.invalidateQueries({ queryKey: photoKeys.list(subjectType, subjectId) }),
  });
}

export function useUpdatePhoto() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, changes }: { id: number; changes: UpdatePhotoInput }) =>
      api(`/photos/${id}`, { method: 'PATCH', body: changes, schema: photoResponseSchema }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: photoKeys.lists() }),
  });
}

export function useDeletePhoto() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: number) => api<void>(`/photos/${id}`, { method: 'DELETE' }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: photoKeys.lists() }),
  });
}
