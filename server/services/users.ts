import bcrypt from 'bcryptjs';
import { Op, type Sequelize, type Transaction, type WhereOptions } from 'sequelize';
import { PASSWORD_MAX_BYTES, passwordBytes, type CreateUserInput, type Page, type UpdateUserInput, type User as UserDto, type UserListQuery } from '@shared/schemas/auth';
import { problems } from '../http/problem';
import { lookupWorkshop, runAsWorkshop } from '../db/workshop-context';
import { User } from '../models';
import { audit } from './audit';
import { containsPattern } from './paging';

const BCRYPT_COST = 10;

export function hashPassword(password: string): Promise<string> {
  // Never hash a password bcrypt would cut short: the schemas refuse it, and this is the last line.
  if (passwordBytes(password) > PASSWORD_MAX_BYTES) return Promise.reject(problems.badRequest('password_too_long', `password: must be at most ${PASSWORD_MAX_BYTES} bytes`, 'password'));
  return bcrypt.hash(password, BCRYPT_COST);
}

/** A fixed hash to compare against when the e-mail is unknown, so both paths take the same time. */
const DUMMY_HASH = bcrypt.hashSync('not-a-real-password', BCRYPT_COST);

/** Checks an e-mail and password; returns the active user or undefined. */
export async function verifyCredentials(email: string, password: string): Promise<User | undefined> {
  const address = email.trim().toLowerCase();
  // Sign-in is the one place a user's workshop is not known yet: the owner's lookup names it, then the user is read
  // under it like any other row.
  const workshopId = await lookupWorkshop(User.sequelize!, 'email', address);
  const user = workshopId === null ? null : await runAsWorkshop(workshopId, () => User.findOne({ where: { email: address } }));
  // A password longer than bcrypt reads can match no stored one (none longer is ever set); comparing it would
  // match on its first 72 bytes alone. It still costs one comparison, so the refusal takes the usual time.
  const tooLong = passwordBytes(password) > PASSWORD_MAX_BYTES;
  const ok = (await bcrypt.compare(tooLong ? '' : password, user?.passwordHash ?? DUMMY_HASH)) && !tooLong;
  if (!user || !ok || !user.active) return undefined;
  return user;
}

const SORT_COLUMNS: Record<UserListQuery['sort'], string> = {
  name: 'name',
  email: 'email',
  role: 'role',
  lastLoginAt: 'lastLoginAt',
  createdAt: 'createdAt',
};

export async function listUsers(query: UserListQuery): Promise<Page<UserDto>> {
  const where: WhereOptions<User> = {};
  if (query.role) Object.assign(where, { role: query.role });
  if (query.q) {
    const like = containsPattern(query.q);
    Object.assign(where, { [Op.or]: [{ name: { [Op.iLike]: like } }, { email: { [Op.iLike]: like } }] });
  }
  const { rows, count } = await User.findAndCountAll({
    where,
    order: [
      [SORT_COLUMNS[query.sort], query.dir.toUpperCase() + (query.dir === 'asc' ? ' NULLS FIRST' : ' NULLS LAST')],
      ['id', 'ASC'],
    ],
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
  });
  return { rows: rows.map((u) => u.toDto()), total: count, page: query.page, pageSize: query.pageSize };
}

export async function createUser(sequelize: Sequelize, actorId: number | null, input: CreateUserInput): Promise<UserDto> {
  const existing = await User.findOne({ where: { email: input.email } });
  if (existing) throw problems.conflict('email_taken', `email: ${input.email} already has an account`);
  const passwordHash = await hashPassword(input.password);
  return sequelize.transaction(async (transaction) => {
    const user = await User.create({ email: input.email, name: input.name, role: input.role, passwordHash, lastLoginAt: null }, { transaction });
    await audit({ userId: actorId, action: 'user.create', entityType: 'user', entityId: user.id, after: { email: user.email, name: user.name, role: user.role } }, transaction);
    return user.toDto();
  });
}

/** Deletes every stored session of a user (sign them out everywhere). */
export async function endSessions(sequelize: Sequelize, userId: number, transaction?: Transaction): Promise<void> {
  await sequelize.query(`DELETE FROM session WHERE (sess->'passport'->>'user') = :id`, {
    replacements: { id: String(userId) },
    transaction,
  });
}

async function activeOwnersOtherThan(userId: number): Promise<number> {
  return User.count({ where: { role: 'owner', active: true, id: { [Op.ne]: userId } } });
}

export async function updateUser(sequelize: Sequelize, actorId: number, id: number, input: UpdateUserInput): Promise<UserDto> {
  return sequelize.transaction(async (transaction) => {
    const user = await User.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!user) throw problems.notFound('User');
    const losesOwner = user.role === 'owner' && user.active && ((input.role && input.role !== 'owner') || input.active === false);
    if (losesOwner && (await activeOwnersOtherThan(id)) === 0) {
      throw problems.conflict('last_owner', 'The workshop must keep at least one active owner.');
    }
    const before = { name: user.name, role: user.role, active: user.active };
    if (input.name !== undefined) user.name = input.name;
    if (input.role !== undefined) user.role = input.role;
    if (input.active !== undefined) user.active = input.active;
    await user.save({ transaction });
    await audit({ userId: actorId, action: 'user.update', entityType: 'user', entityId: id, before, after: { name: user.name, role: user.role, active: user.active } }, transaction);
    if (input.active === false || (input.role !== undefined && input.role !== before.role)) {
      await endSessions(sequelize, id, transaction);
    }
    return user.toDto();
  });
}

export async function resetPassword(sequelize: Sequelize, actorId: number, id: number, password: string): Promise<void> {
  const passwordHash = await hashPassword(password);
  await sequelize.transaction(async (transaction) => {
    const user = await User.findByPk(id, { transaction });
    if (!user) throw problems.notFound('User');
    user.passwordHash = passwordHash;
    await user.save({ transaction });
    await audit({ userId: actorId, action: 'user.password_reset', entityType: 'user', entityId: id }, transaction);
    await endSessions(sequelize, id, transaction);
  });
}
