import { z } from 'zod';
import { roles } from '../domain/roles.js';

export const roleSchema = z.enum(roles, { error: 'Choose visitor, researcher or manager' });

export const emailSchema = z
  .string({ error: 'Enter an e-mail address' })
  .trim()
  .toLowerCase()
  .pipe(z.email({ error: 'Enter a valid e-mail address' }).max(254, { error: 'E-mail address is too long' }));

const nameSchema = z
  .string({ error: 'Enter a name' })
  .trim()
  .min(1, { error: 'Enter a name' })
  .max(120, { error: 'Name must be at most 120 characters' });

/** bcrypt reads at most 72 bytes; longer passwords would be silently truncated, so they are refused. */
export const newPasswordSchema = z
  .string({ error: 'Enter a password' })
  .min(10, { error: 'Password must be at least 10 characters' })
  .refine((value) => new TextEncoder().encode(value).length <= 72, {
    error: 'Password must be at most 72 bytes',
  });

export const userSchema = z.object({
  id: z.number().int(),
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  active: z.boolean(),
  createdAt: z.string(),
  lastSignInAt: z.string().nullable(),
  /** True while the account has no password: the person was invited and has not accepted yet. */
  invited: z.boolean(),
  /** When the newest open invitation link expires (in the past: it expired); null when none is open. */
  invitationExpiresAt: z.string().nullable(),
});
export type User = z.infer<typeof userSchema>;

/** The signed-in user as `GET /api/auth/me` reports it. */
export const sessionUserSchema = userSchema.pick({ id: true, email: true, name: true, role: true });
export type SessionUser = z.infer<typeof sessionUserSchema>;

export const createUserInputSchema = z.strictObject({
  email: emailSchema,
  name: nameSchema,
  role: roleSchema,
  password: newPasswordSchema,
});
export type CreateUserInput = z.infer<typeof createUserInputSchema>;

/** POST /api/users/invitations: the account is created without a password and the person gets a link. */
export const inviteUserInputSchema = z.strictObject({
  email: emailSchema,
  name: nameSchema,
  role: roleSchema,
});
export type InviteUserInput = z.infer<typeof inviteUserInputSchema>;

export const updateUserInputSchema = z
  .strictObject({
    name: nameSchema.optional(),
    role: roleSchema.optional(),
    active: z.boolean({ error: 'active must be true or false' }).optional(),
  })
  .refine((value) => Object.keys(value).length > 0, { error: 'Give at least one of name, role, active' });
export type UpdateUserInput = z.infer<typeof updateUserInputSchema>;

export const idParamsSchema = z.object({
  id: z.coerce
    .number({ error: 'id must be a number' })
    .int({ error: 'id must be a whole number' })
    .positive({ error: 'id must be positive' })
    .max(2147483647, { error: 'id is too large' }),
});

export const userListSchema = z.object({ users: z.array(userSchema) });
export const userResponseSchema = z.object({ user: userSchema });

export const invitationResponseSchema = z.object({
  user: userSchema,
  /** `resent`: the person was already invited; the older links no longer work. */
  invitation: z.object({ expiresAt: z.string(), resent: z.boolean() }),
});
export type InvitationResponse = z.infer<typeof invitationResponseSchema>;
