import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { ForecastHour } from '@shared/schemas';

/** A farm's latest hourly air forecast and how its last fetch went (one row per farm). */
export class FarmForecast extends Model<InferAttributes<FarmForecast>, InferCreationAttributes<FarmForecast>> {
  declare farmId: number;
  /** Where the stored hours are for: a farm moved since has no forecast of its own yet. */
  declare latitude: number | null;
  declare longitude: number | null;
  declare hours: ForecastHour[] | null;
  declare fetchedAt: Date | null;
  declare triedAt: Date;
  declare problem: CreationOptional<string | null>;

  static initModel(sequelize: Sequelize) {
    FarmForecast.init(
      {
        farmId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, primaryKey: true },
        latitude: { type: DataTypes.DOUBLE, allowNull: true },
        longitude: { type: DataTypes.DOUBLE, allowNull: true },
        hours: { type: DataTypes.JSON, allowNull: true },
        fetchedAt: { type: DataTypes.DATE(3), allowNull: true },
        triedAt: { type: DataTypes.DATE(3), allowNull: false },
        problem: { type: DataTypes.STRING(300), allowNull: true },
      },
      { sequelize, tableName: 'farm_forecasts', timestamps: false },
    );
  }
}
