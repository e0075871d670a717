import { z } from 'zod';

export const emailSchema = z.string().trim().min(1, 'Enter your e-mail address').max(254, 'At most 254 characters').email('This is not an e-mail address');

/** Limits for a password being chosen; checking an existing one only needs it to be non-empty. */
export const newPasswordSchema = z
  .string()
  .min(10, 'Use at least 10 characters')
  .max(200, 'At most 200 characters')
  .refine((p) => p.trim().length > 0, 'A password cannot be only spaces')
  // bcrypt reads only the first 72 bytes; anything after them would not count, so it is refused.
  .refine((p) => utf8Length(p) <= 72, 'At most 72 bytes (letters like é or emoji take 2–4 bytes each); the rest would be ignored');

/** UTF-8 length without TextEncoder, which not every React Native engine has. */
export function utf8Length(text: string): number {
  let bytes = 0;
  for (const ch of text) {
    const code = ch.codePointAt(0)!;
    bytes += code < 0x80 ? 1 : code < 0x800 ? 2 : code < 0x10000 ? 3 : 4;
  }
  return bytes;
}

export const displayNameSchema = z.string().trim().min(1, 'Enter your name').max(120, 'At most 120 characters');
export const workspaceNameSchema = z.string().trim().min(1, 'Name your workspace').max(120, 'At most 120 characters');
/** Links carry a random 43-character token; anything far off that is not one of ours. */
export const tokenSchema = z.string().trim().min(20, 'This link is not complete').max(100, 'This link is not valid');

export const roles = ['admin', 'coordinator', 'staff'] as const;
export const roleSchema = z.enum(roles, 'Choose admin, coordinator or staff');
export type Role = z.infer<typeof roleSchema>;

export const signInSchema = z.object({
  email: emailSchema,
  password: z.string().min(1, 'Enter your password').max(200, 'At most 200 characters'),
});
export type SignInInput = z.infer<typeof signInSchema>;

export const signUpSchema = z.object({
  displayName: displayNameSchema,
  email: emailSchema,
  password: newPasswordSchema,
  workspaceName: workspaceNameSchema,
  /** IANA zone of the new workspace; the client sends the browser's. */
  timeZone: z.string().trim().min(1).max(64).optional(),
});
export type SignUpInput = z.infer<typeof signUpSchema>;

/** Opening the e-mailed link to finish signing up: the preview of what it makes. */
export const signUpPreviewQuerySchema = z.object({ token: tokenSchema });

/** Finishing a sign-up; the password chosen at sign-up is asked for only in another browser. */
export const finishSignUpSchema = z.object({
  token: tokenSchema,
  password: z.string().min(1, 'Enter the password you chose when you signed up').max(200, 'At most 200 characters').optional(),
});
export type FinishSignUpInput = z.infer<typeof finishSignUpSchema>;

export const forgotPasswordSchema = z.object({ email: emailSchema });
export type ForgotPasswordInput = z.infer<typeof forgotPasswordSchema>;

export const resetPasswordSchema = z.object({ token: tokenSchema, password: newPasswordSchema });
export type ResetPasswordInput = z.infer<typeof resetPasswordSchema>;

export const confirmEmailSchema = z.object({ token: tokenSchema });
export type ConfirmEmailInput = z.infer<typeof confirmEmailSchema>;

export const changePasswordSchema = z.object({
  /** Absent for an account that so far only signs in with Google. */
  currentPassword: z.string().max(200, 'At most 200 characters').optional(),
  newPassword: newPasswordSchema,
});
export type ChangePasswordInput = z.infer<typeof changePasswordSchema>;

export const changeEmailSchema = z.object({
  email: emailSchema,
  currentPassword: z.string().max(200, 'At most 200 characters').optional(),
});
export type ChangeEmailInput = z.infer<typeof changeEmailSchema>;

export const updateProfileSchema = z.object({ displayName: displayNameSchema });
export type UpdateProfileInput = z.infer<typeof updateProfileSchema>;

const idSchema = z.coerce.number('Must be a number').int('Must be a whole number').positive('Must be positive').max(4294967295, 'Too large');
export const idParamsSchema = z.object({ id: idSchema });

export const switchWorkspaceSchema = z.object({ workspaceId: idSchema });
export type SwitchWorkspaceInput = z.infer<typeof switchWorkspaceSchema>;

export const createWorkspaceSchema = z.object({ name: workspaceNameSchema, timeZone: z.string().trim().min(1).max(64).optional() });
export type CreateWorkspaceInput = z.infer<typeof createWorkspaceSchema>;

export const renameWorkspaceSchema = z.object({ name: workspaceNameSchema });
export type RenameWorkspaceInput = z.infer<typeof renameWorkspaceSchema>;

export const inviteSchema = z.object({
  email: emailSchema,
  role: roleSchema,
  /** The person record (in this workspace) the new member is; staff see their own shifts through it. */
  personId: idSchema.nullable().optional(),
});
export type InviteInput = z.infer<typeof inviteSchema>;

export const invitationTokenQuerySchema = z.object({ token: tokenSchema });

export const acceptInvitationSchema = z.object({
  token: tokenSchema,
  /** Only for someone without an account yet: the account is made from these. */
  displayName: displayNameSchema.optional(),
  password: newPasswordSchema.optional(),
});
export type AcceptInvitationInput = z.infer<typeof acceptInvitationSchema>;

export const updateMemberSchema = z.object({ role: roleSchema });
export type UpdateMemberInput = z.infer<typeof updateMemberSchema>;

export const linkPersonSchema = z.object({ personId: idSchema.nullable() });
export type LinkPersonInput = z.infer<typeof linkPersonSchema>;
