import { queryOptions } from '@tanstack/react-query';
import { labInfoSchema } from '@shared/schemas/lab';
import { api } from '@/lib/api-client';

export const labKeys = {
  all: ['lab'] as const,
  info: () => [...labKeys.all, 'info'] as const,
};

export const labInfoOptions = () =>
  queryOptions({ queryKey: labKeys.info(), queryFn: () => api('/lab', { schema: labInfoSchema }), staleTime: Infinity });
