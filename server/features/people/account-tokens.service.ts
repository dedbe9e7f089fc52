// One-time links for invitations and password resets. The link carries a random 32-byte token (base64url); the
// table keeps only its SHA-256, so a leaked database copy opens no account. A token works once, until it expires,
// and only while it is the newest of its kind for that person.
import { createHash, randomBytes } from 'node:crypto';
import { Op, type Transaction } from 'sequelize';
import { AppError } from '../../lib/errors.js';
import { UserTokenModel, type TokenPurpose } from './user-token.model.js';

/** Invitations last a week; reset links an hour. */
export const TOKEN_LIFETIME_MS: Record<TokenPurpose, number> = {
  invitation: 7 * 24 * 60 * 60 * 1000,
  'password-reset': 60 * 60 * 1000,
};

export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

/** A fresh random token and its hash. */
export function newToken(): { token: string; tokenHash: string } {
  const token = randomBytes(32).toString('base64url');
  return { token, tokenHash: hashToken(token) };
}

type Reason = 'unknown' | 'expired' | 'used' | 'inactive';

const messages: Record<TokenPurpose, Record<Reason, string>> = {
  invitation: {
    unknown: 'This invitation link is not valid. Check that the whole link was copied from the e-mail, or ask a lab manager to invite you again.',
    expired: 'This invitation has expired (invitations last 7 days) or was replaced by a newer one. Ask a lab manager to send you a new invitation.',
    used: 'This invitation has already been used to choose a password. Sign in with that password, or use "Forgot your password?" on the sign-in page.',
    inactive: 'This invitation was withdrawn: the account is deactivated. Ask a lab manager if you should have access.',
  },
  'password-reset': {
    unknown: 'This password reset link is not valid. Check that the whole link was copied from the e-mail, or request a new one.',
    expired: 'This password reset link has expired (links last 1 hour) or a newer one was sent since. Request a new link.',
    used: 'This password reset link has already been used. Sign in with your new password, or request a new link.',
    inactive: 'This account is deactivated, so its password cannot be reset. Ask a lab manager.',
  },
};

/** 404 for a token that never existed, 410 for one that did but no longer works; `details.reason` says which. */
export function tokenInvalid(purpose: TokenPurpose, reason: Reason): AppError {
  return new AppError(reason === 'unknown' ? 404 : 410, 'token_invalid', messages[purpose][reason], { reason });
}

/**
 * Issue a new token of `purpose` for a person, in `transaction`; their older open tokens of the same purpose stop
 * working (they expire now). Pass `fresh` to use a token made beforehand.
 */
export async function issueToken(
  transaction: Transaction,
  userId: number,
  purpose: TokenPurpose,
  now: Date,
  fresh: { token: string; tokenHash: string } = newToken(),
): Promise<{ token: string; expiresAt: Date }> {
  await retireTokens(transaction, userId, purpose, now);
  const expiresAt = new Date(now.getTime() + TOKEN_LIFETIME_MS[purpose]);
  await UserTokenModel.create({ userId, purpose, tokenHash: fresh.tokenHash, expiresAt }, { transaction });
  return { token: fresh.token, expiresAt };
}

/** Make every open token of `purpose` of this person expire now (user_tokens_user_id_idx). */
export async function retireTokens(transaction: Transaction, userId: number, purpose: TokenPurpose, now: Date, exceptId?: number): Promise<void> {
  await UserTokenModel.update(
    { expiresAt: now },
    {
      where: {
        userId,
        purpose,
        usedAt: null,
        expiresAt: { [Op.gt]: now },
        ...(exceptId === undefined ? {} : { id: { [Op.ne]: exceptId } }),
      },
      transaction,
    },
  );
}

/**
 * The token row of a link that still works, locked for the rest of `transaction` when one is given (so two
 * simultaneous uses cannot both pass); else a token_invalid error saying why not.
 */
export async function findUsableToken(token: string, purpose: TokenPurpose, now: Date, transaction?: Transaction): Promise<UserTokenModel> {
  const row = await UserTokenModel.findOne({
    where: { tokenHash: hashToken(token) },
    ...(transaction ? { transaction, lock: transaction.LOCK.UPDATE } : {}),
  });
  if (!row || row.purpose !== purpose) throw tokenInvalid(purpose, 'unknown');
  if (row.usedAt) throw tokenInvalid(purpose, 'used');
  if (row.expiresAt.getTime() <= now.getTime()) throw tokenInvalid(purpose, 'expired');
  return row;
}
