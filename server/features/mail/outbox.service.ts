// Queueing mail: a notification is an outbox row written in the transaction of the change that causes it, so a
// rolled-back change sends nothing and a committed one is never forgotten. The worker (outbox.worker.ts) sends.
import { QueryTypes, type Transaction } from 'sequelize';
import { wantsMail, type MailKind } from '../../../shared/domain/notifications.js';
import type { OutboxAttachment } from './mail.model.js';
import { OutboxModel } from './mail.model.js';
import { outboxQueued } from './outbox.signal.js';

export interface RenderedMail {
  subject: string;
  text: string;
  html: string;
  attachments?: OutboxAttachment[];
}

/** Queue one message to an address, in `transaction`. */
export async function enqueueMail(transaction: Transaction, kind: MailKind, to: { address: string; userId?: number | null }, mail: RenderedMail): Promise<number> {
  const row = await OutboxModel.create(
    {
      kind,
      recipientId: to.userId ?? null,
      toAddress: to.address,
      subject: mail.subject,
      textBody: mail.text,
      htmlBody: mail.html,
      attachments: mail.attachments ?? [],
    },
    { transaction },
  );
  // Wake this process's worker once the change is committed (other instances find it on their next poll).
  transaction.afterCommit(() => {
    outboxQueued.emit('queued');
  });
  return row.id;
}

export interface Recipient {
  id: number;
  email: string;
  name: string;
  role: string;
}

/**
 * Queue a message to a person unless they switched this kind of message off (handover and security messages
 * always go). `render` gets the recipient, so the message can greet them and show what their role may see.
 * Returns the outbox id, or null when the person opted out, is inactive or has no account.
 */
export async function enqueueForUser(transaction: Transaction, kind: MailKind, userId: number, render: (recipient: Recipient) => RenderedMail | Promise<RenderedMail>): Promise<number | null> {
  const [user] = await OutboxModel.sequelize!.query<Recipient & { active: boolean; notification_settings: Record<string, boolean> }>(
    'SELECT id, email, name, role, active, notification_settings FROM users WHERE id = :userId',
    { replacements: { userId }, type: QueryTypes.SELECT, transaction },
  );
  if (!user || !user.active || !wantsMail(user.notification_settings ?? {}, kind)) return null;
  const recipient = { id: user.id, email: user.email, name: user.name, role: user.role };
  return enqueueMail(transaction, kind, { address: user.email, userId: user.id }, await render(recipient));
}
