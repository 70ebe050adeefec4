// The organisation's people: invitations, roles, farm access, deactivation.
import type { InvitationInput, Person, PersonUpdateInput, SessionUser } from '@shared/schemas';
import type { AppContext } from '../context';
import { AppError, notFound } from '../errors';
import type { User } from '../models';
import { endSessionsOf, queueTokenMail } from './auth';

async function toPerson(ctx: AppContext, user: User): Promise<Person> {
  const access = await ctx.db.models.FarmAccess.findAll({ where: { userId: user.id }, attributes: ['farmId'] });
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    role: user.role,
    active: user.active,
    invitationPending: !user.passwordHash,
    farmIds: access.map((a) => a.farmId).sort((a, b) => a - b),
    lastSignInAt: user.lastSignInAt ? user.lastSignInAt.toISOString() : null,
  };
}

/** Every person of the actor's organisation, by name. */
export async function listPeople(ctx: AppContext, actor: SessionUser): Promise<Person[]> {
  const users = await ctx.db.models.User.findAll({ where: { organisationId: actor.organisationId }, order: [['name', 'ASC']] });
  return Promise.all(users.map((u) => toPerson(ctx, u)));
}

async function checkFarmIds(ctx: AppContext, actor: SessionUser, farmIds: number[]) {
  const unique = [...new Set(farmIds)];
  const found = await ctx.db.models.Farm.count({ where: { id: unique, organisationId: actor.organisationId } });
  if (found !== unique.length) throw new AppError(422, 'unknown_farm', 'farmIds: one or more farms are not in your organisation', 'farmIds');
  return unique;
}

async function setFarmAccess(ctx: AppContext, actor: SessionUser, userId: number, farmIds: number[]) {
  const { FarmAccess } = ctx.db.models;
  await ctx.db.sequelize.transaction(async (transaction) => {
    await FarmAccess.destroy({ where: { userId }, transaction });
    if (farmIds.length) await FarmAccess.bulkCreate(farmIds.map((farmId) => ({ userId, farmId, organisationId: actor.organisationId })), { transaction });
  });
}

const emailTaken = () => new AppError(409, 'email_taken', 'email: someone in your organisation already has this e-mail address', 'email');

/**
 * Creates an invited person (no password yet) in the actor's organisation and mails the
 * set-password link after the answer. Only the actor's own organisation is looked at: whether the
 * address has an account elsewhere changes neither the answer nor its timing.
 */
export async function invitePerson(ctx: AppContext, actor: SessionUser, input: InvitationInput): Promise<Person> {
  const { User } = ctx.db.models;
  if (await User.findOne({ where: { organisationId: actor.organisationId, email: input.email }, attributes: ['id'] })) throw emailTaken();
  const farmIds = await checkFarmIds(ctx, actor, input.farmIds);
  const user = await User.create({ organisationId: actor.organisationId, email: input.email, name: input.name, role: input.role, passwordHash: null, lastSignInAt: null }).catch((err) => {
    // Two invitations of one address at once: the unique (organisation, e-mail) index keeps one.
    if (err?.name === 'SequelizeUniqueConstraintError') throw emailTaken();
    throw err;
  });
  await setFarmAccess(ctx, actor, user.id, farmIds);
  queueTokenMail(ctx, user, 'invite', actor.name, actor.language);
  return toPerson(ctx, user);
}

async function personOf(ctx: AppContext, actor: SessionUser, id: number) {
  const user = await ctx.db.models.User.findOne({ where: { id, organisationId: actor.organisationId } });
  if (!user) throw notFound('Person');
  return user;
}

/** Sends a fresh invitation link to someone who has not set a password yet. */
export async function resendInvitation(ctx: AppContext, actor: SessionUser, id: number): Promise<void> {
  const user = await personOf(ctx, actor, id);
  if (user.passwordHash) throw new AppError(409, 'already_joined', 'This person has already set a password');
  queueTokenMail(ctx, user, 'invite', actor.name, actor.language);
}

/** Changes role, farm access or active state; deactivation ends the person's sessions at once. */
export async function updatePerson(ctx: AppContext, actor: SessionUser, id: number, input: PersonUpdateInput): Promise<Person> {
  const user = await personOf(ctx, actor, id);
  if (user.id === actor.id && ((input.role && input.role !== 'owner') || input.active === false)) {
    throw new AppError(409, 'own_account', 'You cannot demote or deactivate your own account; ask another owner');
  }
  if (input.farmIds) await setFarmAccess(ctx, actor, user.id, await checkFarmIds(ctx, actor, input.farmIds));
  await user.update({ ...(input.role ? { role: input.role } : {}), ...(input.active !== undefined ? { active: input.active } : {}) });
  if (input.active === false) await endSessionsOf(ctx, user.id);
  // Open sockets reconnect (or are refused) with the new role and farm access.
  ctx.events.emit('user-changed', { userId: user.id });
  return toPerson(ctx, user);
}
