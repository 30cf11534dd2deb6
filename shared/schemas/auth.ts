import { z } from 'zod';
import { ROLES } from '../roles';

// The roles are defined with the permissions in shared/roles.ts; re-exported here for the schemas that name them.
export { ROLE_DUTIES, ROLE_LABELS, ROLES, type Role } from '../roles';

const email = z.string().trim().toLowerCase().pipe(z.email({ message: 'must be an e-mail address' })).pipe(z.string().max(254));

/** bcrypt reads the first 72 bytes of a password (UTF-8) and ignores the rest. */
export const PASSWORD_MAX_BYTES = 72;

/** A password's length as bcrypt reads it: UTF-8 bytes (an accented letter takes 2, an emoji 4). */
export function passwordBytes(password: string): number {
  return new TextEncoder().encode(password).length;
}

/**
 * A password a person chooses: long enough to resist guessing, and no longer than bcrypt reads (72 bytes), so that
 * no part of it is silently ignored.
 */
export const PasswordSchema = z
  .string({ message: 'is required' })
  .min(10, { message: 'must be at least 10 characters' })
  .max(PASSWORD_MAX_BYTES, { message: `must be at most ${PASSWORD_MAX_BYTES} bytes: only that much is read (an accented letter takes 2 bytes, an emoji 4)` })
  .refine((p) => passwordBytes(p) <= PASSWORD_MAX_BYTES, {
    message: `must be at most ${PASSWORD_MAX_BYTES} bytes: only that much is read (an accented letter takes 2 bytes, an emoji 4)`,
  });

export const LoginSchema = z.object({
  email: z.string({ message: 'is required' }).trim().min(1, { message: 'is required' }).max(254),
  password: z.string({ message: 'is required' }).min(1, { message: 'is required' }).max(200),
});
export type LoginInput = z.input<typeof LoginSchema>;

export const UserSchema = z.object({
  id: z.number().int(),
  email: z.string(),
  name: z.string(),
  role: z.enum(ROLES),
  active: z.boolean(),
  lastLoginAt: z.string().nullable(),
  createdAt: z.string(),
});
export type User = z.infer<typeof UserSchema>;

export const CreateUserSchema = z
  .object({
    email,
    name: z.string({ message: 'is required' }).trim().min(1, { message: 'is required' }).max(120),
    role: z.enum(ROLES, { message: `must be one of ${ROLES.join(', ')}` }),
    password: PasswordSchema,
  })
  .strict();
export type CreateUserInput = z.input<typeof CreateUserSchema>;

export const UpdateUserSchema = z
  .object({
    name: z.string().trim().min(1, { message: 'is required' }).max(120).optional(),
    role: z.enum(ROLES, { message: `must be one of ${ROLES.join(', ')}` }).optional(),
    active: z.boolean().optional(),
  })
  .strict();
export type UpdateUserInput = z.input<typeof UpdateUserSchema>;

export const ResetPasswordSchema = z.object({ password: PasswordSchema }).strict();

/** "Forgot your password?" from the sign-in page: the address to send the link to. */
export const PasswordResetRequestSchema = z.object({ email: z.string({ message: 'is required' }).trim().min(1, { message: 'is required' }).pipe(email) }).strict();
export type PasswordResetRequestInput = z.input<typeof PasswordResetRequestSchema>;

/** The e-mailed link's token and the new password. */
export const PasswordResetCompleteSchema = z
  .object({
    token: z.string({ message: 'is required' }).regex(/^[A-Za-z0-9_-]{20,100}$/, { message: 'is not a link we sent' }),
    password: PasswordSchema,
  })
  .strict();
export type PasswordResetCompleteInput = z.input<typeof PasswordResetCompleteSchema>;

export const UserListQuerySchema = z.object({
  q: z.string().trim().max(100).optional(),
  role: z.enum(ROLES).optional(),
  sort: z.enum(['name', 'email', 'role', 'lastLoginAt', 'createdAt']).default('name'),
  dir: z.enum(['asc', 'desc']).default('asc'),
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
});
export type UserListQuery = z.infer<typeof UserListQuerySchema>;

/** A page of rows from a server-side paged table. */
export interface Page<T> {
  rows: T[];
  /** How many rows match; with `totalCapped`, the list counted this far and there are more. */
  total: number;
  totalCapped?: boolean;
  page: number;
  pageSize: number;
}
