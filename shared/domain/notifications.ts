import type { Role } from './roles.js';

/** Every kind of message Skewbench sends. Stored in the outbox's `kind` column: only ever add to the list. */
export const mailKinds = [
  'booking-confirmed',
  'booking-changed',
  'booking-cancelled',
  'booking-no-show',
  'handover',
  'waitlist-offer',
  'calibration-digest',
  'invitation',
  'password-reset',
] as const;
export type MailKind = (typeof mailKinds)[number];

/**
 * What a person can switch off, as keys of users.notification_settings. Handover notes and security messages
 * (invitation, password reset) are not in this list: they always go out.
 */
export const notificationTopics = [
  {
    key: 'bookingUpdates',
    label: 'My bookings',
    description: 'Confirmed, changed, cancelled, or released after a missed check-in.',
    minimumRole: 'researcher',
  },
  {
    key: 'waitlistOffers',
    label: 'Freed slots',
    description: 'A slot you wait for became free (the link books it if it is still free).',
    minimumRole: 'researcher',
  },
  {
    key: 'calibrationDigest',
    label: 'Calibration digest',
    description: 'Each morning: instruments whose calibration falls due within 14 days or is overdue.',
    minimumRole: 'manager',
  },
] as const satisfies readonly { key: string; label: string; description: string; minimumRole: Role }[];
export type NotificationTopic = (typeof notificationTopics)[number]['key'];

/** The topic a message kind belongs to; null for messages that cannot be switched off. */
export function topicOf(kind: MailKind): NotificationTopic | null {
  switch (kind) {
    case 'booking-confirmed':
    case 'booking-changed':
    case 'booking-cancelled':
    case 'booking-no-show':
      return 'bookingUpdates';
    case 'waitlist-offer':
      return 'waitlistOffers';
    case 'calibration-digest':
      return 'calibrationDigest';
    case 'handover':
    case 'invitation':
    case 'password-reset':
      return null;
  }
}

/** Whether a person with these settings receives a message of this kind (absent settings mean on). */
export function wantsMail(settings: Readonly<Record<string, boolean>>, kind: MailKind): boolean {
  const topic = topicOf(kind);
  return topic === null || settings[topic] !== false;
}

/** Retry delay after `attempts` failed tries: 5 s, 10 s, 20 s … doubling, at most one hour. */
export function retryDelayMs(attempts: number): number {
  return Math.min(5_000 * 2 ** Math.max(0, attempts - 1), 3_600_000);
}
