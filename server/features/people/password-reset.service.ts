// Password reset: "forgot password" answers alike whether the address has an account or not, and the link it
// mails works once, for an hour; using it ends every session of the person.
import { setTimeout as sleep } from 'node:timers/promises';
import type { ResetLinkInfo } from '../../../shared/schemas/auth.js';
import { enqueueMail } from '../mail/outbox.service.js';
import { passwordResetMail, type AccountMailLab } from '../mail/templates/account-mail.js';
import { findUsableToken, issueToken, newToken, retireTokens, tokenInvalid } from './account-tokens.service.js';
import { hashPassword } from './people.service.js';
import { UserModel } from './user.model.js';

/**
 * A forgot-password request takes at least this long, so the few milliseconds of queueing a message for a real
 * account do not show in the answer's timing.
 */
export const FORGOT_PASSWORD_MIN_MS = 300;

/**
 * Queue a reset link for the active account with a password at `email`; for any other address do nothing, in
 * about the same time: the token and its hash are made either way, and the call lasts at least
 * FORGOT_PASSWORD_MIN_MS.
 */
export async function requestPasswordReset(email: string, lab: AccountMailLab, minimumMs = FORGOT_PASSWORD_MIN_MS): Promise<void> {
  const started = performance.now();
  const fresh = newToken();
  const now = new Date();
  const user = await UserModel.findOne({ where: { email } });
  if (user && user.active && user.passwordHash !== null) {
    const sequelize = UserModel.sequelize!;
    await sequelize.transaction(async (transaction) => {
      const { token, expiresAt } = await issueToken(transaction, user.id, 'password-reset', now, fresh);
      await enqueueMail(transaction, 'password-reset', { address: user.email, userId: user.id }, passwordResetMail(lab, { name: user.name, token, expiresAt }));
    });
  }
  const left = minimumMs - (performance.now() - started);
  if (left > 0) await sleep(left);
}

/** The account a reset link is for, while the link still works. */
export async function getResetLink(token: string): Promise<ResetLinkInfo> {
  const row = await findUsableToken(token, 'password-reset', new Date());
  const user = await UserModel.findByPk(row.userId);
  if (!user) throw tokenInvalid('password-reset', 'unknown');
  if (!user.active) throw tokenInvalid('password-reset', 'inactive');
  return { email: user.email, expiresAt: row.expiresAt.toISOString() };
}

/**
 * Set a new password from a reset link: the link is used up, the person's other reset links stop working, and
 * every session of theirs ends (they sign in again with the new password). Returns the person's id.
 */
export async function resetPassword(token: string, password: string): Promise<number> {
  const passwordHash = await hashPassword(password);
  const sequelize = UserModel.sequelize!;
  return sequelize.transaction(async (transaction) => {
    const now = new Date();
    const row = await findUsableToken(token, 'password-reset', now, transaction);
    const user = await UserModel.findByPk(row.userId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!user) throw tokenInvalid('password-reset', 'unknown');
    if (!user.active) throw tokenInvalid('password-reset', 'inactive');
    await user.update({ passwordHash }, { transaction });
    await row.update({ usedAt: now }, { transaction });
    await retireTokens(transaction, user.id, 'password-reset', now, row.id);
    // sessions_user_id_idx
    await sequelize.query(`DELETE FROM sessions WHERE (sess ->> 'userId') = :id`, { replacements: { id: String(user.id) }, transaction });
    return user.id;
  });
}
