import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { FlagKind, FlagStatus } from '@shared/schemas';

/** Something that needs a person. `activeKey` is 1 while open or acknowledged and NULL once cleared: one active flag per kind and subject. */
export class Flag extends Model<InferAttributes<Flag>, InferCreationAttributes<Flag>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare farmId: number;
  declare kind: FlagKind;
  declare subjectType: 'tank' | 'input';
  declare subjectId: number;
  declare status: FlagStatus;
  declare activeKey: number | null;
  declare message: string;
  declare value: number | null;
  declare raisedAt: Date;
  declare lastSeenAt: Date;
  declare acknowledgedAt: Date | null;
  declare acknowledgedById: number | null;
  declare ackNote: string | null;
  declare clearedAt: Date | null;
  /** Set when a person cleared the flag by hand, with `clearNote` saying why. */
  declare clearedById: CreationOptional<number | null>;
  declare clearNote: CreationOptional<string | null>;

  static initModel(sequelize: Sequelize) {
    Flag.init(
      {
        id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        farmId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        kind: { type: DataTypes.STRING(24), allowNull: false },
        subjectType: { type: DataTypes.ENUM('tank', 'input'), allowNull: false },
        subjectId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        status: { type: DataTypes.ENUM('open', 'acknowledged', 'cleared'), allowNull: false },
        activeKey: { type: DataTypes.TINYINT, allowNull: true },
        message: { type: DataTypes.STRING(300), allowNull: false },
        value: { type: DataTypes.DOUBLE, allowNull: true },
        raisedAt: { type: DataTypes.DATE(3), allowNull: false },
        lastSeenAt: { type: DataTypes.DATE(3), allowNull: false },
        acknowledgedAt: { type: DataTypes.DATE(3), allowNull: true },
        acknowledgedById: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
        ackNote: { type: DataTypes.STRING(300), allowNull: true },
        clearedAt: { type: DataTypes.DATE(3), allowNull: true },
        clearedById: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, defaultValue: null },
        clearNote: { type: DataTypes.STRING(300), allowNull: true, defaultValue: null },
      },
      { sequelize, tableName: 'flags', timestamps: false },
    );
  }
}
