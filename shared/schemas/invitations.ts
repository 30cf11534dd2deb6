/**
 * Invitations to join a workshop: the owner names an e-mail address and a role; the person opens the e-mailed link,
 * chooses their name and password, and is signed in with that role.
 */
import { z } from 'zod';
import { ROLES } from '../roles';
import { PasswordSchema } from './auth';

/** How long an invitation's link works, from when it was (last) sent. */
export const INVITATION_VALID_DAYS = 7;

export const INVITATION_STATES = ['pending', 'expired', 'accepted', 'revoked'] as const;
export type InvitationState = (typeof INVITATION_STATES)[number];

export const INVITATION_STATE_LABELS: Record<InvitationState, string> = {
  pending: 'Waiting for an answer',
  expired: 'Link expired',
  accepted: 'Accepted',
  revoked: 'Withdrawn',
};

const email = z
  .string({ message: 'is required' })
  .trim()
  .toLowerCase()
  .min(1, { message: 'is required' })
  .pipe(z.email({ message: 'must be an e-mail address' }))
  .pipe(z.string().max(254, { message: 'must be at most 254 characters' }));

export const CreateInvitationSchema = z
  .object({
    email,
    role: z.enum(ROLES, { message: `must be one of ${ROLES.join(', ')}` }),
  })
  .strict();
export type CreateInvitation = z.output<typeof CreateInvitationSchema>;
export type CreateInvitationInput = z.input<typeof CreateInvitationSchema>;

export const InvitationSchema = z.object({
  id: z.number().int(),
  email: z.string(),
  role: z.enum(ROLES),
  state: z.enum(INVITATION_STATES),
  expiresAt: z.string(),
  invitedBy: z.string().nullable(),
  sendCount: z.number().int(),
  lastSentAt: z.string().nullable(),
  acceptedAt: z.string().nullable(),
  revokedAt: z.string().nullable(),
  createdAt: z.string(),
  /** Whether the last e-mail reached the mail server (false: try Resend). */
  delivered: z.boolean().nullable(),
});
export type Invitation = z.output<typeof InvitationSchema>;

export const InvitationListQuerySchema = z.object({
  q: z.string().trim().max(100).optional(),
  state: z.enum(INVITATION_STATES, { message: `must be one of ${INVITATION_STATES.join(', ')}` }).optional(),
  sort: z.enum(['email', 'role', 'state', 'expiresAt', 'createdAt']).default('createdAt'),
  dir: z.enum(['asc', 'desc']).default('desc'),
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
});
export type InvitationListQuery = z.output<typeof InvitationListQuerySchema>;
export type InvitationListQueryInput = z.input<typeof InvitationListQuerySchema>;

/** The token of an e-mailed invitation link (base64url of 32 random bytes). */
export const InvitationTokenSchema = z.string({ message: 'is required' }).regex(/^[A-Za-z0-9_-]{20,100}$/, { message: 'is not a link we sent' });

/** What the person invited sees on the link's page. */
export const PublicInvitationSchema = z.object({
  workshopName: z.string(),
  email: z.string(),
  role: z.enum(ROLES),
  state: z.enum(INVITATION_STATES),
  expiresAt: z.string(),
});
export type PublicInvitation = z.output<typeof PublicInvitationSchema>;

export const AcceptInvitationSchema = z
  .object({
    name: z.string({ message: 'is required' }).trim().min(1, { message: 'is required' }).max(120, { message: 'must be at most 120 characters' }),
    password: PasswordSchema,
  })
  .strict();
export type AcceptInvitation = z.output<typeof AcceptInvitationSchema>;
export type AcceptInvitationInput = z.input<typeof AcceptInvitationSchema>;
