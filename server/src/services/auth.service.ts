import { Op, type Transaction } from 'sequelize';
import type { InvitationAcceptInput, PasswordResetCompleteInput, SessionDto, SignInInput } from '@wingstage/shared';
import { AppError, unauthenticated } from '../errors/app-error.js';
import type { PasswordHasher } from '../lib/passwords.js';
import { WINDOW_MINUTES, accountKey, type RateLimits } from '../lib/rate-limits.js';
import { hashToken, issueSession, newOneTimeToken } from '../lib/session-tokens.js';
import { passwordResetMail } from '../mail/templates.js';
import { OneTimeToken, User, Workshop, boundSequelize } from '../models/index.js';
import { inTransaction } from '../db/transaction.js';
import type { Deps } from './deps.js';
import { toUserDto, type SessionUser, type SessionWorkshop } from './dto.js';

export const THROTTLE_WINDOW_MINUTES = WINDOW_MINUTES;

/** What guards the sign-in routes: the shared rate limits and the password pool. */
export interface AuthGuards {
  limits: RateLimits;
  passwords: PasswordHasher;
}
/** ASVS 6.5.5 wants e-mailed sign-in links short-lived; half an hour leaves time to find the mail. */
export const RESET_MINUTES = 30;
export const INVITE_DAYS = 7;

export interface IssuedSession {
  dto: SessionDto;
  token: string;
  csrf: string;
}

const tokenInvalid = () => new AppError('token_invalid', 401, 'This link has expired or was already used. Ask for a new one.');

/** What a session says about its workshop, including how owners reach it. */
function sessionWorkshop(workshop: Workshop): SessionDto['workshop'] {
  const settings = (workshop.settings ?? {}) as { contactPhone?: unknown; contactEmail?: unknown };
  const text = (v: unknown) => (typeof v === 'string' ? v : '');
  return { id: workshop.id, name: workshop.name, currency: workshop.currency, contact: { phone: text(settings.contactPhone), email: text(settings.contactEmail) } };
}

function sessionFor(deps: Deps, user: User, workshop: Workshop): IssuedSession {
  const { token, csrf } = issueSession(deps.config, user);
  return {
    token,
    csrf,
    dto: { user: toUserDto(user), workshop: sessionWorkshop(workshop), csrfToken: csrf },
  };
}

const wrongPassword = () => unauthenticated('The e-mail or password is not right.');

/**
 * The attempt is reserved against the account's limit BEFORE the password is checked, in one
 * atomic step in PostgreSQL, so however many arrive at once (on however many app processes) at
 * most SIGNIN_ACCOUNT_LIMIT passwords are checked per window (ASVS 4.0.3 V2.2.1 allows at most
 * 100 failures an hour). A right password clears the count. An unknown e-mail and a switched-off
 * account cost the same comparison and get the same answer as a wrong password.
 */
export async function signIn(deps: Deps, guards: AuthGuards, input: SignInInput): Promise<IssuedSession> {
  const release = guards.passwords.admit();
  try {
    const key = accountKey(input.email);
    const wait = await guards.limits.signInAccount.reserve(key);
    if (wait !== null) {
      throw new AppError('too_many_requests', 429, `Too many failed sign-ins for this account. Wait ${THROTTLE_WINDOW_MINUTES} minutes, or reset your password.`, undefined, wait);
    }
    const user = await User.findOne({ where: { email: input.email }, include: [{ model: Workshop, as: 'workshop', required: true }] });
    let matches: boolean;
    try {
      matches = await guards.passwords.check(input.password, user?.passwordHash);
    } catch (err) {
      // Turned away before any check (the pool was full): this attempt does not count.
      await guards.limits.signInAccount.refund(key);
      throw err;
    }
    if (!user || !matches || !user.active) throw wrongPassword();
    await guards.limits.signInAccount.reset(key);
    return sessionFor(deps, user, (user as User & { workshop: Workshop }).workshop);
  } finally {
    release();
  }
}

export async function signOut(userId: string, sid: string, expiresAt: Date): Promise<void> {
  await boundSequelize().query(
    'INSERT INTO revoked_sessions (sid, user_id, expires_at) VALUES ($1, $2, $3) ON CONFLICT (sid) DO NOTHING',
    { bind: [sid, userId, expiresAt.toISOString()] },
  );
  // Old revocations are useless once their token would have expired anyway.
  await boundSequelize().query('DELETE FROM revoked_sessions WHERE expires_at < now()');
}

export function currentSession(deps: Deps, user: SessionUser, workshop: SessionWorkshop, csrf: string): SessionDto {
  return { user: toUserDto(user), workshop, csrfToken: csrf };
}

export async function requestPasswordReset(deps: Deps, email: string): Promise<void> {
  const user = await User.findOne({ where: { email, active: true, passwordHash: { [Op.ne]: null } } });
  if (!user) return;
  const { token, hash } = newOneTimeToken();
  await inTransaction(async (t) => {
    await OneTimeToken.create(
      { userId: user.id, purpose: 'reset', tokenHash: hash, expiresAt: new Date(Date.now() + RESET_MINUTES * 60_000), usedAt: null },
      { transaction: t },
    );
    const link = `${deps.config.APP_URL}/reset-password?token=${token}`;
    await deps.mail.enqueue(passwordResetMail({ to: user.email, name: user.name, link, minutes: RESET_MINUTES }), t);
  });
}

/** Finds a live token and locks it for the rest of the transaction, so it can be used only once. */
async function liveToken(raw: string, purpose: 'invite' | 'reset', t: Transaction): Promise<OneTimeToken> {
  const row = await OneTimeToken.findOne({
    where: { tokenHash: hashToken(raw), purpose, usedAt: null, expiresAt: { [Op.gt]: new Date() } },
    transaction: t,
    lock: t.LOCK.UPDATE,
  });
  if (!row) throw tokenInvalid();
  return row;
}

export async function completePasswordReset(guards: AuthGuards, input: PasswordResetCompleteInput): Promise<void> {
  const passwordHash = await guards.passwords.hash(input.password);
  const email = await inTransaction(async (t) => {
    const token = await liveToken(input.token, 'reset', t);
    const user = await User.findByPk(token.userId, { transaction: t, lock: t.LOCK.UPDATE });
    if (!user || !user.active) throw tokenInvalid();
    // A new epoch ends every session signed before the reset.
    await User.update(
      { passwordHash, sessionEpoch: user.sessionEpoch + 1 },
      { where: { id: user.id }, transaction: t },
    );
    await OneTimeToken.update(
      { usedAt: new Date() },
      { where: { userId: user.id, purpose: 'reset', usedAt: null }, transaction: t },
    );
    return user.email;
  });
  // A new password starts with the account's full allowance of attempts.
  await guards.limits.signInAccount.reset(accountKey(email));
}

export async function describeInvitation(raw: string) {
  return inTransaction(async (t) => {
    const token = await liveToken(raw, 'invite', t);
    const user = await User.findByPk(token.userId, { include: [{ model: Workshop, as: 'workshop', required: true }], transaction: t });
    if (!user || user.passwordHash !== null || !user.active) throw tokenInvalid();
    const workshop = (user as User & { workshop: Workshop }).workshop;
    return { email: user.email, name: user.name, role: user.role, workshopName: workshop.name };
  });
}

export async function acceptInvitation(deps: Deps, guards: AuthGuards, input: InvitationAcceptInput): Promise<IssuedSession> {
  const passwordHash = await guards.passwords.hash(input.password);
  const user = await inTransaction(async (t) => {
    const token = await liveToken(input.token, 'invite', t);
    const u = await User.findByPk(token.userId, { transaction: t, lock: t.LOCK.UPDATE });
    if (!u || u.passwordHash !== null || !u.active) throw tokenInvalid();
    await User.update({ name: input.name, passwordHash }, { where: { id: u.id }, transaction: t });
    await OneTimeToken.update({ usedAt: new Date() }, { where: { userId: u.id, purpose: 'invite', usedAt: null }, transaction: t });
    return u.id;
  });
  const fresh = await User.findByPk(user, { include: [{ model: Workshop, as: 'workshop', required: true }], rejectOnEmpty: true });
  return sessionFor(deps, fresh, (fresh as User & { workshop: Workshop }).workshop);
}
