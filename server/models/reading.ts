import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { ReadingSource } from '@shared/schemas';

/** One level reading of a tank with the volumes computed by the calibration version of its time. */
export class Reading extends Model<InferAttributes<Reading>, InferCreationAttributes<Reading>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare farmId: number;
  declare tankId: number;
  declare takenAt: Date;
  declare source: ReadingSource;
  /** 0 for a first reading; corrections of one instant count up, so each stays in the audit trail. */
  declare revision: CreationOptional<number>;
  declare levelMm: number;
  declare grossL: number;
  declare usableL: number;
  declare temperatureC: number | null;
  declare calibrationVersion: string;
  declare enteredById: number | null;
  declare importId: number | null;
  declare note: CreationOptional<string>;
  declare idempotencyKey: string | null;
  declare correctedById: CreationOptional<number | null>;
  declare correctsId: CreationOptional<number | null>;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Reading.init(
      {
        id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        farmId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        tankId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        takenAt: { type: DataTypes.DATE(3), allowNull: false },
        source: { type: DataTypes.ENUM('round', 'logger', 'correction'), allowNull: false },
        revision: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
        levelMm: { type: DataTypes.DOUBLE, allowNull: false },
        grossL: { type: DataTypes.DOUBLE, allowNull: false },
        usableL: { type: DataTypes.DOUBLE, allowNull: false },
        temperatureC: { type: DataTypes.DOUBLE, allowNull: true },
        calibrationVersion: { type: DataTypes.STRING(32), allowNull: false },
        enteredById: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
        importId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
        note: { type: DataTypes.STRING(300), allowNull: false, defaultValue: '' },
        idempotencyKey: { type: DataTypes.STRING(64), allowNull: true },
        correctedById: { type: DataTypes.BIGINT.UNSIGNED, allowNull: true },
        correctsId: { type: DataTypes.BIGINT.UNSIGNED, allowNull: true },
        createdAt: DataTypes.DATE(3),
      },
      { sequelize, tableName: 'readings', updatedAt: false },
    );
  }
}

/** The newest effective reading of each tank, kept current in the same transaction as each insert. */
export class TankLatest extends Model<InferAttributes<TankLatest>, InferCreationAttributes<TankLatest>> {
  declare tankId: number;
  declare organisationId: number;
  declare farmId: number;
  declare readingId: number;
  declare takenAt: Date;
  declare levelMm: number;
  declare grossL: number;
  declare usableL: number;
  declare temperatureC: number | null;
  declare source: ReadingSource;
  declare useLPerDay: CreationOptional<number | null>;
  declare useSdLPerDay: CreationOptional<number | null>;
  declare forecastAt: CreationOptional<Date | null>;

  static initModel(sequelize: Sequelize) {
    TankLatest.init(
      {
        tankId: { type: DataTypes.INTEGER.UNSIGNED, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        farmId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        readingId: { type: DataTypes.BIGINT.UNSIGNED, allowNull: false },
        takenAt: { type: DataTypes.DATE(3), allowNull: false },
        levelMm: { type: DataTypes.DOUBLE, allowNull: false },
        grossL: { type: DataTypes.DOUBLE, allowNull: false },
        usableL: { type: DataTypes.DOUBLE, allowNull: false },
        temperatureC: { type: DataTypes.DOUBLE, allowNull: true },
        source: { type: DataTypes.ENUM('round', 'logger', 'correction'), allowNull: false },
        useLPerDay: { type: DataTypes.DOUBLE, allowNull: true },
        useSdLPerDay: { type: DataTypes.DOUBLE, allowNull: true },
        forecastAt: { type: DataTypes.DATE(3), allowNull: true },
      },
      { sequelize, tableName: 'tank_latest', timestamps: false },
    );
  }
}

/** Each tank's last reading of each local calendar day: the board's history chart reads this, never the raw series. */
export class TankDay extends Model<InferAttributes<TankDay>, InferCreationAttributes<TankDay>> {
  declare tankId: number;
  declare day: string;
  declare organisationId: number;
  declare farmId: number;
  declare takenAt: Date;
  declare grossL: number;
  declare usableL: number;

  static initModel(sequelize: Sequelize) {
    TankDay.init(
      {
        tankId: { type: DataTypes.INTEGER.UNSIGNED, primaryKey: true },
        day: { type: DataTypes.DATEONLY, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        farmId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        takenAt: { type: DataTypes.DATE(3), allowNull: false },
        grossL: { type: DataTypes.DOUBLE, allowNull: false },
        usableL: { type: DataTypes.DOUBLE, allowNull: false },
      },
      { sequelize, tableName: 'tank_days', timestamps: false },
    );
  }
}
