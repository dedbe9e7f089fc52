// Which optional messages a person receives (users.notification_settings). Handover notes and security messages
// are not topics: they always go out (shared/domain/notifications.ts).
import { notificationTopics } from '../../../shared/domain/notifications.js';
import { hasRole, roleLabels } from '../../../shared/domain/roles.js';
import type { NotificationPreferences } from '../../../shared/schemas/auth.js';
import type { NotificationSettingsInput } from '../../../shared/schemas/mail.js';
import { AppError, notFound } from '../../lib/errors.js';
import { UserModel } from './user.model.js';

const alwaysSent: NotificationPreferences['alwaysSent'] = [
  { label: 'Handover notes', description: 'What the person before you left on the bench, when your booking follows theirs.' },
  { label: 'Security messages', description: 'Invitations and password reset links.' },
];

const note = 'Handover notes and security messages (invitations, password resets) are always sent; they cannot be switched off.';

function preferencesOf(row: UserModel): NotificationPreferences {
  const settings = row.notificationSettings ?? {};
  return {
    topics: notificationTopics
      .filter((topic) => hasRole(row.role, topic.minimumRole))
      .map((topic) => ({ key: topic.key, label: topic.label, description: topic.description, receive: settings[topic.key] !== false })),
    alwaysSent,
    note,
  };
}

export async function getNotificationPreferences(userId: number): Promise<NotificationPreferences> {
  const row = await UserModel.findByPk(userId);
  if (!row) throw notFound('User');
  return preferencesOf(row);
}

/**
 * Change some of a person's choices (absent topics keep their value). A topic the person's role does not
 * receive is refused with 400 on its field.
 */
export async function updateNotificationPreferences(userId: number, input: NotificationSettingsInput): Promise<NotificationPreferences> {
  const sequelize = UserModel.sequelize!;
  return sequelize.transaction(async (transaction) => {
    const row = await UserModel.findByPk(userId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!row) throw notFound('User');
    const issues = notificationTopics
      .filter((topic) => input[topic.key] !== undefined && !hasRole(row.role, topic.minimumRole))
      .map((topic) => ({ path: topic.key, message: `${topic.label} is only sent to ${roleLabels[topic.minimumRole].toLowerCase()}s` }));
    if (issues.length) throw new AppError(400, 'validation_failed', 'Some fields are not valid.', issues);
    const changes = Object.fromEntries(Object.entries(input).filter(([, value]) => value !== undefined)) as Record<string, boolean>;
    await row.update({ notificationSettings: { ...row.notificationSettings, ...changes } }, { transaction });
    return preferencesOf(row);
  });
}
