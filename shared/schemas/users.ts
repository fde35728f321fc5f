import { z } from 'zod';
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

export const emailSchema = z.string().trim().toLowerCase().pipe(z.email({ message: 'not a valid e-mail address' }));
export const passwordSchema = z.string().min(10, 'at least 10 characters').max(200);

export const loginBodySchema = z.object({
  email: emailSchema,
  password: z.string().min(1, 'required').max(200),
});
export type LoginBody = z.infer<typeof loginBodySchema>;

export const userCreateBodySchema = z.object({
  email: emailSchema,
  name: z.string().trim().max(200).default(''),
  role: roleSchema,
  password: passwordSchema,
});
export type UserCreateBody = z.infer<typeof userCreateBodySchema>;

export const userUpdateBodySchema = z
  .object({
    name: z.string().trim().max(200),
    role: roleSchema,
    disabled: z.boolean(),
    password: passwordSchema,
  })
  .partial()
  .refine((v) => Object.keys(v).length > 0, { message: 'nothing to change' });
export type UserUpdateBody = z.infer<typeof userUpdateBodySchema>;

export const userIdParamsSchema = z.object({ id: z.coerce.number().int().positive() });

export const meSchema = z.object({ user: userSchema });
export type Me = z.infer<typeof meSchema>;
