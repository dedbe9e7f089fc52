import bcrypt from 'bcryptjs';
import { QueryTypes, UniqueConstraintError, type Transaction } from 'sequelize';
import type { CreateUserInput, SessionUser, UpdateUserInput, User } from '../../../shared/schemas/people.js';
import { conflict, notFound } from '../../lib/errors.js';
import { UserModel } from './user.model.js';

/** bcrypt cost factor for stored passwords. */
export const BCRYPT_COST = 12;

/** A user as the API shows it; `invitationExpiresAt` is the newest open invitation's expiry, if any. */
export function toUser(row: UserModel, invitationExpiresAt: Date | null = null): User {
  const invited = row.passwordHash === null;
  return {
    id: row.id,
    email: row.email,
    name: row.name,
    role: row.role,
    active: row.active,
    createdAt: row.createdAt.toISOString(),
    lastSignInAt: row.lastSignInAt ? row.lastSignInAt.toISOString() : null,
    invited,
    invitationExpiresAt: invited && invitationExpiresAt ? invitationExpiresAt.toISOString() : null,
  };
}

/**
 * The newest unused invitation's expiry of each invited person (no password yet), by user id. Reads
 * user_tokens through user_tokens_user_id_idx, for the invitees only.
 */
async function invitationExpiries(ids: number[], transaction?: Transaction): Promise<Map<number, Date>> {
  if (!ids.length) return new Map();
  const rows = await UserModel.sequelize!.query<{ user_id: number; expires_at: Date }>(
    `SELECT user_id, max(expires_at) AS expires_at FROM user_tokens
      WHERE user_id IN (:ids) AND purpose = 'invitation' AND used_at IS NULL GROUP BY user_id`,
    { replacements: { ids }, type: QueryTypes.SELECT, transaction },
  );
  return new Map(rows.map((r) => [r.user_id, new Date(r.expires_at)]));
}

function toSessionUser(row: UserModel): SessionUser {
  return { id: row.id, email: row.email, name: row.name, role: row.role };
}

export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, BCRYPT_COST);
}

// Compared against when the e-mail is unknown, so both failures take the same time.
let dummyHash: Promise<string> | undefined;

/**
 * The active user with this e-mail and password, or null. Unknown e-mail, wrong password and
 * deactivated account are indistinguishable to the caller, and take about the same time.
 */
export async function authenticate(email: string, password: string): Promise<SessionUser | null> {
  const row = await UserModel.findOne({ where: { email: email.trim().toLowerCase() } });
  if (!row || row.passwordHash === null) {
    // Unknown, or invited and no password set yet.
    dummyHash ??= hashPassword('no-such-account-password');
    await bcrypt.compare(password, await dummyHash);
    return null;
  }
  const matches = await bcrypt.compare(password, row.passwordHash);
  if (!matches || !row.active) return null;
  await row.update({ lastSignInAt: new Date() });
  return toSessionUser(row);
}

export async function findActiveUser(id: number): Promise<SessionUser | null> {
  const row = await UserModel.findByPk(id);
  return row && row.active ? toSessionUser(row) : null;
}

export async function listUsers(): Promise<User[]> {
  const rows = await UserModel.findAll({ order: [['name', 'ASC'], ['id', 'ASC']] });
  const expiries = await invitationExpiries(rows.filter((r) => r.passwordHash === null).map((r) => r.id));
  return rows.map((row) => toUser(row, expiries.get(row.id) ?? null));
}

/** 409 on the email field: the address belongs to an account already. */
export const emailTaken = () =>
  conflict('email_taken', 'An account with that e-mail address already exists.', [
    { path: 'email', message: 'An account with that e-mail address already exists' },
  ]);

export async function createUser(input: CreateUserInput): Promise<User> {
  try {
    const row = await UserModel.create({
      email: input.email,
      name: input.name,
      role: input.role,
      passwordHash: await hashPassword(input.password),
    });
    return toUser(row);
  } catch (err) {
    if (err instanceof UniqueConstraintError) {
      throw emailTaken();
    }
    throw err;
  }
}

/**
 * Change a user's name, role or active flag. At least one active manager always remains.
 * Deactivating a user deletes their sessions, so they are signed out at once.
 */
export async function updateUser(id: number, changes: UpdateUserInput): Promise<User> {
  const sequelize = UserModel.sequelize!;
  return sequelize.transaction(async (transaction) => {
    const row = await UserModel.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!row) throw notFound('User');
    const losesManager =
      row.role === 'manager' && row.active && row.passwordHash !== null && ((changes.role && changes.role !== 'manager') || changes.active === false);
    if (losesManager) {
      // Lock the managers' rows so two managers cannot demote each other at the same moment. An invited manager
      // who has not chosen a password yet cannot run the lab, so does not count.
      const managers = await sequelize.query<{ id: number }>(
        `SELECT id FROM users WHERE role = 'manager' AND active AND password_hash IS NOT NULL FOR UPDATE`,
        { type: QueryTypes.SELECT, transaction },
      );
      if (managers.length <= 1) {
        throw conflict('last_manager', 'This is the only active lab manager. Make someone else a manager first.');
      }
    }
    await row.update(changes, { transaction });
    if (changes.active === false) {
      await sequelize.query(`DELETE FROM sessions WHERE (sess ->> 'userId') = :id`, {
        replacements: { id: String(id) },
        transaction,
      });
    }
    const expiries = row.passwordHash === null ? await invitationExpiries([row.id], transaction) : new Map<number, Date>();
    return toUser(row, expiries.get(row.id) ?? null);
  });
}
