// Accounts: creation (used by registration and by admins), the admin list and changes.
// Role changes and disabling bump the person's session generation, which ends their sessions.
import { Op, UniqueConstraintError, type Transaction, type WhereOptions } from 'sequelize';
import type { Config } from '../../config';
import type { AppDeps } from '../../deps';
import { ConflictError, NotFoundError, ValidationError } from '../../errors';
import { argon2ParamsFromConfig, hashPassword, passwordProblem } from '../auth/passwords';
import type { Role, User as PublicUser, UserRow } from '../../contracts/accounts';
import type { Page } from '../../contracts/lists';
import type { SessionUser } from '../auth/session-user';
import { readClubName } from '../club/club-settings.service';
import { User, UserRole } from './user.model';
import type { ListUsersQuery, PatchUserBody } from './users.schemas';

/** `User` of the API contract: only these fields leave the server. */
export function toPublicUser(u: SessionUser | User): PublicUser {
  return { id: u.id, email: u.email, displayName: u.displayName, callSign: u.callSign ?? null, roles: [...u.roles] };
}

export function toUserRow(u: User): UserRow {
  return { ...toPublicUser(u), disabled: !!u.disabled, createdAt: new Date(u.createdAt).toISOString() };
}

export interface NewAccount {
  email: string;
  displayName: string;
  callSign?: string | null;
  roles: Role[];
  password: string;
}

/**
 * Checks the password policy with the person's own details and the club's name (read from the
 * club settings in `transaction`); throws 400 on `field`.
 */
export async function assertPasswordAcceptable(
  password: string,
  person: { email?: string; displayName?: string; callSign?: string | null },
  field = 'password',
  transaction?: Transaction,
): Promise<void> {
  const { email, displayName, callSign } = person;
  const problem = passwordProblem(password, { email, displayName, callSign, clubName: await readClubName(transaction) });
  if (problem) throw new ValidationError(problem, { [field]: problem });
}

/** Creates an account with its roles in the transaction; 409 email_taken when the address is in use. */
export async function createAccount(config: Config, account: NewAccount, transaction: Transaction): Promise<User> {
  await assertPasswordAcceptable(account.password, account, 'password', transaction);
  const passwordHash = await hashPassword(account.password, argon2ParamsFromConfig(config));
  try {
    const user = await User.create(
      { email: account.email, displayName: account.displayName, callSign: account.callSign ?? null, passwordHash },
      { transaction },
    );
    await UserRole.bulkCreate(
      account.roles.map((role) => ({ userId: user.id, role })),
      { transaction },
    );
    return (await findUser(user.id, transaction))!;
  } catch (err) {
    if (err instanceof UniqueConstraintError) {
      throw new ConflictError('email_taken', 'An account with that e-mail address already exists.');
    }
    throw err;
  }
}

export function findUser(id: number, transaction?: Transaction, lock = false): Promise<User | null> {
  return User.findByPk(id, {
    include: [{ model: UserRole, as: 'roleRows' }],
    transaction,
    ...(lock && transaction ? { lock: transaction.LOCK.UPDATE } : {}),
  });
}

export async function findUserByEmail(email: string, transaction?: Transaction): Promise<User | null> {
  return User.findOne({ where: { email: email.trim().toLowerCase() }, include: [{ model: UserRole, as: 'roleRows' }], transaction });
}

function escapeLike(s: string): string {
  return s.replace(/[\\%_]/g, (c) => `\\${c}`);
}

export type UsersDeps = Pick<AppDeps, 'config' | 'sequelize'>;

/** The admin's accounts list (the router lets only admins in). */
export async function listUsers(_deps: UsersDeps, _actor: SessionUser, query: ListUsersQuery): Promise<Page<UserRow>> {
  const where: WhereOptions<User> = query.q
    ? {
        [Op.or]: [
          { email: { [Op.like]: `%${escapeLike(query.q)}%` } },
          { displayName: { [Op.like]: `%${escapeLike(query.q)}%` } },
          { callSign: { [Op.like]: `%${escapeLike(query.q)}%` } },
        ],
      }
    : {};
  const { rows, count } = await User.findAndCountAll({
    where,
    order: [
      [query.sort, query.dir.toUpperCase()],
      ['id', 'ASC'],
    ],
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
    distinct: true,
  });
  // Roles in a second query for just this page (avoids a join multiplying rows under LIMIT).
  const roleRows = rows.length ? await UserRole.findAll({ where: { userId: rows.map((r) => r.id) } }) : [];
  for (const u of rows) u.roleRows = roleRows.filter((r) => r.userId === u.id);
  return { items: rows.map(toUserRow), total: count, page: query.page, pageSize: query.pageSize };
}

export async function createUserByAdmin(deps: UsersDeps, _actor: SessionUser, body: NewAccount): Promise<UserRow> {
  const user = await deps.sequelize.transaction((transaction) => createAccount(deps.config, body, transaction));
  return toUserRow(user);
}

/**
 * An admin changes a person's name, call sign, roles or disabled flag. A role change or disabling
 * ends that person's sessions. An admin cannot take their own admin role or disable themselves
 * (so the club never locks itself out by accident).
 */
export async function patchUser(deps: UsersDeps, actor: SessionUser, input: { id: number } & PatchUserBody): Promise<UserRow> {
  const { id, ...patch } = input;
  return deps.sequelize.transaction(async (transaction) => {
    const user = await findUser(id, transaction, true);
    if (!user) throw new NotFoundError('No such account.', 'user_not_found');

    if (user.id === actor.id && patch.roles && !patch.roles.includes('admin')) {
      throw new ConflictError('own_admin_role', 'You cannot remove your own admin role. Ask another admin to do it.');
    }
    if (user.id === actor.id && patch.disabled === true) {
      throw new ConflictError('own_account', 'You cannot disable your own account. Ask another admin to do it.');
    }

    let endSessions = false;
    if (patch.displayName !== undefined) user.displayName = patch.displayName;
    if (patch.callSign !== undefined) user.callSign = patch.callSign;
    if (patch.disabled !== undefined && patch.disabled !== user.disabled) {
      user.disabled = patch.disabled;
      if (patch.disabled) endSessions = true;
    }
    if (patch.roles) {
      const before = new Set(user.roles);
      const after = new Set(patch.roles);
      const changed = before.size !== after.size || [...after].some((r) => !before.has(r));
      if (changed) {
        await UserRole.destroy({ where: { userId: user.id }, transaction });
        await UserRole.bulkCreate(
          patch.roles.map((role) => ({ userId: user.id, role })),
          { transaction },
        );
        endSessions = true;
      }
    }
    if (endSessions) user.sessionGeneration = user.sessionGeneration + 1;
    await user.save({ transaction });
    return toUserRow((await findUser(user.id, transaction))!);
  });
}
