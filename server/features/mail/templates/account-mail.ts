// Messages about the account itself: the invitation and the password reset. Both are security messages, which a
// person cannot switch off (shared/domain/notifications.ts).
import { roleLabels, type Role } from '../../../../shared/domain/roles.js';
import type { RenderedMail } from '../outbox.service.js';
import { composeMail, type MailLab } from './compose.js';

/** The lab as account messages need it: name, PUBLIC_URL, and the time zone its people read times in. */
export interface AccountMailLab extends MailLab {
  timeZone: string;
}

/** "Tuesday 8 December 2026, 14:05 CET" in the lab's time zone. */
export function formatLabDateTime(instant: Date, timeZone: string): string {
  return new Intl.DateTimeFormat('en-GB', {
    timeZone,
    weekday: 'long',
    day: 'numeric',
    month: 'long',
    year: 'numeric',
    hour: '2-digit',
    minute: '2-digit',
    timeZoneName: 'short',
  }).format(instant);
}

const roleDoes: Record<Role, string> = {
  visitor: 'see the calendar, the instruments and the recorded setups',
  researcher: 'book instruments, record how you wired the bench, and see what the others left',
  manager: 'run the lab: people, instruments, parts, bookings and the mail',
};

export function invitationMail(
  lab: AccountMailLab,
  invite: { name: string; email: string; role: Role; invitedBy: string; token: string; expiresAt: Date; resent: boolean },
): RenderedMail {
  const expires = formatLabDateTime(invite.expiresAt, lab.timeZone);
  return composeMail(lab, {
    subject: `${invite.invitedBy} invited you to Skewbench at ${lab.name}`,
    recipientName: invite.name,
    lead: [
      `${invite.invitedBy} invited you to Skewbench, the bench booking and setup records of ${lab.name}, as a ${roleLabels[invite.role].toLowerCase()}: you can ${roleDoes[invite.role]}.`,
      'Choose your password with the button below; you are signed in straight away.',
    ],
    facts: [
      ['Lab', lab.name],
      ['Role', roleLabels[invite.role]],
      ['Invited by', invite.invitedBy],
      ['Sign-in e-mail', invite.email],
      ['Link valid until', expires],
    ],
    action: { label: 'Choose your password', url: `/invitation/${invite.token}` },
    after: [
      `The link works once and expires on ${expires}. If it has expired, ask a lab manager to send you a new invitation.`,
      ...(invite.resent ? ['This invitation replaces any earlier one: older invitation links no longer work.'] : []),
    ],
    footer: ['You receive this because a lab manager entered this address. If you did not expect it, ignore it: nothing happens without the link.'],
  });
}

export function passwordResetMail(lab: AccountMailLab, reset: { name: string; token: string; expiresAt: Date }): RenderedMail {
  const expires = formatLabDateTime(reset.expiresAt, lab.timeZone);
  return composeMail(lab, {
    subject: `Choose a new Skewbench password (${lab.name})`,
    recipientName: reset.name,
    lead: [`Someone, probably you, asked to reset the password of your Skewbench account at ${lab.name}.`],
    action: { label: 'Choose a new password', url: `/reset-password/${reset.token}` },
    after: [
      `The link works once, for 1 hour (until ${expires}). Choosing a new password signs you out on every device; then sign in with the new one.`,
      'If you did not ask for this, ignore this message: your password stays as it is.',
    ],
    footer: ['Security messages like this one are always sent; they cannot be switched off.'],
  });
}
