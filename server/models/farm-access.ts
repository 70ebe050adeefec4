import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** Which farms a worker or buyer may see (owners and managers see all farms of their organisation). */
export class FarmAccess extends Model<InferAttributes<FarmAccess>, InferCreationAttributes<FarmAccess>> {
  declare userId: number;
  declare farmId: number;
  declare organisationId: number;

  static initModel(sequelize: Sequelize) {
    FarmAccess.init(
      {
        userId: { type: DataTypes.INTEGER.UNSIGNED, primaryKey: true },
        farmId: { type: DataTypes.INTEGER.UNSIGNED, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      },
      { sequelize, tableName: 'farm_access', timestamps: false },
    );
  }
}
