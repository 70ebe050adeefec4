import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { BrewKind, BrewStatus } from '@shared/schemas';

/** A batch made in a tank: culture, liquid fertilizer or pest solution. */
export class Brew extends Model<InferAttributes<Brew>, InferCreationAttributes<Brew>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare farmId: number;
  declare tankId: number;
  declare kind: BrewKind;
  declare name: string;
  declare status: BrewStatus;
  declare startedAt: Date;
  declare readyAt: Date | null;
  declare waterL: number;
  declare dilution: { n: number; convention: 'parts-water' | 'parts-total' } | null;
  declare notes: string;
  declare createdById: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Brew.init(
      {
        id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        farmId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        tankId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        kind: { type: DataTypes.ENUM('culture', 'fertilizer', 'pest-solution'), allowNull: false },
        name: { type: DataTypes.STRING(120), allowNull: false },
        status: { type: DataTypes.ENUM('brewing', 'ready', 'used-up', 'discarded'), allowNull: false },
        startedAt: { type: DataTypes.DATE(3), allowNull: false },
        readyAt: { type: DataTypes.DATE(3), allowNull: true },
        waterL: { type: DataTypes.DOUBLE, allowNull: false },
        dilution: { type: DataTypes.JSON, allowNull: true },
        notes: { type: DataTypes.TEXT, allowNull: false },
        createdById: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'brews' },
    );
  }
}

/** A temperature taken of a working brew (°C). */
export class BrewTemperature extends Model<InferAttributes<BrewTemperature>, InferCreationAttributes<BrewTemperature>> {
  declare id: CreationOptional<number>;
  declare brewId: number;
  declare at: Date;
  declare temperatureC: number;
  declare byUserId: number | null;

  static initModel(sequelize: Sequelize) {
    BrewTemperature.init(
      {
        id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
        brewId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        at: { type: DataTypes.DATE(3), allowNull: false },
        temperatureC: { type: DataTypes.DOUBLE, allowNull: false },
        byUserId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      },
      { sequelize, tableName: 'brew_temperatures', timestamps: false },
    );
  }
}
