import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { Role, UnitSystem } from '@shared/schemas';
import type { Language } from '@shared/i18n/languages';

export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare email: string;
  declare name: string;
  declare role: Role;
  /** Null until the person takes up their invitation. */
  declare passwordHash: string | null;
  declare active: CreationOptional<boolean>;
  declare unitSystem: CreationOptional<UnitSystem>;
  declare lastSignInAt: Date | null;
  declare flagMail: CreationOptional<'immediate' | 'digest' | 'off'>;
  declare lastDigestAt: CreationOptional<Date | null>;
  /** Mobile number in E.164 (+447700900123), or null (migration 0018). */
  declare phone: CreationOptional<string | null>;
  declare flagTexts: CreationOptional<'immediate' | 'digest' | 'off'>;
  /** When a STOP reply from the number turned texts off (null: not since the number was set). */
  declare textsStoppedAt: CreationOptional<Date | null>;
  declare lastTextDigestAt: CreationOptional<Date | null>;
  /** The person's language (shared/i18n/languages.ts), or null until chosen or taken from the browser at first sign-in (migration 0019). */
  declare language: CreationOptional<Language | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    User.init(
      {
        id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        email: { type: DataTypes.STRING(254), allowNull: false },
        name: { type: DataTypes.STRING(120), allowNull: false },
        role: { type: DataTypes.ENUM('owner', 'manager', 'worker', 'buyer'), allowNull: false },
        passwordHash: { type: DataTypes.STRING(255), allowNull: true },
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        unitSystem: { type: DataTypes.ENUM('metric', 'us'), allowNull: false, defaultValue: 'metric' },
        lastSignInAt: { type: DataTypes.DATE, allowNull: true },
        flagMail: { type: DataTypes.ENUM('immediate', 'digest', 'off'), allowNull: false, defaultValue: 'digest' },
        lastDigestAt: { type: DataTypes.DATE, allowNull: true },
        phone: { type: DataTypes.STRING(16), allowNull: true },
        flagTexts: { type: DataTypes.ENUM('immediate', 'digest', 'off'), allowNull: false, defaultValue: 'off' },
        textsStoppedAt: { type: DataTypes.DATE, allowNull: true },
        lastTextDigestAt: { type: DataTypes.DATE, allowNull: true },
        language: { type: DataTypes.STRING(8), allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      {
        sequelize,
        tableName: 'users',
        // Unique within an organisation only (migration 0013): one address may have an account in several.
        indexes: [
          { unique: true, fields: ['organisationId', 'email'], name: 'users_organisation_email' },
          { fields: ['email'], name: 'users_email' },
        ],
      },
    );
  }
}
