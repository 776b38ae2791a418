// Sign-in, registration, password change and password reset. Services see no req/res; the
// router sets and clears cookies.
import { createHash, randomBytes } from 'node:crypto';
import { Op } from 'sequelize';
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
    log?.info({ event: 'password_changed', userId }, 'password changed; other sessions ended');
    return { user: toPublicUser(user), generation: user.sessionGeneration };
  });
}

export function hashResetToken(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex');
}

/**
 * Always succeeds from the caller's view. When the account exists (and is not disabled), stores
 * the SHA-256 of a random single-use token and queues the mail in the same transaction.
 */
export async function requestPasswordReset(deps: AuthDeps, _actor: Anonymous, input: ResetRequestBody): Promise<void> {
  const { config, clock } = deps;
  const { email } = input;
  const log = deps.logger;
  await deps.sequelize.transaction(async (transaction) => {
    const user = await findUserByEmail(email, transaction);
    if (!user || user.disabled) {
      log?.info({ event: 'password_reset_unknown', email }, 'password reset asked for an unknown or disabled account');
      return;
    }
    const token = randomBytes(32).toString('base64url');
    const minutes = config.RW_RESET_TOKEN_MINUTES;
    const now = clock();
    await PasswordReset.create(
      { userId: user.id, tokenHash: hashResetToken(token), expiresAt: new Date(now.getTime() + minutes * 60_000), usedAt: null, createdAt: now },
      { transaction },
    );
    const link = `${config.RW_PUBLIC_URL.replace(/\/$/, '')}/reset-password?token=${encodeURIComponent(token)}`;
    const mail = passwordResetMail({ clubName: await readClubName(transaction), displayName: user.displayName, link, minutes });
    await enqueueMail(transaction, { kind: 'password_reset', to: user.email, ...mail }, now);
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
