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
});
export type UserCreateBody = z.infer<typeof userCreateBodySchema>;

export const userUpdateBodySchema = z
  .object({
    name: nameSchema,
    role: roleSchema,
    disabled: z.boolean(),
    password: passwordSchema,
  })
  .partial()
  .refine((v) => Object.keys(v).length > 0, { message: 'nothing to change' });
export type UserUpdateBody = z.infer<typeof userUpdateBodySchema>;

export const userIdParamsSchema = z.object({ id: idSchema });

export const meSchema = z.object({ user: userSchema });
export type Me = z.infer<typeof meSchema>;
