import type { Sequelize } from 'sequelize';
import { z } from 'zod';
import { AcceptInvitationSchema, CreateInvitationSchema, InvitationListQuerySchema, InvitationTokenSchema } from '@shared/schemas/invitations';
import type { Config } from '../config';
import { csrf } from '../http/csrf';
import { secureRouter, type RouteInfo } from '../http/guard';
import { parseOr400 } from '../http/problem';
import { publicLinkLimiter } from '../http/public-limit';
import { acceptInvitation, createInvitation, listInvitations, resendInvitation, revokeInvitation, viewInvitation } from '../services/invitations';

const IdParam = z.object({ id: z.coerce.number().int().positive().max(2_147_483_647) });
const TokenParam = z.object({ token: InvitationTokenSchema });

/**
 * Invitations: the owner's list, invite, resend and withdraw (under the owner's workshop), and the invited person's
 * link (public, rate-limited, run under the link's workshop by the route table: see SIGNED_LINK_PREFIXES).
 */
export function invitationRoutes(config: Config, sequelize: Sequelize, table: RouteInfo[]) {
  const r = secureRouter('/api/invitations', table);
  r.get('', 'manageUsers', async (req, res) => {
    res.json(await listInvitations(sequelize, parseOr400(InvitationListQuerySchema, req.query)));
  });
  r.post('', 'manageUsers', async (req, res) => {
    res.status(201).json(await createInvitation(sequelize, config, req.user!.id, parseOr400(CreateInvitationSchema, req.body)));
  });
  r.post('/:id/resend', 'manageUsers', async (req, res) => {
    res.json(await resendInvitation(sequelize, config, req.user!.id, parseOr400(IdParam, req.params).id));
  });
  r.post('/:id/revoke', 'manageUsers', async (req, res) => {
    res.json(await revokeInvitation(sequelize, req.user!.id, parseOr400(IdParam, req.params).id));
  });

  const limiter = publicLinkLimiter();
  const p = secureRouter('/api/public/invitations', table);
  p.get('/:token', 'public', limiter, async (req, res) => {
    res.setHeader('Cache-Control', 'no-store');
    res.json(await viewInvitation(sequelize, parseOr400(TokenParam, req.params).token));
  });
  p.post('/:token/accept', 'public', limiter, async (req, res, next) => {
    const { token } = parseOr400(TokenParam, req.params);
    const user = await acceptInvitation(sequelize, token, parseOr400(AcceptInvitationSchema, req.body));
    const signedIn: Express.User = { id: user.id, email: user.email, name: user.name, role: user.role, workshopId: req.workshopScope! };
    // Signed in as the sign-in route does (passport gives the session a new id).
    req.login(signedIn, (err) => {
      if (err) return next(err);
      res.setHeader('Cache-Control', 'no-store');
      res.status(201).json({ user: user.toDto(), csrfToken: csrf.generateToken(req, true) });
    });
  });
  return [r.router, p.router];
}
