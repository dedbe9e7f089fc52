import { z } from 'zod';
import { sessionUserSchema } from './people.js';

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
