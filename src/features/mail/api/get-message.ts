import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import { capturedMailSchema } from '@shared/schemas/mail';
import { api } from '@/lib/api-client';
import { mailKeys } from './mail-keys';

const messageSchema = z.object({ message: capturedMailSchema });

async function getMessage(id: number) {
  return (await api(`/mailbox/${id}`, { schema: messageSchema })).message;
}

/** GET /api/mailbox/:id: one captured message with its text and HTML parts. A captured message never changes. */
export const messageDetailOptions = (id: number) => queryOptions({ queryKey: mailKeys.detail(id), queryFn: () => getMessage(id), staleTime: Infinity });

/** Where the preview frame and the download links point (the server answers these outside the JSON API). */
export const messageHtmlUrl = (id: number) => `/api/mailbox/${id}/html`;
export const attachmentUrl = (id: number, index: number) => `/api/mailbox/${id}/attachments/${index}`;
