// Sign-in, registration, password change and password reset. Services see no req/res; the
// router sets and clears cookies.
import { createHash, randomBytes } from 'node:crypto';
import { Op, Transaction } from 'sequelize';
import type { Anonymous, AppDeps } from '../../deps';
import { AppError, ValidationError } from '../../errors';
import { enqueueMail } from '../outbox/outbox.service';
import { readClubName } from '../club/club-settings.service';
import type { SessionUser } from './session-user';
import { passwordResetMail } from './auth-mails';
import { PasswordReset, User } from '../users/user.model';
import type { User as PublicUser } from '../../contracts/accounts';
import { assertPasswordAcceptable, createAccount, findUser, findUserByEmail, toPublicUser } from '../users/users.service';

export { toPublicUser as publicUser };
import { argon2ParamsFromConfig, dummyHashFor, hashPassword, needsRehash, verifyPassword } from './passwords';
import type { ChangePasswordBody, RegisterBody, ResetConfirmBody, ResetRequestBody, SignInBody } from './auth.schemas';

/** The logger is the request's (see forRequest in deps.ts), so what is logged here carries its id. */
export type AuthDeps = Pick<AppDeps, 'config' | 'sequelize' | 'logger' | 'clock'>;

const now = (deps: AuthDeps): Date => deps.clock();

/** Reset mails to one person are counted over this window (RW_RESET_MAILS_PER_HOUR). */
export const RESET_MAIL_WINDOW_MS = 60 * 60 * 1000;

/** A signed-in person and the generation their new session token must carry. */
export interface SignedIn {
  user: PublicUser;
  generation: number;
}

const invalidCredentials = () =>
  new AppError(401, 'invalid_credentials', 'That e-mail address and password do not match an account.');

/**
 * Unknown e-mail, wrong password and disabled account all answer alike, and take alike: an
 * unknown e-mail is verified against a dummy hash of the current parameters.
 */
export async function signIn(deps: AuthDeps, _actor: Anonymous, input: SignInBody): Promise<SignedIn> {
  const { email, password } = input;
  const log = deps.logger;
  const params = argon2ParamsFromConfig(deps.config);
  const user = await findUserByEmail(email);
  const ok = await verifyPassword(user?.passwordHash ?? (await dummyHashFor(params)), password);
  if (!user || !ok || user.disabled) {
    log?.info({ event: 'sign_in_failed', email, reason: !user ? 'unknown_email' : !ok ? 'wrong_password' : 'disabled' }, 'sign-in refused');
    throw invalidCredentials();
  }
  if (needsRehash(user.passwordHash, params)) {
    // The costs have risen since this hash was made: store a new one while we hold the password.
    user.passwordHash = await hashPassword(password, params);
    await user.save({ fields: ['passwordHash'] });
    log?.info({ event: 'password_rehashed', userId: user.id }, 'password rehashed with current parameters');
  }
  log?.info({ event: 'sign_in', userId: user.id }, 'signed in');
  return { user: toPublicUser(user), generation: user.sessionGeneration };
}

export async function register(deps: AuthDeps, _actor: Anonymous, body: RegisterBody): Promise<SignedIn> {
  const log = deps.logger;
  const user = await deps.sequelize.transaction((transaction) =>
    createAccount(deps.config, { ...body, callSign: body.callSign ?? null, roles: ['member'] }, transaction),
  );
  log?.info({ event: 'registered', userId: user.id }, 'account registered');
  return { user: toPublicUser(user), generation: user.sessionGeneration };
}

/** Ends every session of the person (the token generation moves on). */
export async function endSessions(_deps: AuthDeps, actor: SessionUser): Promise<void> {
  await User.increment('sessionGeneration', { by: 1, where: { id: actor.id } });
}

export async function changePassword(deps: AuthDeps, actor: SessionUser, input: ChangePasswordBody): Promise<SignedIn> {
  const { currentPassword, newPassword } = input;
  const userId = actor.id;
  const log = deps.logger;
  return deps.sequelize.transaction(async (transaction) => {
    const user = await findUser(userId, transaction, true);
    if (!user) throw invalidCredentials();
    if (!(await verifyPassword(user.passwordHash, currentPassword))) {
      log?.info({ event: 'password_change_refused', userId }, 'current password wrong');
      throw new ValidationError('Your current password is not right.', { currentPassword: 'Your current password is not right.' });
    }
    await assertPasswordAcceptable(newPassword, user, 'newPassword', transaction);
    user.passwordHash = await hashPassword(newPassword, argon2ParamsFromConfig(deps.config));
    user.sessionGeneration = user.sessionGeneration + 1;
    await user.save({ transaction });
    // A reset link mailed before the change must not undo it.
    const [voided] = await PasswordReset.update({ usedAt: now(deps) }, { where: { userId, usedAt: null }, transaction });
    log?.info({ event: 'password_changed', userId, resetLinksVoided: voided }, 'password changed; other sessions ended');
    return { user: toPublicUser(user), generation: user.sessionGeneration };
  });
}

export function hashResetToken(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex');
}

/**
 * Always succeeds from the caller's view (the router answers 202 before calling this, so the
 * answer cannot tell whether the address has an account). When the account exists, is not
 * disabled and has had fewer than RW_RESET_MAILS_PER_HOUR reset mails in the last hour, stores
 * the SHA-256 of a random single-use token and queues the mail in the same transaction. The
 * person's row is locked meanwhile, so simultaneous requests cannot slip past the limit.
 */
export async function requestPasswordReset(deps: AuthDeps, _actor: Anonymous, input: ResetRequestBody): Promise<void> {
  const { config } = deps;
  const { email } = input;
  const log = deps.logger;
  // READ COMMITTED: the count below must see a reset that a simultaneous request committed while
  // this one waited for the row lock (REPEATABLE READ would count from an older snapshot).
  await deps.sequelize.transaction({ isolationLevel: Transaction.ISOLATION_LEVELS.READ_COMMITTED }, async (transaction) => {
    const found = await findUserByEmail(email, transaction);
    const user = found && (await findUser(found.id, transaction, true));
    if (!user || user.disabled) {
      log?.info({ event: 'password_reset_unknown', email }, 'password reset asked for an unknown or disabled account');
      return;
    }
    const at = now(deps);
    const recent = await PasswordReset.count({
      where: { userId: user.id, createdAt: { [Op.gt]: new Date(at.getTime() - RESET_MAIL_WINDOW_MS) } },
      transaction,
    });
    if (recent >= config.RW_RESET_MAILS_PER_HOUR) {
      log?.warn({ event: 'password_reset_limited', userId: user.id, recent }, 'password reset mail not sent: hourly limit for this address reached');
      return;
    }
    const token = randomBytes(32).toString('base64url');
    const minutes = config.RW_RESET_TOKEN_MINUTES;
    await PasswordReset.create(
      { userId: user.id, tokenHash: hashResetToken(token), expiresAt: new Date(at.getTime() + minutes * 60_000), usedAt: null, createdAt: at },
      { transaction },
    );
    const link = `${config.RW_PUBLIC_URL.replace(/\/$/, '')}/reset-password?token=${encodeURIComponent(token)}`;
    const mail = passwordResetMail({ clubName: await readClubName(transaction), displayName: user.displayName, link, minutes });
    await enqueueMail(transaction, { kind: 'password_reset', to: user.email, ...mail }, at);
    log?.info({ event: 'password_reset_requested', userId: user.id }, 'password reset mail queued');
  });
}

/** Sets a new password from a reset token: single use, unexpired; ends every session. */
export async function confirmPasswordReset(deps: AuthDeps, _actor: Anonymous, input: ResetConfirmBody): Promise<void> {
  const { token, newPassword } = input;
  const log = deps.logger;
  const now = deps.clock();
  const invalid = () =>
    new AppError(400, 'reset_token_invalid', 'This reset link is not valid any more. Ask for a new one from the sign-in page.');
  await deps.sequelize.transaction(async (transaction) => {
    const reset = await PasswordReset.findOne({
      where: { tokenHash: hashResetToken(token), usedAt: null, expiresAt: { [Op.gt]: now } },
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    if (!reset) throw invalid();
    const user = await findUser(reset.userId, transaction, true);
    if (!user || user.disabled) throw invalid();
    await assertPasswordAcceptable(newPassword, user, 'newPassword', transaction);
    user.passwordHash = await hashPassword(newPassword, argon2ParamsFromConfig(deps.config));
    user.sessionGeneration = user.sessionGeneration + 1;
    await user.save({ transaction });
    // This token and any other outstanding ones for the person are spent.
    await PasswordReset.update({ usedAt: now }, { where: { userId: user.id, usedAt: null }, transaction });
    log?.info({ event: 'password_reset', userId: user.id }, 'password reset; sessions ended');
  });
}
