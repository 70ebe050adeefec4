import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** The live first-owner set-up link of a server with no organisation (at most one row); only a hash of the token is stored. */
export class SetupToken extends Model<InferAttributes<SetupToken>, InferCreationAttributes<SetupToken>> {
  declare tokenHash: string;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    SetupToken.init(
      {
        tokenHash: { type: DataTypes.CHAR(64), allowNull: false, primaryKey: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'setup_tokens', updatedAt: false },
    );
  }
}
