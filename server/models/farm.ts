import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

export class Farm extends Model<InferAttributes<Farm>, InferCreationAttributes<Farm>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare name: string;
  declare timeZone: string;
  declare location: CreationOptional<string>;
  declare archivedAt: Date | null;
  declare staleAfterDays: CreationOptional<number>;
  declare coldCultureC: CreationOptional<number>;
  declare frostRiskC: CreationOptional<number>;
  declare latitude: CreationOptional<number | null>;
  declare longitude: CreationOptional<number | null>;
  declare frostAheadC: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Farm.init(
      {
        id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        name: { type: DataTypes.STRING(120), allowNull: false },
        timeZone: { type: DataTypes.STRING(64), allowNull: false },
        location: { type: DataTypes.STRING(200), allowNull: false, defaultValue: '' },
        archivedAt: { type: DataTypes.DATE, allowNull: true },
        staleAfterDays: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 3 },
        coldCultureC: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 18 },
        frostRiskC: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 2 },
        latitude: { type: DataTypes.DOUBLE, allowNull: true, defaultValue: null },
        longitude: { type: DataTypes.DOUBLE, allowNull: true, defaultValue: null },
        frostAheadC: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 2 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'farms' },
    );
  }
}
