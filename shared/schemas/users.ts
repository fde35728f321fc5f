import { z } from 'zod';
import { idSchema, singleLineTextSchema, trimmedLineSchema } from './common.ts';
import { roles } from './enums.ts';

export const roleSchema = z.enum(roles);

export const userSchema = z.object({
  id: z.number().int(),
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  disabled: z.boolean(),
  /** Receives the nightly digest (and the alert mails its role may read). */
  digest: z.boolean(),
  createdAt: z.string(),
  lastLoginAt: z.string().nullable(),
});
export type User = z.infer<typeof userSchema>;

export const userListSchema = z.object({ users: z.array(userSchema) });

/** Trimmed and case-folded: the form every lookup, the unique index and the sign-in rate limit use. */
export const emailSchema = trimmedLineSchema.toLowerCase().pipe(z.email({ message: 'not a valid e-mail address' }));
export const passwordSchema = singleLineTextSchema.min(10, 'at least 10 characters').max(200);
const nameSchema = trimmedLineSchema.max(200);

export const loginBodySchema = z.object({
  email: emailSchema,
  password: singleLineTextSchema.min(1, 'required').max(200),
});
export type LoginBody = z.infer<typeof loginBodySchema>;

export const userCreateBodySchema = z.object({
  email: emailSchema,
  name: nameSchema.default(''),
  role: roleSchema,
  password: passwordSchema,
  digest: z.boolean().default(false),
});
export type UserCreateBody = z.infer<typeof userCreateBodySchema>;

export const userUpdateBodySchema = z
  .object({
    name: nameSchema,
    role: roleSchema,
    disabled: z.boolean(),
    password: passwordSchema,
    digest: z.boolean(),
  })
  .partial()
  .refine((v) => Object.keys(v).length > 0, { message: 'nothing to change' });
export type UserUpdateBody = z.infer<typeof userUpdateBodySchema>;

export const userIdParamsSchema = z.object({ id: idSchema });

export const meSchema = z.object({ user: userSchema });

/** PATCH /api/auth/me: what every user may change of their own account. */
export const meUpdateBodySchema = z.object({ digest: z.boolean() }).strict();
export type MeUpdateBody = z.infer<typeof meUpdateBodySchema>;
export type Me = z.infer<typeof meSchema>;
