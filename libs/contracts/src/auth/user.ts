import { z } from 'zod';
import { emailMaxLength, passwordLength } from '../values/text-limits';
import { roleSchema } from './role';

const email = z.string().trim().toLowerCase().email('Enter a valid e-mail address').max(emailMaxLength);
const password = z
  .string()
  .min(passwordLength.min, `Use at least ${passwordLength.min} characters for the password`)
  .max(passwordLength.max, `Use at most ${passwordLength.max} characters for the password`);

/** A signed-in user as the API returns it. */
export const userSchema = z.object({
  id: z.number().int().positive(),
  email: z.string(),
  name: z.string(),
  role: roleSchema,
});
export type User = z.infer<typeof userSchema>;

/** A user as the admin's users table shows it. */
export const userRecordSchema = userSchema.extend({
  disabled: z.boolean(),
  createdAt: z.string(),
  lastSignInAt: z.string().nullable(),
});
export type UserRecord = z.infer<typeof userRecordSchema>;

export const loginRequestSchema = z.object({
  email,
  password: z.string().min(1, 'Enter your password').max(passwordLength.max),
});
export type LoginRequest = z.infer<typeof loginRequestSchema>;

export const loginResponseSchema = z.object({ user: userSchema });
export type LoginResponse = z.infer<typeof loginResponseSchema>;

export const changePasswordRequestSchema = z.object({
  currentPassword: z.string().min(1, 'Enter your current password').max(passwordLength.max),
  newPassword: password,
});
export type ChangePasswordRequest = z.infer<typeof changePasswordRequestSchema>;

/** POST /api/users: an admin creates a user of any role; without a password one is generated and returned once. */
export const createUserRequestSchema = z.object({
  email,
  name: z.string().trim().min(1, 'Enter a name').max(120),
  role: roleSchema,
  password: password.optional(),
});
export type CreateUserRequest = z.infer<typeof createUserRequestSchema>;

export const createUserResponseSchema = z.object({
  user: userRecordSchema,
  temporaryPassword: z.string().optional(),
});
export type CreateUserResponse = z.infer<typeof createUserResponseSchema>;

/** PATCH /api/users/:id */
export const updateUserRequestSchema = z
  .object({
    name: z.string().trim().min(1, 'Enter a name').max(120).optional(),
    role: roleSchema.optional(),
    disabled: z.boolean().optional(),
  })
  .refine((v) => Object.keys(v).length > 0, { message: 'Change at least one of name, role or disabled' });
export type UpdateUserRequest = z.infer<typeof updateUserRequestSchema>;

export const userListResponseSchema = z.object({ users: z.array(userRecordSchema) });
export type UserListResponse = z.infer<typeof userListResponseSchema>;
