/**
 * "Forgot your password?": a link e-mailed through the outbox that sets a new password once, within an hour.
 * The request answers the same whether or not the address has an account, so the form tells no one who works here.
 * Only the token's SHA-256 is stored; once the message has been handed to the mail server its stored copy has the
 * link blanked out, so the outbox page never shows a working link to anyone who reads it.
 */
import { createHash, randomBytes } from 'node:crypto';
import { QueryTypes, type Sequelize } from 'sequelize';
import type { Config } from '../config';
import { lookupWorkshop, runAsWorkshop } from '../db/workshop-context';
import { HttpProblem } from '../http/problem';
import { OutboxMessage, User } from '../models';
import { audit } from './audit';
import { deliver } from './mail';
import { endSessions, hashPassword } from './users';

/** How long a reset link works. */
export const RESET_VALID_MINUTES = 60;
/** At most this many links per account per hour, so the form cannot be used to flood someone's inbox. */
const MAX_PER_HOUR = 3;

const sha256 = (s: string) => createHash('sha256').update(s).digest('hex');

function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

/** Queues and sends a reset link when the address belongs to an active account; otherwise does nothing, quietly. */
export async function requestPasswordReset(sequelize: Sequelize, config: Config, email: string): Promise<void> {
  // The address names the workshop (through the owner's lookup); an unknown address is answered the same way.
  const workshopId = await lookupWorkshop(sequelize, 'email', email.trim().toLowerCase());
  if (workshopId === null) return;
  await runAsWorkshop(workshopId, () => requestInWorkshop(sequelize, config, email));
}

async function requestInWorkshop(sequelize: Sequelize, config: Config, email: string): Promise<void> {
  const user = await User.findOne({ where: { email: email.trim().toLowerCase() } });
  if (!user || !user.active) return;
  const outboxId = await sequelize.transaction(async (transaction) => {
    // One request at a time per account, so the hourly limit holds under parallel requests.
    await sequelize.query('SELECT id FROM users WHERE id = :id FOR UPDATE', { replacements: { id: user.id }, transaction });
    const [{ recent }] = (await sequelize.query(
      `SELECT count(*)::int AS recent FROM password_resets WHERE user_id = :id AND created_at > now() - interval '1 hour'`,
      { replacements: { id: user.id }, type: QueryTypes.SELECT, transaction },
    )) as [{ recent: number }];
    if (recent >= MAX_PER_HOUR) return null;
    const token = randomBytes(32).toString('base64url');
    await sequelize.query(
      `INSERT INTO password_resets (user_id, token_hash, created_at, expires_at) VALUES (:id, :hash, now(), now() + (:minutes || ' minutes')::interval)`,
      { replacements: { id: user.id, hash: sha256(token), minutes: String(RESET_VALID_MINUTES) }, transaction },
    );
    const url = `${config.publicUrl}/reset-password/${token}`;
    const text =
      `Dear ${user.name},\n\nSomeone (we hope you) asked to set a new password for Shellwright. Open this link within ${RESET_VALID_MINUTES} minutes to choose one:\n\n${url}\n\n` +
      `The link works once. If you did not ask, ignore this message: your password stays as it is.\n`;
    const html =
      `<p>Dear ${escapeHtml(user.name)},</p><p>Someone (we hope you) asked to set a new password for Shellwright. Open this link within ${RESET_VALID_MINUTES} minutes to choose one:</p>` +
      `<p><a href="${escapeHtml(url)}">Choose a new password</a></p><p>The link works once. If you did not ask, ignore this message: your password stays as it is.</p>`;
    const message = await OutboxMessage.create(
      { quoteId: null, toAddress: user.email, subject: 'Set a new Shellwright password', textBody: text, htmlBody: html, attachmentName: null, attachment: null, lastError: null, messageId: null, createdBy: null, sentAt: null },
      { transaction },
    );
    await audit({ userId: null, action: 'user.password_reset_requested', entityType: 'user', entityId: user.id }, transaction);
    return message.id;
  });
  if (outboxId === null) return;
  const sent = await deliver(config, outboxId);
  const blank = (s: string) => s.split(/\/reset-password\/[A-Za-z0-9_-]+/).join('/reset-password/(link removed once sent)');
  await sent.update({ textBody: blank(sent.textBody), htmlBody: blank(sent.htmlBody) });
}

/** Sets the new password if the token is known, unexpired and unused; the token is spent and every session ends. */
export async function completePasswordReset(sequelize: Sequelize, token: string, password: string): Promise<void> {
  const passwordHash = await hashPassword(password);
  // An unknown token runs under no workshop and so finds no row: the usual refusal below.
  const workshopId = await lookupWorkshop(sequelize, 'reset', sha256(token));
  await runAsWorkshop(workshopId, () => completeInWorkshop(sequelize, token, passwordHash));
}

async function completeInWorkshop(sequelize: Sequelize, token: string, passwordHash: string): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    const rows = (await sequelize.query(
      `SELECT id, user_id, expires_at < now() AS expired, used_at IS NOT NULL AS used FROM password_resets WHERE token_hash = :hash FOR UPDATE`,
      { replacements: { hash: sha256(token) }, type: QueryTypes.SELECT, transaction },
    )) as { id: number; user_id: number; expired: boolean; used: boolean }[];
    const row = rows[0];
    if (!row || row.used || row.expired) {
      throw new HttpProblem(400, 'reset_link_invalid', 'Link no longer valid', 'This link has expired or has already been used. Ask for a new one from the sign-in page.', { field: 'token', errors: [{ field: 'token', message: 'has expired or has already been used' }] });
    }
    const user = await User.findByPk(row.user_id, { transaction });
    if (!user || !user.active) throw new HttpProblem(400, 'reset_link_invalid', 'Link no longer valid', 'This account is no longer active. Ask the workshop owner.', { field: 'token' });
    user.passwordHash = passwordHash;
    await user.save({ transaction });
    // This link and any other still open for the account are spent.
    await sequelize.query('UPDATE password_resets SET used_at = now() WHERE user_id = :id AND used_at IS NULL', { replacements: { id: user.id }, transaction });
    await audit({ userId: user.id, action: 'user.password_reset_by_link', entityType: 'user', entityId: user.id }, transaction);
    await endSessions(sequelize, user.id, transaction);
  });
}
