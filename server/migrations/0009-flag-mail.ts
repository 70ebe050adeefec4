import { DataTypes, type QueryInterface } from 'sequelize';

// How each person hears of flags: a mail per new flag, one daily summary, or none.
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.addColumn('users', 'flagMail', { type: DataTypes.ENUM('immediate', 'digest', 'off'), allowNull: false, defaultValue: 'digest' });
  await qi.addColumn('users', 'lastDigestAt', { type: DataTypes.DATE, allowNull: true });
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.removeColumn('users', 'lastDigestAt');
  await qi.removeColumn('users', 'flagMail');
}
