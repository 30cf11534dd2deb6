/**
 * Invitations to join a workshop. The owner names an e-mail address and a role; the address receives a link (through
 * the outbox) that works for a week. Opening it shows the workshop and the role; accepting it with a name and a
 * password makes the account in that workshop, in that role, and signs the person in.
 *
 * - Only the token's SHA-256 is stored. Resending makes a new token and a new expiry: the old link stops working.
 * - The stored copy of each message has its link blanked once the mail server has had it (as the password reset
 *   does), so no one reading the outbox holds a working link.
 * - An address that already has an account anywhere is refused (sign-in addresses are unique across the service),
 *   without saying where; so is a second invitation while one is still waiting in this workshop.
 * - Parallel accepts of one link make one user: the invitation's row is locked, and the user's e-mail is unique.
 */
import { randomBytes } from 'node:crypto';
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { ROLE_LABELS, type Role } from '@shared/roles';
import { formatDate } from '@shared/format';
import {
  INVITATION_VALID_DAYS,
  type AcceptInvitation,
  type CreateInvitation,
  type Invitation,
  type InvitationListQuery,
  type InvitationState,
  type PublicInvitation,
} from '@shared/schemas/invitations';
import type { Page } from '@shared/schemas/auth';
import type { Config } from '../config';
import { lookupWorkshop } from '../db/workshop-context';
import { HttpProblem, problems } from '../http/problem';
import { OutboxMessage, User } from '../models';
import { audit } from './audit';
import { deliver } from './mail';
import { escapeHtml } from './mail-compose';
import { containsPattern, offset, pageTotal } from './paging';
import { hashToken } from './quotes/links';
import { hashPassword } from './users';

/** The state of an invitation, read at query time (nothing is written when a link runs out). */
const STATE_SQL = `CASE WHEN i.accepted_at IS NOT NULL THEN 'accepted' WHEN i.revoked_at IS NOT NULL THEN 'revoked' WHEN i.expires_at <= now() THEN 'expired' ELSE 'pending' END`;

/** The client path of an invitation's link. */
export const INVITE_PATH = '/invite/';

interface Row {
  id: number;
  email: string;
  role: Role;
  state: InvitationState;
  expires_at: Date;
  invited_by_name: string | null;
  send_count: number;
  last_sent_at: Date | null;
  accepted_at: Date | null;
  revoked_at: Date | null;
  created_at: Date;
  outbox_status: string | null;
}

const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null);

function toDto(r: Row): Invitation {
  return {
    id: r.id,
    email: r.email,
    role: r.role,
    state: r.state,
    expiresAt: new Date(r.expires_at).toISOString(),
    invitedBy: r.invited_by_name,
    sendCount: Number(r.send_count),
    lastSentAt: iso(r.last_sent_at),
    acceptedAt: iso(r.accepted_at),
    revokedAt: iso(r.revoked_at),
    createdAt: new Date(r.created_at).toISOString(),
    delivered: r.outbox_status === 'sent' ? true : r.outbox_status === 'failed' ? false : null,
  };
}

const SELECT = `
  SELECT i.id, i.email, i.role, ${STATE_SQL} AS state, i.expires_at, u.name AS invited_by_name, i.send_count, i.last_sent_at,
         i.accepted_at, i.revoked_at, i.created_at, o.status AS outbox_status
    FROM invitations i
    LEFT JOIN users u ON u.id = i.invited_by
    LEFT JOIN outbox o ON o.id = i.last_outbox_id`;

const SORTS: Record<InvitationListQuery['sort'], string> = {
  email: 'i.email',
  role: 'i.role',
  state: `(${STATE_SQL})`,
  expiresAt: 'i.expires_at',
  createdAt: 'i.created_at',
};

/** The workshop's invitations, sorted, filtered by state or searched by address, one page at a time. */
export async function listInvitations(sequelize: Sequelize, query: InvitationListQuery): Promise<Page<Invitation>> {
  const where: string[] = [];
  const replacements: Record<string, unknown> = { limit: query.pageSize, offset: offset(query.page, query.pageSize) };
  if (query.q) {
    where.push('i.email ILIKE :like');
    replacements.like = containsPattern(query.q.toLowerCase());
  }
  if (query.state) {
    where.push(`(${STATE_SQL}) = :state`);
    replacements.state = query.state;
  }
  const filter = where.length ? `WHERE ${where.join(' AND ')}` : '';
  const dir = query.dir === 'asc' ? 'ASC' : 'DESC';
  const rows = await sequelize.query<Row>(`${SELECT} ${filter} ORDER BY ${SORTS[query.sort]} ${dir}, i.id ${dir} LIMIT :limit OFFSET :offset`, {
    type: QueryTypes.SELECT,
    replacements,
  });
  const total = await pageTotal(rows.length, query, async (limit) => {
    const [c] = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM (SELECT 1 FROM invitations i ${filter} LIMIT :cap) x`, {
      type: QueryTypes.SELECT,
      replacements: { ...replacements, cap: limit },
    });
    return c?.n ?? 0;
  });
  return { rows: rows.map(toDto), ...total, page: query.page, pageSize: query.pageSize };
}

async function readOne(sequelize: Sequelize, id: number, transaction?: Transaction): Promise<Invitation> {
  const [row] = await sequelize.query<Row>(`${SELECT} WHERE i.id = :id`, { type: QueryTypes.SELECT, replacements: { id }, transaction });
  if (!row) throw problems.notFound('The invitation');
  return toDto(row);
}

/** 409 when the address already signs in somewhere (the answer never says where). */
async function refuseExistingAccount(sequelize: Sequelize, email: string): Promise<void> {
  if ((await lookupWorkshop(sequelize, 'email', email)) !== null) {
    throw new HttpProblem(409, 'email_has_account', 'Conflict', `${email} already has an account.`, { field: 'email', errors: [{ field: 'email', message: 'already has an account' }] });
  }
}

interface Letter {
  email: string;
  role: Role;
  token: string;
  expiresAt: Date;
  inviter: string | null;
  workshop: string;
}

/** The invitation e-mail, in plain words: who invites, to which workshop, in which role, until when. */
function letter(config: Config, l: Letter): { subject: string; text: string; html: string } {
  const url = `${config.publicUrl}${INVITE_PATH}${l.token}`;
  const who = l.inviter ? `${l.inviter} of ${l.workshop}` : l.workshop;
  const role = ROLE_LABELS[l.role];
  const until = formatDate(l.expiresAt, { month: 'long' });
  const intro = `${who} invites you to use Shellwright with them, as ${role}.`;
  const how = `Open this link to choose your name and a password. It works once, for ${INVITATION_VALID_DAYS} days (until ${until}):`;
  const after = 'If you were not expecting this, ignore the message: nothing happens unless you open the link and accept.';
  return {
    subject: `Join ${l.workshop} on Shellwright`,
    text: `Hello,\n\n${intro}\n\n${how}\n\n${url}\n\n${after}\n`,
    html: `<p>Hello,</p><p>${escapeHtml(intro)}</p><p>${escapeHtml(how)}</p><p><a href="${escapeHtml(url)}">Accept the invitation</a></p><p>${escapeHtml(after)}</p>`,
  };
}

/** Writes a new token, its expiry and its message for an invitation (in the caller's transaction). */
async function issueLink(sequelize: Sequelize, config: Config, transaction: Transaction, invitationId: number, actorId: number): Promise<number> {
  const token = randomBytes(32).toString('base64url');
  const [row] = await sequelize.query<{ email: string; role: Role; expires_at: Date; inviter: string | null; workshop: string }>(
    `UPDATE invitations i
        SET token_hash = :hash, expires_at = now() + make_interval(days => :days), send_count = send_count + 1, last_sent_at = now(), updated_at = now()
       FROM workshops w
      WHERE i.id = :id AND w.id = i.workshop_id
      RETURNING i.email, i.role, i.expires_at, (SELECT name FROM users WHERE id = :actor) AS inviter, w.name AS workshop`,
    { type: QueryTypes.SELECT, replacements: { hash: hashToken(token), days: INVITATION_VALID_DAYS, id: invitationId, actor: actorId }, transaction },
  );
  if (!row) throw problems.notFound('The invitation');
  const mail = letter(config, { email: row.email, role: row.role, token, expiresAt: new Date(row.expires_at), inviter: row.inviter, workshop: row.workshop });
  const message = await OutboxMessage.create(
    { quoteId: null, toAddress: row.email, subject: mail.subject, textBody: mail.text, htmlBody: mail.html, attachmentName: null, attachment: null, lastError: null, messageId: null, createdBy: actorId, sentAt: null },
    { transaction },
  );
  await sequelize.query('UPDATE invitations SET last_outbox_id = :outbox WHERE id = :id', { replacements: { outbox: message.id, id: invitationId }, transaction });
  return message.id;
}

/** Sends the message now; its stored copy keeps no working link (a failed one can be sent again with Resend). */
async function sendAndBlank(config: Config, outboxId: number): Promise<void> {
  const sent = await deliver(config, outboxId);
  const blank = (s: string) => s.split(/\/invite\/[A-Za-z0-9_-]+/).join('/invite/(link removed once sent; resend the invitation for a new one)');
  await sent.update({ textBody: blank(sent.textBody), htmlBody: blank(sent.htmlBody) });
}

/** One request at a time per address (within the transaction), so two parallel invitations cannot both pass the check. */
async function lockAddress(sequelize: Sequelize, email: string, transaction: Transaction): Promise<void> {
  await sequelize.query(`SELECT pg_advisory_xact_lock(hashtext('invitation:' || :email))`, { replacements: { email }, transaction });
}

export async function createInvitation(sequelize: Sequelize, config: Config, actorId: number, input: CreateInvitation): Promise<Invitation> {
  await refuseExistingAccount(sequelize, input.email);
  const { id, outboxId } = await sequelize.transaction(async (transaction) => {
    await lockAddress(sequelize, input.email, transaction);
    const [waiting] = await sequelize.query<{ id: number }>(
      `SELECT id FROM invitations WHERE email = :email AND accepted_at IS NULL AND revoked_at IS NULL AND expires_at > now() LIMIT 1`,
      { type: QueryTypes.SELECT, replacements: { email: input.email }, transaction },
    );
    if (waiting) {
      throw new HttpProblem(409, 'invitation_pending', 'Conflict', `${input.email} already has an invitation waiting here: resend it or withdraw it.`, {
        field: 'email',
        errors: [{ field: 'email', message: 'already has an invitation waiting' }],
      });
    }
    const [created] = await sequelize.query<{ id: number }>(
      `INSERT INTO invitations (email, role, token_hash, expires_at, invited_by) VALUES (:email, :role, :placeholder, now(), :actor) RETURNING id`,
      { type: QueryTypes.SELECT, replacements: { email: input.email, role: input.role, placeholder: `new-${randomBytes(16).toString('hex')}`, actor: actorId }, transaction },
    );
    const outboxId = await issueLink(sequelize, config, transaction, created!.id, actorId);
    await audit({ userId: actorId, action: 'invitation.create', entityType: 'invitation', entityId: created!.id, after: { email: input.email, role: input.role } }, transaction);
    return { id: created!.id, outboxId };
  });
  await sendAndBlank(config, outboxId);
  return readOne(sequelize, id);
}

/** Locks an invitation for a change; 404 when this workshop has none by that id. */
async function lockInvitation(sequelize: Sequelize, id: number, transaction: Transaction) {
  const [row] = await sequelize.query<{ id: number; email: string; role: Role; state: InvitationState }>(
    `SELECT i.id, i.email, i.role, ${STATE_SQL} AS state FROM invitations i WHERE i.id = :id FOR UPDATE`,
    { type: QueryTypes.SELECT, replacements: { id }, transaction },
  );
  if (!row) throw problems.notFound('The invitation');
  return row;
}

/** A new link and a new week for a waiting or expired invitation; the old link stops working. */
export async function resendInvitation(sequelize: Sequelize, config: Config, actorId: number, id: number): Promise<Invitation> {
  const outboxId = await sequelize.transaction(async (transaction) => {
    const row = await lockInvitation(sequelize, id, transaction);
    if (row.state === 'accepted') throw problems.conflict('invitation_accepted', `The invitation to ${row.email} was accepted: there is nothing to resend.`);
    if (row.state === 'revoked') throw problems.conflict('invitation_revoked', `The invitation to ${row.email} was withdrawn: invite them again instead.`);
    await refuseExistingAccount(sequelize, row.email);
    const outboxId = await issueLink(sequelize, config, transaction, id, actorId);
    await audit({ userId: actorId, action: 'invitation.resend', entityType: 'invitation', entityId: id, before: { state: row.state } }, transaction);
    return outboxId;
  });
  await sendAndBlank(config, outboxId);
  return readOne(sequelize, id);
}

/** Withdraws a waiting or expired invitation: its link stops working. */
export async function revokeInvitation(sequelize: Sequelize, actorId: number, id: number): Promise<Invitation> {
  return sequelize.transaction(async (transaction) => {
    const row = await lockInvitation(sequelize, id, transaction);
    if (row.state === 'accepted') throw problems.conflict('invitation_accepted', `The invitation to ${row.email} was already accepted: deactivate the user instead.`);
    if (row.state === 'revoked') throw problems.conflict('invitation_revoked', `The invitation to ${row.email} was already withdrawn.`);
    await sequelize.query('UPDATE invitations SET revoked_at = now(), revoked_by = :actor, updated_at = now() WHERE id = :id', { replacements: { id, actor: actorId }, transaction });
    await audit({ userId: actorId, action: 'invitation.revoke', entityType: 'invitation', entityId: id, before: { state: row.state }, after: { state: 'revoked' } }, transaction);
    return readOne(sequelize, id, transaction);
  });
}

const unknownLink = () =>
  new HttpProblem(404, 'invitation_not_found', 'Not found', 'This invitation link is not one we know. Ask the workshop owner to send you a new one.');

/** What the link's page shows. Runs under the link's workshop (resolved from the token's hash before the handler). */
export async function viewInvitation(sequelize: Sequelize, token: string): Promise<PublicInvitation> {
  const [row] = await sequelize.query<{ email: string; role: Role; state: InvitationState; expires_at: Date; workshop: string }>(
    `SELECT i.email, i.role, ${STATE_SQL} AS state, i.expires_at, w.name AS workshop
       FROM invitations i JOIN workshops w ON w.id = i.workshop_id WHERE i.token_hash = :hash`,
    { type: QueryTypes.SELECT, replacements: { hash: hashToken(token) } },
  );
  if (!row) throw unknownLink();
  return { workshopName: row.workshop, email: row.email, role: row.role, state: row.state, expiresAt: new Date(row.expires_at).toISOString() };
}

/**
 * Makes the account the invitation names (its address, its role, in its workshop) with the chosen name and password,
 * and marks the invitation accepted. Refused (nothing written) when the link is unknown (404), was used (409), was
 * withdrawn or has run out (410), or the address got an account meanwhile (409).
 */
export async function acceptInvitation(sequelize: Sequelize, token: string, input: AcceptInvitation): Promise<User> {
  const passwordHash = await hashPassword(input.password);
  return sequelize.transaction(async (transaction) => {
    const [row] = await sequelize.query<{ id: number; email: string; role: Role; state: InvitationState; expires_at: Date }>(
      `SELECT i.id, i.email, i.role, ${STATE_SQL} AS state, i.expires_at FROM invitations i WHERE i.token_hash = :hash FOR UPDATE`,
      { type: QueryTypes.SELECT, replacements: { hash: hashToken(token) }, transaction },
    );
    if (!row) throw unknownLink();
    if (row.state === 'accepted') throw new HttpProblem(409, 'invitation_used', 'Already accepted', 'This invitation has already been accepted. Sign in with the e-mail address and password chosen then.');
    if (row.state === 'revoked') throw new HttpProblem(410, 'invitation_revoked', 'Invitation withdrawn', 'This invitation was withdrawn by the workshop. Ask the owner if you should have one.');
    if (row.state === 'expired') {
      throw new HttpProblem(410, 'invitation_expired', 'Invitation expired', `This invitation ran out on ${formatDate(new Date(row.expires_at), { month: 'long' })}. Ask the workshop owner to send it again.`);
    }
    await refuseExistingAccount(sequelize, row.email);
    const user = await User.create({ email: row.email, name: input.name, role: row.role, passwordHash, lastLoginAt: new Date() }, { transaction });
    await sequelize.query('UPDATE invitations SET accepted_at = now(), accepted_user_id = :user, updated_at = now() WHERE id = :id', { replacements: { id: row.id, user: user.id }, transaction });
    await audit({ userId: user.id, action: 'invitation.accept', entityType: 'invitation', entityId: row.id, after: { userId: user.id, email: row.email, role: row.role } }, transaction);
    await audit({ userId: user.id, action: 'user.create', entityType: 'user', entityId: user.id, after: { email: user.email, name: user.name, role: user.role, by: 'invitation' } }, transaction);
    return user;
  });
}
