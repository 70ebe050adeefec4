import { DataTypes, Model, Op, type CreateOptions, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import { organisationCodeCandidates } from '@shared/inventory';

export class Organisation extends Model<InferAttributes<Organisation>, InferCreationAttributes<Organisation>> {
  declare id: CreationOptional<number>;
  declare name: string;
  /** 2–4 capital letters, unique; the start of every order number ("TB-26-001"). */
  declare code: CreationOptional<string>;
  /** ISO 4217 code of the organisation's money figures. */
  declare currency: CreationOptional<string>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Organisation.init(
      {
        id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
        name: { type: DataTypes.STRING(160), allowNull: false },
        code: { type: DataTypes.STRING(4), allowNull: false },
        currency: { type: DataTypes.CHAR(3), allowNull: false, defaultValue: 'EUR' },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'organisations' },
    );
    // An organisation made without a code (first owner, tests) gets the first free one its name suggests;
    // owners may change it on the People screen.
    // Sequelize hands the save's options (with its transaction) to the validate hooks too.
    Organisation.addHook('beforeValidate', async (org: Organisation, options) => {
      if (!org.isNewRecord || org.code) return;
      const candidates = organisationCodeCandidates(org.name);
      const stem = candidates[candidates.length - 1]!.slice(0, 2);
      const rows = await Organisation.findAll({
        where: { [Op.or]: [{ code: candidates.slice(0, 8) }, { code: { [Op.like]: `${stem}%` } }] },
        attributes: ['code'],
        transaction: (options as CreateOptions).transaction ?? null,
      });
      const taken = new Set(rows.map((r) => r.code));
      org.code = candidates.find((c) => !taken.has(c)) ?? candidates[0]!;
    });
  }
}
