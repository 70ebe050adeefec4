import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

export class Farm extends Model<InferAttributes<Farm>, InferCreationAttributes<Farm>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare name: string;
  declare timeZone: string;
  declare location: CreationOptional<string>;
  declare archivedAt: Date | null;
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
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'farms' },
    );
  }
}
