// Invitations: a manager creates the account without a password and the person chooses one from a link that
// works once, for 7 days. The invitation mail is queued in the transaction that creates the account.
import { UniqueConstraintError } from 'sequelize';
import type { InvitationInfo } from '../../../shared/schemas/auth.js';
import type { InvitationResponse, InviteUserInput, SessionUser } from '../../../shared/schemas/people.js';
import { enqueueMail } from '../mail/outbox.service.js';
import { invitationMail, type AccountMailLab } from '../mail/templates/account-mail.js';
import { findUsableToken, issueToken, retireTokens, tokenInvalid } from './account-tokens.service.js';
import { emailTaken, hashPassword, toUser } from './people.service.js';
import { UserModel } from './user.model.js';

/**
 * Invite a person by e-mail with a role. A new address gets an account without a password; an address already
 * invited and still without a password gets its name and role updated, is reactivated, and gets a new link
 * (older links stop working). An address whose account has a password is refused with 409 email_taken.
 */
export async function inviteUser(input: InviteUserInput, invitedBy: SessionUser, lab: AccountMailLab): Promise<InvitationResponse> {
  const sequelize = UserModel.sequelize!;
  const now = new Date();
  try {
    return await sequelize.transaction(async (transaction) => {
      let row = await UserModel.findOne({ where: { email: input.email }, transaction, lock: transaction.LOCK.UPDATE });
      const resent = row !== null;
      if (row) {
        if (row.passwordHash !== null) throw emailTaken();
        await row.update({ name: input.name, role: input.role, active: true }, { transaction });
      } else {
        row = await UserModel.create({ email: input.email, name: input.name, role: input.role, passwordHash: null }, { transaction });
      }
      const { token, expiresAt } = await issueToken(transaction, row.id, 'invitation', now);
      await enqueueMail(
        transaction,
        'invitation',
        { address: row.email, userId: row.id },
        invitationMail(lab, { name: row.name, email: row.email, role: row.role, invitedBy: invitedBy.name, token, expiresAt, resent }),
      );
      return { user: toUser(row, expiresAt), invitation: { expiresAt: expiresAt.toISOString(), resent } };
    });
  } catch (err) {
    // Two managers inviting the same new address at the same moment: the second finds it taken.
    if (err instanceof UniqueConstraintError) throw emailTaken();
    throw err;
  }
}

/** Who an invitation link is for, while it still works. */
export async function getInvitation(token: string, labName: string): Promise<InvitationInfo> {
  const row = await findUsableToken(token, 'invitation', new Date());
  const user = await UserModel.findByPk(row.userId);
  if (!user) throw tokenInvalid('invitation', 'unknown');
  if (user.passwordHash !== null) throw tokenInvalid('invitation', 'used');
  if (!user.active) throw tokenInvalid('invitation', 'inactive');
  return { email: user.email, name: user.name, role: user.role, labName, expiresAt: row.expiresAt.toISOString() };
}

/**
 * Accept an invitation: set the password and use up the link (it works once). Returns the person to sign in.
 * The token row is locked, so two simultaneous acceptances cannot both pass.
 */
export async function acceptInvitation(token: string, password: string): Promise<SessionUser> {
  const passwordHash = await hashPassword(password);
  const sequelize = UserModel.sequelize!;
  return sequelize.transaction(async (transaction) => {
    const now = new Date();
    const row = await findUsableToken(token, 'invitation', now, transaction);
    const user = await UserModel.findByPk(row.userId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!user) throw tokenInvalid('invitation', 'unknown');
    if (user.passwordHash !== null) throw tokenInvalid('invitation', 'used');
    if (!user.active) throw tokenInvalid('invitation', 'inactive');
    await user.update({ passwordHash, lastSignInAt: now }, { transaction });
    await row.update({ usedAt: now }, { transaction });
    await retireTokens(transaction, user.id, 'invitation', now, row.id);
    return { id: user.id, email: user.email, name: user.name, role: user.role };
  });
}
