import type { Sequelize } from 'sequelize';
import { Organisation } from './organisation';
import { User } from './user';
import { Farm } from './farm';
import { FarmAccess } from './farm-access';
import { Session } from './session';
import { AuthToken } from './auth-token';
import { Tank, TankCalibration, TankContentsPeriod } from './tank';
import { Reading, TankLatest, TankDay } from './reading';
import { LoggerImport, LoggerImportRejection, TankImportMapping } from './logger-import';
import { Supplier, Input, StockMovement, PurchaseOrder, PurchaseOrderLine } from './inventory';
import { Flag } from './flag';
import { Brew, BrewTemperature } from './brew';
import { SetupToken } from './setup-token';
import { FarmForecast } from './farm-forecast';
import { FlagText } from './flag-text';

export { Organisation, User, Farm, FarmAccess, Session, AuthToken, Tank, TankCalibration, TankContentsPeriod, Reading, TankLatest, TankDay, LoggerImport, LoggerImportRejection, TankImportMapping, Supplier, Input, StockMovement, PurchaseOrder, PurchaseOrderLine, Flag, Brew, BrewTemperature, SetupToken, FarmForecast, FlagText };

/** Every model, initialised on one Sequelize instance. */
export function initModels(sequelize: Sequelize) {
  for (const m of [Organisation, User, Farm, FarmAccess, Session, AuthToken, Tank, TankCalibration, TankContentsPeriod, Reading, TankLatest, TankDay, LoggerImport, LoggerImportRejection, TankImportMapping, Supplier, Input, StockMovement, PurchaseOrder, PurchaseOrderLine, Flag, Brew, BrewTemperature, SetupToken, FarmForecast, FlagText]) m.initModel(sequelize);
  User.belongsTo(Organisation, { foreignKey: 'organisationId' });
  User.hasMany(FarmAccess, { foreignKey: 'userId', as: 'farmAccess' });
  Farm.belongsTo(Organisation, { foreignKey: 'organisationId' });
  return { Organisation, User, Farm, FarmAccess, Session, AuthToken, Tank, TankCalibration, TankContentsPeriod, Reading, TankLatest, TankDay, LoggerImport, LoggerImportRejection, TankImportMapping, Supplier, Input, StockMovement, PurchaseOrder, PurchaseOrderLine, Flag, Brew, BrewTemperature, SetupToken, FarmForecast, FlagText };
}
export type Models = ReturnType<typeof initModels>;
