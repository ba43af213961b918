import { Op, type WhereOptions } from 'sequelize';
import type { InvitationCreateInput, Page, UserDto, UserListQuery, UserUpdateInput } from '@wingstage/shared';
import { STAFF_ROLES, isStaff } from '@wingstage/shared';
import { AppError, conflict, forbidden, notFound } from '../errors/app-error.js';
import { newOneTimeToken } from '../lib/session-tokens.js';
import { invitationMail } from '../mail/templates.js';
import { Customer, OneTimeToken, User, Workshop, boundSequelize } from '../models/index.js';
import { inTransaction } from '../db/transaction.js';
import { recordAudit } from './audit.js';
import { INVITE_DAYS } from './auth.service.js';
import type { Deps } from './deps.js';
import { toUserDto } from './dto.js';
import { likePattern, orderFrom, pageWindow } from './list-helpers.js';
import { inWorkshop, type Scope } from './scope.js';

/** Admins manage every sign-in; managers manage owners' sign-ins only. */
function visibleUsers(scope: Scope, where: WhereOptions<User> = {}): WhereOptions<User> {
  if (scope.role === 'admin') return inWorkshop(scope, where);
  if (scope.role === 'manager') return inWorkshop(scope, { [Op.and]: [where, { role: 'owner' }] } as WhereOptions<User>);
  throw forbidden();
}

export async function listUsers(scope: Scope, q: UserListQuery): Promise<Page<UserDto>> {
  const where: Record<string | symbol, unknown> = {};
  if (q.kind === 'staff') where.role = { [Op.in]: [...STAFF_ROLES] };
  if (q.kind === 'owners') where.role = 'owner';
  if (q.q) {
    const like = likePattern(q.q);
    where[Op.or] = [{ name: { [Op.iLike]: like } }, { email: { [Op.iLike]: like } }];
  }
  const order = orderFrom(q, { name: 'lower("User"."name")', email: '"User"."email"', role: '"User"."role"', createdAt: '"User"."created_at"' }, 'name');
  const { rows, count } = await User.findAndCountAll({
    where: visibleUsers(scope, where as WhereOptions<User>),
    order: boundSequelize().literal(`${order}, "User"."id" ASC`),
    ...pageWindow(q),
  });
  return { items: rows.map(toUserDto), total: count, page: q.page, pageSize: q.pageSize };
}

async function sendInvitation(deps: Deps, scope: Scope, user: User, t: import('sequelize').Transaction): Promise<void> {
  // Re-sending ends the earlier link: only the newest invitation works.
  await OneTimeToken.update({ usedAt: new Date() }, { where: { userId: user.id, purpose: 'invite', usedAt: null }, transaction: t });
  const { token, hash } = newOneTimeToken();
  await OneTimeToken.create(
    { userId: user.id, purpose: 'invite', tokenHash: hash, expiresAt: new Date(Date.now() + INVITE_DAYS * 86_400_000), usedAt: null },
    { transaction: t },
  );
  const [workshop, inviter] = await Promise.all([
    Workshop.findByPk(scope.workshopId, { transaction: t, rejectOnEmpty: true }),
    User.findByPk(scope.userId, { transaction: t, rejectOnEmpty: true }),
  ]);
  const link = `${deps.config.APP_URL}/accept-invitation?token=${token}`;
  await deps.mail.enqueue(
    invitationMail({ to: user.email, name: user.name, workshopName: workshop.name, inviterName: inviter.name, link, days: INVITE_DAYS }),
    t,
  );
}

export async function inviteUser(deps: Deps, scope: Scope, input: InvitationCreateInput): Promise<UserDto> {
  if (input.role === 'owner' && scope.role !== 'manager') throw forbidden('Owners are invited by a manager.');
  if (input.role !== 'owner' && scope.role !== 'admin') throw forbidden('Staff are invited by an admin.');
  return inTransaction(async (t) => {
    let customerId: string | null = null;
    if (input.role === 'owner') {
      const customer = await Customer.findOne({ where: inWorkshop(scope, { id: input.customerId }), transaction: t });
      if (!customer) throw new AppError('not_found', 404, 'That owner contact was not found.', { customerId: 'That owner contact was not found.' });
      customerId = customer.id;
    }
    const user = await User.create(
      { workshopId: scope.workshopId, email: input.email, name: input.name, role: input.role, passwordHash: null, customerId },
      { transaction: t },
    );
    await sendInvitation(deps, scope, user, t);
    await recordAudit(scope, t, { action: 'user.invited', summary: `Invited ${input.name} <${input.email}> as ${input.role}`, detail: { userId: user.id, role: input.role } });
    return toUserDto(user);
  });
}

export async function resendInvitation(deps: Deps, scope: Scope, id: string): Promise<void> {
  await inTransaction(async (t) => {
    const user = await User.findOne({ where: visibleUsers(scope, { id }), transaction: t, lock: t.LOCK.UPDATE });
    if (!user) throw notFound('That user');
    if (user.passwordHash !== null) throw conflict('This person has already accepted their invitation.');
    if (!user.active) throw conflict('This sign-in is switched off; turn it back on before re-sending.');
    await sendInvitation(deps, scope, user, t);
    await recordAudit(scope, t, { action: 'user.invitation_resent', summary: `Re-sent the invitation to ${user.email}`, detail: { userId: user.id } });
  });
}

export async function updateUser(scope: Scope, id: string, input: UserUpdateInput): Promise<UserDto> {
  return inTransaction(async (t) => {
    const user = await User.findOne({ where: visibleUsers(scope, { id }), transaction: t, lock: t.LOCK.UPDATE });
    if (!user) throw notFound('That user');
    if (user.id === scope.userId) {
      if (input.active === false) throw conflict('You cannot switch off your own sign-in. Ask another admin.');
      if (input.role && input.role !== user.role) throw conflict('You cannot change your own role. Ask another admin.');
    }
    if (input.role && input.role !== user.role && (input.role === 'owner' || !isStaff(user.role))) {
      throw new AppError('conflict', 409, 'A staff sign-in cannot become an owner sign-in, or the other way round. Invite the person again instead.', {
        role: 'Staff and owner sign-ins cannot be swapped.',
      });
    }
    const changes: Partial<Pick<User, 'role' | 'active' | 'name' | 'sessionEpoch'>> = {};
    if (input.name !== undefined) changes.name = input.name;
    if (input.role !== undefined) changes.role = input.role;
    if (input.active !== undefined) changes.active = input.active;
    // Switching a sign-in off ends its sessions at once, not just at their expiry.
    if (input.active === false && user.active) changes.sessionEpoch = user.sessionEpoch + 1;
    const before = { name: user.name, role: user.role, active: user.active };
    await user.update(changes, { transaction: t });
    await recordAudit(scope, t, { action: 'user.updated', summary: `Changed ${user.email}`, detail: { userId: user.id, before, after: { name: user.name, role: user.role, active: user.active } } });
    return toUserDto(user);
  });
}
