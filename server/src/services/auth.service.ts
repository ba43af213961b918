import { Op, QueryTypes, type Transaction } from 'sequelize';
import type { InvitationAcceptInput, PasswordResetCompleteInput, SessionDto, SignInInput } from '@wingstage/shared';
import { AppError, unauthenticated } from '../errors/app-error.js';
import { checkPassword, dummyHash, hashPassword } from '../lib/passwords.js';
import { hashToken, issueSession, newOneTimeToken } from '../lib/session-tokens.js';
import { passwordResetMail } from '../mail/templates.js';
import { OneTimeToken, User, Workshop, boundSequelize } from '../models/index.js';
import type { Deps } from './deps.js';
import { toUserDto, type SessionUser, type SessionWorkshop } from './dto.js';

export const THROTTLE_WINDOW_MINUTES = 15;
/** ASVS 6.5.5 wants e-mailed sign-in links short-lived; half an hour leaves time to find the mail. */
export const RESET_MINUTES = 30;
export const INVITE_DAYS = 7;

export interface IssuedSession {
  dto: SessionDto;
  token: string;
  csrf: string;
}

const tokenInvalid = () => new AppError('token_invalid', 401, 'This link has expired or was already used. Ask for a new one.');

function sessionFor(deps: Deps, user: User, workshop: Workshop): IssuedSession {
  const { token, csrf } = issueSession(deps.config, user);
  return {
    token,
    csrf,
    dto: { user: toUserDto(user), workshop: { id: workshop.id, name: workshop.name, currency: workshop.currency }, csrfToken: csrf },
  };
}

async function recentFailures(email: string): Promise<number> {
  const rows = await boundSequelize().query<{ n: string }>(
    `SELECT count(*) AS n FROM sign_in_failures WHERE email = $1 AND at > now() - interval '${THROTTLE_WINDOW_MINUTES} minutes'`,
    { bind: [email], type: QueryTypes.SELECT },
  );
  return Number(rows[0]?.n ?? 0);
}

export async function signIn(deps: Deps, input: SignInInput, address: string): Promise<IssuedSession> {
  // Stored in PostgreSQL, so the limit holds across every app process. ASVS 4.0.3 V2.2.1 allows at most 100 per hour.
  if ((await recentFailures(input.email)) >= deps.config.SIGNIN_ACCOUNT_LIMIT) {
    throw new AppError('too_many_requests', 429, `Too many failed sign-ins for this account. Wait ${THROTTLE_WINDOW_MINUTES} minutes, or reset your password.`);
  }
  const user = await User.findOne({ where: { email: input.email }, include: [{ model: Workshop, as: 'workshop', required: true }] });
  // An unknown address still costs one bcrypt comparison, so timing does not reveal who has a sign-in.
  const matches = await checkPassword(input.password, user?.passwordHash ?? (await dummyHash()));
  if (!user || !user.passwordHash || !matches) {
    await boundSequelize().query('INSERT INTO sign_in_failures (email, address) VALUES ($1, $2)', { bind: [input.email, address] });
    // Rows outside the window no longer count; dropping them keeps the table small.
    await boundSequelize().query(`DELETE FROM sign_in_failures WHERE email = $1 AND at < now() - interval '1 day'`, { bind: [input.email] });
    throw unauthenticated('The e-mail or password is not right.');
  }
  if (!user.active) throw unauthenticated('This sign-in has been switched off. Ask your workshop to turn it back on.');
  await boundSequelize().query('DELETE FROM sign_in_failures WHERE email = $1', { bind: [input.email] });
  return sessionFor(deps, user, (user as User & { workshop: Workshop }).workshop);
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
  return { user: toUserDto(user), workshop: { id: workshop.id, name: workshop.name, currency: workshop.currency }, csrfToken: csrf };
}

export async function requestPasswordReset(deps: Deps, email: string): Promise<void> {
  const user = await User.findOne({ where: { email, active: true, passwordHash: { [Op.ne]: null } } });
  if (!user) return;
  const { token, hash } = newOneTimeToken();
  await boundSequelize().transaction(async (t) => {
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

export async function completePasswordReset(input: PasswordResetCompleteInput): Promise<void> {
  const passwordHash = await hashPassword(input.password);
  await boundSequelize().transaction(async (t) => {
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
    await boundSequelize().query('DELETE FROM sign_in_failures WHERE email = $1', { bind: [user.email], transaction: t });
  });
}

export async function describeInvitation(raw: string) {
  return boundSequelize().transaction(async (t) => {
    const token = await liveToken(raw, 'invite', t);
    const user = await User.findByPk(token.userId, { include: [{ model: Workshop, as: 'workshop', required: true }], transaction: t });
    if (!user || user.passwordHash !== null || !user.active) throw tokenInvalid();
    const workshop = (user as User & { workshop: Workshop }).workshop;
    return { email: user.email, name: user.name, role: user.role, workshopName: workshop.name };
  });
}

export async function acceptInvitation(deps: Deps, input: InvitationAcceptInput): Promise<IssuedSession> {
  const passwordHash = await hashPassword(input.password);
  const user = await boundSequelize().transaction(async (t) => {
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
