import { z } from 'zod';
import { changePasswordRequestSchema, loginRequestSchema } from '../auth/user';
import { userRecordSchema } from '../auth/user';

const email = loginRequestSchema.shape.email;
const newPassword = changePasswordRequestSchema.shape.newPassword;
const name = z.string().trim().min(1, 'Enter your name').max(120);
const token = z.string().trim().min(20, 'The link is incomplete').max(200, 'The link is too long');

/** POST /api/auth/signup */
export const signupRequestSchema = z.object({ email, name, password: newPassword });
export type SignupRequest = z.infer<typeof signupRequestSchema>;

/** The same answer for every sign-up, reset or resend, whether the address is known or not. */
export const checkYourMailResponseSchema = z.object({
  status: z.literal('check-your-mail'),
  detail: z.string(),
});
export type CheckYourMailResponse = z.infer<typeof checkYourMailResponseSchema>;

/** POST /api/auth/signup/verify */
export const verifyEmailRequestSchema = z.object({ token });
export type VerifyEmailRequest = z.infer<typeof verifyEmailRequestSchema>;

export const verifyEmailResponseSchema = z.object({ email: z.string() });
export type VerifyEmailResponse = z.infer<typeof verifyEmailResponseSchema>;

/** POST /api/auth/signup/resend and POST /api/auth/password-reset */
export const emailOnlyRequestSchema = z.object({ email });
export type EmailOnlyRequest = z.infer<typeof emailOnlyRequestSchema>;

/** POST /api/auth/password-reset/confirm */
export const passwordResetConfirmSchema = z.object({ token, newPassword });
export type PasswordResetConfirm = z.infer<typeof passwordResetConfirmSchema>;

/** POST /api/customers: staff open an account for a customer at the counter; the customer picks a password by mail. */
export const counterCustomerRequestSchema = z.object({
  email,
  name: z.string().trim().min(1, 'Enter a name').max(120),
});
export type CounterCustomerRequest = z.infer<typeof counterCustomerRequestSchema>;

export const counterCustomerResponseSchema = z.object({ user: userRecordSchema });
export type CounterCustomerResponse = z.infer<typeof counterCustomerResponseSchema>;

/** GET /api/customers: every customer account, by name, for staff at the counter. */
export const customerListResponseSchema = z.object({ customers: z.array(userRecordSchema) });
export type CustomerListResponse = z.infer<typeof customerListResponseSchema>;
