import { z } from 'zod';
import { notificationTopics } from '../domain/notifications.js';
import { emailSchema, newPasswordSchema, roleSchema, sessionUserSchema } from './people.js';

export const signInInputSchema = z.strictObject({
  email: z.string({ error: 'Enter your e-mail address' }).trim().toLowerCase().min(1, { error: 'Enter your e-mail address' }).max(254),
  password: z.string({ error: 'Enter your password' }).min(1, { error: 'Enter your password' }).max(1024),
});
export type SignInInput = z.infer<typeof signInInputSchema>;

export const meResponseSchema = z.object({ user: sessionUserSchema });
export type MeResponse = z.infer<typeof meResponseSchema>;

export const csrfResponseSchema = z.object({ token: z.string() });

/** The message for every failed sign-in, whether the e-mail is unknown or the password wrong. */
export const signInFailedMessage = 'That e-mail and password do not match an active account.';

/** The one-time token of an invitation or password-reset link (`/invitation/<token>`, `/reset-password/<token>`). */
export const tokenParamsSchema = z.object({
  token: z.string().min(1, { error: 'The link has no token' }).max(200, { error: 'The link is not valid' }),
});

/** GET /api/auth/invitation/:token: who is invited, to which lab, with which role. */
export const invitationInfoSchema = z.object({
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  labName: z.string(),
  expiresAt: z.string(),
});
export type InvitationInfo = z.infer<typeof invitationInfoSchema>;

/** POST /api/auth/invitation/:token and /api/auth/reset-password/:token. */
export const setPasswordInputSchema = z.strictObject({ password: newPasswordSchema });
export type SetPasswordInput = z.infer<typeof setPasswordInputSchema>;

/** The password forms ask twice; only `password` is sent. */
export const choosePasswordFormSchema = z
  .object({ password: newPasswordSchema, confirm: z.string({ error: 'Enter the password again' }) })
  .refine((value) => value.password === value.confirm, { error: 'The two passwords differ', path: ['confirm'] });
export type ChoosePasswordForm = z.infer<typeof choosePasswordFormSchema>;

export const forgotPasswordInputSchema = z.strictObject({ email: emailSchema });
export type ForgotPasswordInput = z.infer<typeof forgotPasswordInputSchema>;

/** The answer to every forgot-password request, whether the address has an account or not. */
export const forgotPasswordAnswer = {
  message:
    'If an account with a password exists for that address, a link to choose a new password is on its way. It works once, for 1 hour. ' +
    'If you were invited and have not set a password yet, ask a lab manager to send the invitation again.',
} as const;
export const messageResponseSchema = z.object({ message: z.string() });

/** GET /api/auth/reset-password/:token: the link still works, for this account, until then. */
export const resetLinkInfoSchema = z.object({ email: z.string(), expiresAt: z.string() });
export type ResetLinkInfo = z.infer<typeof resetLinkInfoSchema>;

const topicKeys = notificationTopics.map((t) => t.key) as [(typeof notificationTopics)[number]['key'], ...(typeof notificationTopics)[number]['key'][]];

/** GET/PUT /api/auth/me/notifications: the topics this person's role may receive, and what always comes. */
export const notificationPreferencesSchema = z.object({
  topics: z.array(z.object({ key: z.enum(topicKeys), label: z.string(), description: z.string(), receive: z.boolean() })),
  alwaysSent: z.array(z.object({ label: z.string(), description: z.string() })),
  note: z.string(),
});
export type NotificationPreferences = z.infer<typeof notificationPreferencesSchema>;
