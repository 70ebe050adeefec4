import type { Sequelize } from 'sequelize';
import { Organisation } from './organisation';
import { User } from './user';
import { Farm } from './farm';
import { FarmAccess } from './farm-access';
import { Session } from './session';
import { AuthToken } from './auth-token';

export { Organisation, User, Farm, FarmAccess, Session, AuthToken };

/** Every model, initialised on one Sequelize instance. */
export function initModels(sequelize: Sequelize) {
  for (const m of [Organisation, User, Farm, FarmAccess, Session, AuthToken]) m.initModel(sequelize);
  User.belongsTo(Organisation, { foreignKey: 'organisationId' });
  User.hasMany(FarmAccess, { foreignKey: 'userId', as: 'farmAccess' });
  Farm.belongsTo(Organisation, { foreignKey: 'organisationId' });
  return { Organisation, User, Farm, FarmAccess, Session, AuthToken };
}
export type Models = ReturnType<typeof initModels>;
