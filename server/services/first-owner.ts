// The first owner of a server whose database holds no organisation (production: no demo). Each
// start-up opens a one-time set-up link and prints it on the console; only the token's hash is kept,
// in setup_tokens, so every server process of the machine knows the one live link. Using it makes
// the organisation and its owner in one transaction; once any organisation exists, set-up is closed.
import type { FirstOwnerInput, SetupState } from '@shared/schemas';
import type { AppContext } from '../context';
import { AppError } from '../errors';
import type { User } from '../models';
import { assertStrongPassword } from './auth';
import { hashPassword, hashToken, newToken } from './passwords';

const closed = () => new AppError(409, 'setup_closed', 'This server already has an organisation: sign in, or ask its owner for an invitation');
const invalidLink = (message = 'This set-up link is unknown or no longer works: the server prints a new one each time it starts with no organisation') =>
  new AppError(404, 'token_invalid', message);

async function organisationExists(ctx: AppContext): Promise<boolean> {
  return (await ctx.db.models.Organisation.findOne({ attributes: ['id'] })) !== null;
}

/** Whether the server still needs its first owner. */
export async function setupState(ctx: AppContext): Promise<SetupState> {
  return { firstOwnerNeeded: !(await organisationExists(ctx)) };
}

/** Throws 409 once any organisation exists, whatever the request carries. */
export async function assertSetupOpen(ctx: AppContext): Promise<void> {
  if (await organisationExists(ctx)) throw closed();
}

/**
 * At start-up: with no organisation, replaces any earlier set-up link by a new one and returns its
 * URL (`/first-owner?token=…`); with one, removes any left-over link and returns null.
 */
export async function openFirstOwnerSetup(ctx: AppContext): Promise<string | null> {
  const { SetupToken } = ctx.db.models;
  return ctx.db.sequelize.transaction(async (transaction) => {
    await SetupToken.destroy({ where: {}, transaction });
    if (await ctx.db.models.Organisation.findOne({ attributes: ['id'], transaction })) return null;
    const { token, hash } = newToken();
    await SetupToken.create({ tokenHash: hash }, { transaction });
    return `${ctx.config.publicUrl}/first-owner?token=${token}`;
  });
}

/**
 * Uses the set-up link: makes the organisation and its owner, and uses the link up, in one
 * transaction; returns the owner. Of two requests at once only one claims the link. A wrong or
 * replaced link is 404, an organisation already there 409, a password easy to guess 422 (the link
 * stays usable).
 */
export async function createFirstOwner(ctx: AppContext, input: FirstOwnerInput): Promise<User> {
  const { Organisation, SetupToken, User } = ctx.db.models;
  await assertSetupOpen(ctx);
  const tokenHash = hashToken(input.token);
  if (!(await SetupToken.findByPk(tokenHash))) throw invalidLink();
  assertStrongPassword(input.password, [input.email, input.name, input.organisationName]);
  const passwordHash = await hashPassword(input.password);
  return ctx.db.sequelize.transaction(async (transaction) => {
    // Deleting the row claims the link: a second request waits on its lock, then finds nothing.
    const claimed = await SetupToken.destroy({ where: { tokenHash }, transaction });
    if (claimed !== 1) throw (await organisationExists(ctx)) ? closed() : invalidLink('This set-up link has just been used');
    if (await Organisation.findOne({ attributes: ['id'], transaction })) throw closed();
    const organisation = await Organisation.create({ name: input.organisationName }, { transaction });
    return User.create(
      { organisationId: organisation.id, email: input.email, name: input.name, role: 'owner', passwordHash, lastSignInAt: new Date() },
      { transaction },
    );
  });
}
