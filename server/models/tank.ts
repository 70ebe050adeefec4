import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { TankGeometry } from '@shared/calibration';
import type { TankContents } from '@shared/schemas';

export class Tank extends Model<InferAttributes<Tank>, InferCreationAttributes<Tank>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare farmId: number;
  declare name: string;
  declare code: string;
  declare contents: TankContents;
  declare contentsNote: string;
  declare geometry: TankGeometry;
  declare datumOffsetMm: number;
  declare outletHeightMm: number;
  declare safeFillLevelMm: number;
  declare lowStockL: number;
  declare specificGravity: number;
  declare sensorHeightMm: number | null;
  declare walkOrder: number;
  declare exposedToFrost: CreationOptional<boolean>;
  declare calibrationVersion: string;
  declare archivedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Tank.init(
      {
        id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        farmId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        name: { type: DataTypes.STRING(80), allowNull: false },
        code: { type: DataTypes.STRING(12), allowNull: false },
        contents: { type: DataTypes.ENUM('water', 'fertilizer', 'pest-solution', 'culture'), allowNull: false },
        contentsNote: { type: DataTypes.STRING(120), allowNull: false, defaultValue: '' },
        geometry: { type: DataTypes.JSON, allowNull: false },
        datumOffsetMm: { type: DataTypes.DOUBLE, allowNull: false },
        outletHeightMm: { type: DataTypes.DOUBLE, allowNull: false },
        safeFillLevelMm: { type: DataTypes.DOUBLE, allowNull: false },
        lowStockL: { type: DataTypes.DOUBLE, allowNull: false },
        specificGravity: { type: DataTypes.DOUBLE, allowNull: false },
        sensorHeightMm: { type: DataTypes.DOUBLE, allowNull: true },
        walkOrder: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        exposedToFrost: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        calibrationVersion: { type: DataTypes.STRING(32), allowNull: false },
        archivedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'tanks' },
    );
  }
}

/** Every calibration a tank has had, so a reading can always be recomputed with its own version. */
export class TankCalibration extends Model<InferAttributes<TankCalibration>, InferCreationAttributes<TankCalibration>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare tankId: number;
  declare version: string;
  declare geometry: TankGeometry;
  declare datumOffsetMm: number;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    TankCalibration.init(
      {
        id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        tankId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        version: { type: DataTypes.STRING(32), allowNull: false },
        geometry: { type: DataTypes.JSON, allowNull: false },
        datumOffsetMm: { type: DataTypes.DOUBLE, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'tank_calibrations', updatedAt: false },
    );
  }
}

/** The contents a tank held over time (a tank that switches contents keeps its past correct). */
export class TankContentsPeriod extends Model<InferAttributes<TankContentsPeriod>, InferCreationAttributes<TankContentsPeriod>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare tankId: number;
  declare contents: TankContents;
  declare contentsNote: string;
  declare specificGravity: number;
  declare fromAt: Date;
  declare toAt: Date | null;
  declare changedById: number | null;

  static initModel(sequelize: Sequelize) {
    TankContentsPeriod.init(
      {
        id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        tankId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        contents: { type: DataTypes.ENUM('water', 'fertilizer', 'pest-solution', 'culture'), allowNull: false },
        contentsNote: { type: DataTypes.STRING(120), allowNull: false, defaultValue: '' },
        specificGravity: { type: DataTypes.DOUBLE, allowNull: false },
        fromAt: { type: DataTypes.DATE(3), allowNull: false },
        toAt: { type: DataTypes.DATE(3), allowNull: true },
        changedById: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      },
      { sequelize, tableName: 'tank_contents_periods', timestamps: false },
    );
  }
}
