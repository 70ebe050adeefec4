import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** Where a flag text stands: waiting (first try or a retry), sent, given up after the last attempt, or held back by the daily cap. */
export type FlagTextStatus = 'pending' | 'sent' | 'failed' | 'over-cap';

/** One text about flags to one person (migration 0018): queued, tried with a back-off, kept after. */
export class FlagText extends Model<InferAttributes<FlagText>, InferCreationAttributes<FlagText>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare userId: number;
  declare toPhone: string;
  declare body: string;
  declare status: FlagTextStatus;
  declare attempts: CreationOptional<number>;
  declare nextAttemptAt: Date | null;
  declare lastError: CreationOptional<string | null>;
  declare providerSid: CreationOptional<string | null>;
  declare sentAt: CreationOptional<Date | null>;
  declare deliveredAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    FlagText.init(
      {
        id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        toPhone: { type: DataTypes.STRING(16), allowNull: false },
        body: { type: DataTypes.STRING(320), allowNull: false },
        status: { type: DataTypes.ENUM('pending', 'sent', 'failed', 'over-cap'), allowNull: false },
        attempts: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
        nextAttemptAt: { type: DataTypes.DATE, allowNull: true },
        lastError: { type: DataTypes.STRING(300), allowNull: true },
        providerSid: { type: DataTypes.STRING(64), allowNull: true },
        sentAt: { type: DataTypes.DATE, allowNull: true },
        deliveredAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'flag_texts' },
    );
  }
}
