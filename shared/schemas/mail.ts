import { z } from 'zod';
import { notificationTopics } from '../domain/notifications.js';

export const capturedAttachmentSchema = z.object({ index: z.number().int(), filename: z.string(), contentType: z.string(), size: z.number().int() });

/** One message of GET /api/mailbox: `to` lists the envelope recipients, comma-separated. */
export const capturedMailSummarySchema = z.object({
  id: z.number().int(),
  to: z.string(),
  toAddresses: z.array(z.string()),
  toHeader: z.string(),
  from: z.string(),
  subject: z.string(),
  receivedAt: z.string(),
  messageId: z.string().nullable(),
  sizeBytes: z.number().int(),
  hasHtml: z.boolean(),
  attachments: z.array(capturedAttachmentSchema),
});
export type CapturedMailSummary = z.infer<typeof capturedMailSummarySchema>;

export const capturedMailSchema = capturedMailSummarySchema.extend({ text: z.string().nullable(), html: z.string().nullable() });
export type CapturedMail = z.infer<typeof capturedMailSchema>;

export const mailboxQuerySchema = z.object({
  to: z.string().trim().toLowerCase().pipe(z.email({ error: 'to must be an e-mail address' })).optional(),
  since: z.iso.datetime({ offset: true, error: 'since must be an ISO 8601 date-time' }).optional(),
  limit: z.coerce.number({ error: 'limit must be a number' }).int().min(1).max(500, { error: 'limit is at most 500' }).default(100),
});
export type MailboxQuery = z.infer<typeof mailboxQuerySchema>;

export const attachmentParamsSchema = z.object({
  id: z.coerce.number({ error: 'id must be a number' }).int().positive(),
  index: z.coerce.number({ error: 'index must be a number' }).int().min(0),
});

export const outboxStatusSchema = z.enum(['pending', 'sent', 'failed'], { error: 'status is pending, sent or failed' });
export const outboxQuerySchema = z.object({
  status: outboxStatusSchema.optional(),
  limit: z.coerce.number({ error: 'limit must be a number' }).int().min(1).max(500).default(100),
});
export type OutboxQuery = z.infer<typeof outboxQuerySchema>;

export const outboxEntrySchema = z.object({
  id: z.number().int(),
  kind: z.string(),
  to: z.string(),
  subject: z.string(),
  status: outboxStatusSchema,
  attempts: z.number().int(),
  lastError: z.string().nullable(),
  createdAt: z.string(),
  sentAt: z.string().nullable(),
  nextAttemptAt: z.string(),
});
export type OutboxEntry = z.infer<typeof outboxEntrySchema>;

/** A person's notification choices: every optional topic, true = receive. */
export const notificationSettingsSchema = z.strictObject(
  Object.fromEntries(notificationTopics.map((t) => [t.key, z.boolean({ error: `${t.key} must be true or false` }).optional()])) as {
    [K in (typeof notificationTopics)[number]['key']]: z.ZodOptional<z.ZodBoolean>;
  },
);
export type NotificationSettingsInput = z.infer<typeof notificationSettingsSchema>;
