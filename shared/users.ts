import { z } from 'zod';
import { roleSchema } from './roles';

/** A person as the API shows them (never the password hash). */
export const userSchema = z.object({
  id: z.number().int(),
  email: z.string(),
  name: z.string(),
  roles: z.array(roleSchema),
  active: z.boolean(),
  createdAt: z.string(),
});
export type User = z.infer<typeof userSchema>;

const email = z.string().trim().toLowerCase().pipe(z.email({ message: 'Enter a valid e-mail address' }));
/** At least 10 characters; no other composition rule (NIST SP 800-63B favours length). */
export const passwordSchema = z.string().min(10, 'Use at least 10 characters').max(200);

// --- auth ---------------------------------------------------------------------------------
/** POST /api/auth/login → 200 { user } | 401 | 429 */
export const loginInputSchema = z.object({ email, password: z.string().min(1, 'Enter your password').max(200) });
export type LoginInput = z.infer<typeof loginInputSchema>;
/** GET /api/auth/me, POST /api/auth/login, POST /api/auth/tokens/:token/accept → { user } */
export const userResponseSchema = z.object({ user: userSchema });
/** GET /api/auth/csrf → { token } (sent back as the X-CSRF-Token header on every mutation) */
export const csrfResponseSchema = z.object({ token: z.string() });
/** POST /api/auth/password-reset → 202 { ok: true }, whether or not the address is known. */
export const passwordResetRequestSchema = z.object({ email });
/** GET /api/auth/tokens/:token → what the one-time link is for; 410 when used or expired. */
export const tokenInfoSchema = z.object({
  purpose: z.enum(['invitation', 'password-reset']),
  email: z.string(),
  name: z.string(),
  expiresAt: z.string(),
});
export type TokenInfo = z.infer<typeof tokenInfoSchema>;
/** POST /api/auth/tokens/:token/accept → 200 { user } and signs the person in; 410 when used or expired. */
export const acceptTokenInputSchema = z.object({ password: passwordSchema });

// --- people (admin) -----------------------------------------------------------------------
/** GET /api/users → { users } */
export const usersResponseSchema = z.object({ users: z.array(userSchema) });
/** POST /api/users/invitations → 201 { user } (inactive until the link is used); 409 if the e-mail exists. */
export const inviteInputSchema = z.object({
  email,
  name: z.string().trim().min(1, 'Enter a name').max(120),
  roles: z.array(roleSchema).min(1, 'Choose at least one role'),
});
export type InviteInput = z.infer<typeof inviteInputSchema>;
/** PATCH /api/users/:id → { user }. Deactivating ends the person's sessions. */
export const updateUserInputSchema = z
  .object({
    name: z.string().trim().min(1).max(120).optional(),
    roles: z.array(roleSchema).min(1, 'Choose at least one role').optional(),
    active: z.boolean().optional(),
  })
  .refine((value) => Object.keys(value).length > 0, 'Nothing to change');
export type UpdateUserInput = z.infer<typeof updateUserInputSchema>;

// --- outbox (admin) -----------------------------------------------------------------------
export const mailMessageSchema = z.object({
  id: z.number().int(),
  to: z.array(z.string()),
  subject: z.string(),
  text: z.string(),
  /** sent: accepted by the SMTP server; queued: waiting to be (re)tried; failed: gave up. */
  status: z.enum(['queued', 'sent', 'failed']),
  attempts: z.number().int(),
  lastError: z.string().nullable(),
  createdAt: z.string(),
  sentAt: z.string().nullable(),
  /**
   * One-time links (invitations, password resets) in the text: `withheld` when mail goes to a real
   * SMTP server (the link is only in the e-mail), `shown` with the local sink, which stands in for
   * everyone's mailbox; absent when the message has none.
   */
  oneTimeLinks: z.enum(['withheld', 'shown']).optional(),
});
export type MailMessage = z.infer<typeof mailMessageSchema>;
/** GET /api/outbox?page=&pageSize= → { messages, total } (newest first); each read is in the audit trail. */
export const outboxResponseSchema = z.object({
  messages: z.array(mailMessageSchema),
  total: z.number().int(),
  /** True with the local sink: the messages here are the only copy, links included. */
  localSink: z.boolean().optional(),
});
